import type { Transaction, Includeable } from 'sequelize';
import { Ticket, TicketEvent, Photo, ServiceTarget } from './ticket.model';
import { loadTimeline, timelineTicketIds } from './ticket-timeline.service';
import { assertMayReadTicket } from './ticket-visibility';
import { activeModules, toolChoices } from '../facility/tool-directory';
import { openIntervalsOf } from '../facility/state.service';
import { searchStaff } from '../users/user-directory';
import { notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { isStaff } from '../../../shared/roles';
import { allowedTicketActions, awaitingConfirmation } from './ticket.policy';
import {
  PRIORITIES,
  SERVICE_TARGET_DEFAULTS,
  computePriority,
  targetStatus,
  type Priority,
  type ServiceTarget as Target,
} from '../../../shared/priority';
import type { Criticality } from '../../../shared/priority';
import type { TicketCategory } from '../../../shared/report-options';
import type {
  TicketDetail,
  TicketSummary,
  TicketTargets,
  TargetClock,
  ServiceTargetView,
  ToolStateView,
} from '../../../shared/schemas/tickets';

interface PersonRow {
  id: number;
  name: string;
}

const person = (u: PersonRow | null | undefined) => (u ? { id: u.id, name: u.name } : null);
const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

// Joined by association name (the associations are declared in server/db/models.ts), so this
// module reads other modules' tables in its joins without touching their models.
export const summaryIncludes = (): Includeable[] => [
  {
    association: 'tool',
    attributes: ['id', 'code', 'name', 'areaId', 'criticality', 'primaryEngineerId', 'backupEngineerId'],
    include: [{ association: 'area', attributes: ['id', 'name'] }],
  },
  { association: 'module', attributes: ['id', 'code', 'name'] },
  { association: 'reporter', attributes: ['id', 'name'] },
  { association: 'assignee', attributes: ['id', 'name'] },
];

export type WithIncludes = Ticket & {
  tool?: {
    code: string;
    name: string;
    areaId: number;
    criticality: Criticality;
    primaryEngineerId: number | null;
    backupEngineerId: number | null;
    area?: { id: number; name: string } | null;
  };
  module?: { id: number; code: string; name: string } | null;
  reporter?: PersonRow | null;
  assignee?: PersonRow | null;
};

export type TargetTable = Record<Priority, Target>;

export async function loadServiceTargets(transaction?: Transaction): Promise<TargetTable> {
  const rows = await ServiceTarget.findAll({ transaction });
  const table = { ...SERVICE_TARGET_DEFAULTS };
  for (const row of rows) table[row.priority] = { acknowledgeMinutes: row.acknowledgeMinutes, restoreMinutes: row.restoreMinutes };
  return table;
}

export async function listServiceTargets(): Promise<ServiceTargetView[]> {
  const rows = await ServiceTarget.findAll({ order: [['priority', 'ASC']] });
  const byPriority = new Map(rows.map((r) => [r.priority, r]));
  return PRIORITIES.map((p) => {
    const row = byPriority.get(p);
    const values = row ?? SERVICE_TARGET_DEFAULTS[p];
    return {
      priority: p,
      acknowledgeMinutes: values.acknowledgeMinutes,
      restoreMinutes: values.restoreMinutes,
      updatedAt: iso(row?.updatedAt) ?? new Date(0).toISOString(),
    };
  });
}

function clock(createdAt: Date, minutes: number, doneAt: Date | null, now: Date): TargetClock {
  const end = doneAt ?? now;
  const elapsed = (end.getTime() - createdAt.getTime()) / 60_000;
  return {
    targetMinutes: minutes,
    dueAt: new Date(createdAt.getTime() + minutes * 60_000).toISOString(),
    doneAt: iso(doneAt),
    status: targetStatus(Math.max(0, elapsed), minutes),
  };
}

/**
 * Time to acknowledge runs until someone acknowledges (or the ticket ends otherwise); time to
 * restore until the fix. Both count clock time from the report.
 */
export function targetsFor(t: Ticket, table: TargetTable, now = new Date()): TicketTargets {
  const target = table[t.priority];
  const ended = t.status === 'merged' ? t.updatedAt : null;
  return {
    acknowledge: clock(t.createdAt, target.acknowledgeMinutes, t.acknowledgedAt ?? t.resolvedAt ?? ended, now),
    restore: clock(t.createdAt, target.restoreMinutes, t.fixedAt ?? t.resolvedAt ?? ended, now),
  };
}

export function toSummary(t: WithIncludes, table: TargetTable, now = new Date()): TicketSummary {
  return {
    id: t.id,
    title: t.title,
    status: t.status,
    priority: t.priority,
    category: t.category as TicketCategory,
    impact: t.impact,
    hazards: t.hazards ?? [],
    waitReason: t.waitReason,
    tool: {
      id: t.toolId,
      code: t.tool?.code ?? '',
      name: t.tool?.name ?? '',
      areaId: t.tool?.areaId ?? 0,
      areaName: t.tool?.area?.name ?? null,
    },
    module: t.module ? { id: t.module.id, code: t.module.code, name: t.module.name } : null,
    reporter: person(t.reporter),
    assignee: person(t.assignee),
    wafersCount: t.wafersCount,
    mergedIntoId: t.mergedIntoId,
    createdAt: t.createdAt.toISOString(),
    updatedAt: t.updatedAt.toISOString(),
    acknowledgedAt: iso(t.acknowledgedAt),
    resolvedAt: iso(t.resolvedAt),
    targets: targetsFor(t, table, now),
    version: t.version,
  };
}

export async function findTicket(id: number, transaction?: Transaction): Promise<WithIncludes> {
  const t = await Ticket.findByPk(id, { include: summaryIncludes(), transaction });
  if (!t) throw notFound('That ticket');
  return t as WithIncludes;
}

export async function openToolStates(toolId: number, transaction?: Transaction): Promise<ToolStateView[]> {
  const open = await openIntervalsOf(toolId, transaction);
  return open.map((s) => ({
    moduleId: s.moduleId,
    state: s.state,
    reason: s.reason,
    since: s.startedAt.toISOString(),
    source: s.source,
    confirmed: s.confirmed,
    ticketId: s.ticketId,
    expectedReturnAt: iso(s.expectedReturnAt),
  }));
}

/**
 * Whether this user may see the ticket: its page, and so its socket room. The same rule as the
 * ticket API (ticket-visibility.ts: everyone, or members only their own reports when the
 * facility says so); getTicketDetail filters what a member sees inside it.
 */
export async function mayViewTicket(deps: AppDeps, user: AuthUser, id: number): Promise<boolean> {
  if ((await Ticket.count({ where: { id } })) === 0) return false;
  return assertMayReadTicket(deps, user, id).then(
    () => true,
    () => false,
  );
}

export async function getTicketDetail(deps: AppDeps, user: AuthUser, id: number): Promise<TicketDetail> {
  const t = await findTicket(id);
  const staff = isStaff(user.role);
  const { merged, ticketIds } = await timelineTicketIds(t.id);
  const timeline = await loadTimeline(deps.sequelize, { ticketId: t.id, ticketIds, staff });

  const modules = (await activeModules([t.toolId])).get(t.toolId) ?? [];
  const toolStates = await openToolStates(t.toolId);
  const table = await loadServiceTargets();
  const isReporter = t.reporterId === user.id;
  // The same policy the workflow enforces (ticket.policy.ts): the buttons are what the server accepts.
  const actions = allowedTicketActions(user, { ...t.get(), awaitingConfirmation: awaitingConfirmation(t.id, toolStates).length > 0 });
  const priority = computePriority({
    impact: t.impact,
    hazards: t.hazards ?? [],
    wafersAtRisk: t.wafersCount,
    wafersKnownSafe: t.wafersRecoverable === 'yes',
    criticality: t.tool?.criticality ?? 'normal',
  });

  return {
    ...toSummary(t, table),
    description: t.description,
    alarmText: t.alarmText,
    wafersOwner: t.wafersOwner,
    wafersRecoverable: t.wafersRecoverable,
    priorityOverridden: t.priorityOverridden,
    fixKind: t.fixKind,
    failureMode: t.failureMode,
    cause: t.cause,
    workDone: t.workDone,
    partsUsed: t.partsUsed,
    handsOnMinutes: t.handsOnMinutes,
    wafersRecovered: t.wafersRecovered,
    wafersReturned: t.wafersReturned,
    fixedAt: iso(t.fixedAt),
    closedAt: iso(t.closedAt),
    priorityReasons: t.priorityOverridden ? [] : priority.reasons,
    modules: modules.map((m) => ({ id: m.id, code: m.code, name: m.name })),
    toolStates,
    events: timeline.events,
    olderEvents: timeline.olderEvents,
    mergedFrom: merged.map((m) => ({ id: m.id, title: m.title })),
    allowedActions: actions,
    viewer: { id: user.id, role: user.role, isReporter },
  };
}

/** A photo the viewer may see: any signed-in user, unless it hangs on a staff-only event. */
export async function findVisiblePhoto(user: AuthUser, id: number) {
  const photo = await Photo.findByPk(id);
  if (!photo) throw notFound('That photo');
  if (photo.eventId && !isStaff(user.role)) {
    const event = await TicketEvent.findByPk(photo.eventId, { attributes: ['internal'] });
    if (event?.internal) throw notFound('That photo');
  }
  return photo;
}

/** Staff who can be assigned, for the assignee picker. */
export async function listStaff(q: { search?: string; limit: number }) {
  const { items } = await searchStaff({ search: q.search, limit: q.limit });
  return items.map((u) => ({ id: u.id, name: u.name, role: u.role }));
}

/** Tools to pick on the report form (by search text, exact code from a QR label, or id). */
export const listToolChoices = toolChoices;
