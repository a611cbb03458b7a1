import crypto from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { MaintenancePlan, MaintenanceWindow, RequalRecord, WorkOrder, type StepResult } from './maintenance.model';
import { counterReading, latestReadings, readingKey } from './counters';
import { followersOf, openState, toolInfo } from './lookups';
import { returnToServiceProof } from './requal.service';
import { isOverdue, planDue, presentPlan } from './plans.service';
import { changeState } from '../facility/state.service';
import { announceBoardTools } from '../facility/board.service';
import { createNotices } from '../notices/notices.service';
import { queueMail } from '../../lib/mailer';
import { AppError, badRequest, notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { WORK_ORDER_STATUS_LABELS, type WorkOrderStatus } from '../../../shared/schemas/maintenance';
import type { z } from 'zod';
import type { workOrderFromTicketSchema, workOrderProgressSchema } from '../../../shared/schemas/maintenance';

// Work orders: Planned → Scheduled (a downtime window is booked) → In progress → Done, or
// Skipped with a reason. Every step locks the work order row and checks its version.

export const OPEN_WORK_ORDER: WorkOrderStatus[] = ['planned', 'scheduled', 'in_progress'];

const ALLOWED: Record<string, WorkOrderStatus[]> = {
  book: ['planned', 'scheduled'],
  cancelWindow: ['scheduled'],
  start: ['planned', 'scheduled'],
  progress: ['in_progress'],
  complete: ['in_progress'],
  skip: ['planned', 'scheduled'],
};

const STEP_WORDS: Record<string, string> = {
  book: 'book a window for',
  cancelWindow: 'cancel the window of',
  start: 'start',
  progress: 'record work on',
  complete: 'complete',
  skip: 'skip',
};

async function lockOrder(id: number, version: number, step: keyof typeof ALLOWED, transaction: Transaction) {
  const wo = await WorkOrder.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!wo) throw notFound('That work order');
  if (wo.version !== version)
    throw new AppError(409, 'stale_version', 'Someone else changed this work order while you had it open. Reload it and try again.');
  if (!ALLOWED[step].includes(wo.status)) {
    throw new AppError(
      409,
      'invalid_transition',
      `This work order is ${WORK_ORDER_STATUS_LABELS[wo.status as WorkOrderStatus].toLowerCase()}, so you cannot ${STEP_WORDS[step]} it now.`,
    );
  }
  return wo;
}

function changed(deps: AppDeps, wo: WorkOrder, transaction: Transaction) {
  deps.events.publish({ type: 'maintenance.changed', audience: 'staff', payload: { toolId: wo.toolId, workOrderId: wo.id } }, transaction);
}

function formatWindow(deps: AppDeps, startsAt: Date, endsAt: Date) {
  const tz = deps.config.FACILITY_TIME_ZONE;
  const day = new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: tz }).format(startsAt);
  const time = (d: Date) => new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', timeZone: tz }).format(d);
  const sameDay = startsAt.toLocaleDateString('en-GB', { timeZone: tz }) === endsAt.toLocaleDateString('en-GB', { timeZone: tz });
  const endDay = sameDay
    ? ''
    : new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short', timeZone: tz }).format(endsAt) + ' ';
  return `${day} ${time(startsAt)}–${endDay}${time(endsAt)} (${tz})`;
}

export async function createFromTicket(deps: AppDeps, ticketId: number, input: z.output<typeof workOrderFromTicketSchema>, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const [ticket] = await deps.sequelize.query<{ id: number; toolId: number; moduleId: number | null; title: string }>(
      `SELECT id, tool_id AS toolId, module_id AS moduleId, title FROM tickets WHERE id = :ticketId`,
      { type: QueryTypes.SELECT, replacements: { ticketId }, transaction },
    );
    if (!ticket) throw notFound('That ticket');
    const wo = await WorkOrder.create(
      {
        toolId: ticket.toolId,
        moduleId: ticket.moduleId,
        planId: null,
        ticketId: ticket.id,
        kind: 'corrective',
        title: input.title ?? `Repair: ${ticket.title}`.slice(0, 160),
        dueKey: null,
        dueAt: null,
        dueCounter: null,
        graceUntil: null,
        graceUntilCounter: null,
        checklist: input.checklist,
        results: [],
        estimatedMinutes: input.estimatedMinutes,
        createdById: user.id,
      },
      { transaction },
    );
    changed(deps, wo, transaction);
    return { id: wo.id, status: wo.status, version: wo.version };
  });
}

/** Books or moves the downtime window; the first booking tells the tool's followers once. */
export async function bookWindow(deps: AppDeps, id: number, input: { version: number; startsAt: Date; endsAt: Date }, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'book', transaction);
    const existing = await MaintenanceWindow.findOne({ where: { workOrderId: wo.id }, transaction, lock: transaction.LOCK.UPDATE });
    const firstBooking = !existing || existing.status === 'cancelled';
    if (existing) {
      await existing.update(
        { startsAt: input.startsAt, endsAt: input.endsAt, status: 'booked', sequence: existing.sequence + 1 },
        { transaction },
      );
    } else {
      await MaintenanceWindow.create(
        {
          workOrderId: wo.id,
          toolId: wo.toolId,
          uid: `wo-${wo.id}-${crypto.randomBytes(6).toString('hex')}@faultline`,
          startsAt: input.startsAt,
          endsAt: input.endsAt,
        },
        { transaction },
      );
    }
    wo.status = 'scheduled';
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    if (firstBooking) await tellFollowersOfBooking(deps, wo, input.startsAt, input.endsAt, user, transaction);
    changed(deps, wo, transaction);
    deps.events.publish({ type: 'maintenance.window_changed', audience: 'all', payload: { toolId: wo.toolId } }, transaction);
    // The board's "Maintenance planned" line travels with the tool's board entry.
    announceBoardTools(deps, [wo.toolId], transaction);
    return presentOrder(wo);
  });
}

async function tellFollowersOfBooking(
  deps: AppDeps,
  wo: WorkOrder,
  startsAt: Date,
  endsAt: Date,
  user: AuthUser,
  transaction: Transaction,
) {
  const followers = await followersOf(deps.sequelize, wo.toolId, user.id, transaction);
  if (followers.length === 0) return;
  const tool = await toolInfo(deps.sequelize, wo.toolId, transaction);
  const when = formatWindow(deps, startsAt, endsAt);
  const title = `${tool.name} (${tool.code}): maintenance planned ${when}`;
  const link = `/tools/${encodeURIComponent(tool.code)}`;
  const body = `${tool.name} will be in scheduled downtime for preventive maintenance (${wo.title}) ${when}. Plan your work around it; the status board shows the window until it ends.`;
  await queueMail(
    followers.map((f) => ({
      to: f.email,
      subject: `Faultline: ${title}`,
      text: `Hello ${f.name},\n\n${body}\n\nSee the tool: ${deps.config.publicUrl}${link}\n\nYou get this because you follow ${tool.name}.`,
    })),
    transaction,
  );
  await createNotices(
    deps,
    followers.map((f) => f.userId),
    { kind: 'maintenance_planned', title, body, link },
    transaction,
  );
}

export async function cancelWindow(deps: AppDeps, id: number, input: { version: number }) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'cancelWindow', transaction);
    const w = await MaintenanceWindow.findOne({ where: { workOrderId: wo.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (w) await w.update({ status: 'cancelled', sequence: w.sequence + 1 }, { transaction });
    wo.status = 'planned';
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    changed(deps, wo, transaction);
    deps.events.publish({ type: 'maintenance.window_changed', audience: 'all', payload: { toolId: wo.toolId } }, transaction);
    // The board's "Maintenance planned" line travels with the tool's board entry.
    announceBoardTools(deps, [wo.toolId], transaction);
    return presentOrder(wo);
  });
}

/** Starting a preventive work order puts the tool (or module) in scheduled downtime. */
export async function startWorkOrder(deps: AppDeps, id: number, input: { version: number }, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'start', transaction);
    const now = new Date();
    const w = await MaintenanceWindow.findOne({ where: { workOrderId: wo.id, status: 'booked' }, transaction });
    if (wo.kind === 'preventive') {
      await changeState(
        deps,
        {
          toolId: wo.toolId,
          moduleId: wo.moduleId,
          state: 'scheduled_downtime',
          reason: 'preventive_maintenance',
          note: `Preventive maintenance: ${wo.title}`.slice(0, 500),
          expectedReturnAt: w && w.endsAt > now ? w.endsAt : new Date(now.getTime() + (wo.estimatedMinutes ?? 60) * 60_000),
          source: 'schedule',
          actorId: user.id,
        },
        transaction,
      );
    }
    Object.assign(wo, { status: 'in_progress', startedAt: now, startedById: user.id });
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    changed(deps, wo, transaction);
    deps.events.publish({ type: 'maintenance.window_changed', audience: 'all', payload: { toolId: wo.toolId } }, transaction);
    // The board's "Maintenance planned" line travels with the tool's board entry.
    announceBoardTools(deps, [wo.toolId], transaction);
    return presentOrder(wo);
  });
}

function outOfLimit(step: { asksValue: boolean; min: number | null; max: number | null }, value: number | null) {
  if (!step.asksValue || value === null) return false;
  return (step.min !== null && value < step.min) || (step.max !== null && value > step.max);
}

export async function recordProgress(deps: AppDeps, id: number, input: z.output<typeof workOrderProgressSchema>, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'progress', transaction);
    if (input.results) {
      const byStep = new Map(wo.results.map((r) => [r.step, r]));
      const fields: Record<string, string[]> = {};
      for (const r of input.results) {
        const step = wo.checklist[r.step];
        if (!step) {
          fields[`results.${r.step}`] = ['There is no such step.'];
          continue;
        }
        if (r.value !== null && !step.asksValue) fields[`results.${r.step}.value`] = ['This step takes no value.'];
        byStep.set(r.step, {
          step: r.step,
          done: r.done,
          value: r.value,
          outOfLimit: outOfLimit(step, r.value),
          by: user.id,
          at: new Date().toISOString(),
        });
      }
      if (Object.keys(fields).length > 0) throw badRequest('Some steps need attention.', fields);
      wo.results = [...byStep.values()].sort((a, b) => a.step - b.step);
    }
    if (input.handsOnMinutes !== undefined) wo.handsOnMinutes = input.handsOnMinutes;
    if (input.notes !== undefined) wo.notes = input.notes;
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    changed(deps, wo, transaction);
    return presentOrder(wo);
  });
}

/**
 * Completing needs every step ticked. A preventive work order that holds the tool in
 * scheduled downtime returns it to Running only with proof (requalification record or a
 * manager's override); the next due date then counts from this completion.
 */
export async function completeWorkOrder(deps: AppDeps, id: number, input: { version: number; overrideReason?: string }, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'complete', transaction);
    const done = new Set(wo.results.filter((r) => r.done).map((r) => r.step));
    const open = wo.checklist.map((_, i) => i).filter((i) => !done.has(i));
    if (open.length > 0)
      throw new AppError(
        409,
        'checklist_incomplete',
        `Tick every step first: step${open.length > 1 ? 's' : ''} ${open.map((i) => i + 1).join(', ')} ${open.length > 1 ? 'are' : 'is'} not done.`,
      );
    const missingValue = wo.checklist
      .map((s, i) => ({ s, i }))
      .filter(({ s, i }) => s.asksValue && (wo.results.find((r) => r.step === i)?.value ?? null) === null);
    if (missingValue.length > 0)
      throw new AppError(409, 'checklist_values_missing', `Enter the reading of step ${missingValue.map(({ i }) => i + 1).join(', ')}.`);

    const now = new Date();
    const state = await openState(deps.sequelize, wo.toolId, wo.moduleId, transaction);
    const holdsDowntime = wo.kind === 'preventive' && state?.state === 'scheduled_downtime';
    let proof = null;
    if (holdsDowntime) {
      proof = await returnToServiceProof(
        deps,
        { toolId: wo.toolId, since: wo.startedAt ?? wo.createdAt, user, overrideReason: input.overrideReason },
        transaction,
      );
      await changeState(
        deps,
        {
          toolId: wo.toolId,
          moduleId: wo.moduleId,
          state: 'standby',
          note:
            proof.kind === 'override'
              ? `Returned to service after PM, manager's override: ${proof.reason}`.slice(0, 500)
              : 'Returned to service after preventive maintenance',
          actorId: user.id,
        },
        transaction,
      );
    }

    const plan = wo.planId ? await MaintenancePlan.findByPk(wo.planId, { transaction, lock: transaction.LOCK.UPDATE }) : null;
    const counterNow = plan?.counterName ? await counterReading(deps, wo.toolId, plan.counterName, transaction) : null;
    const withinGrace =
      (wo.graceUntil === null || now <= wo.graceUntil) &&
      (wo.graceUntilCounter === null || counterNow === null || counterNow <= wo.graceUntilCounter);
    Object.assign(wo, {
      status: 'done',
      doneAt: now,
      doneById: user.id,
      doneCounter: counterNow,
      withinGrace: wo.kind === 'preventive' ? withinGrace : null,
      returnProof: proof,
    });
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    if (plan) {
      // The next interval runs from the actual completion (common practice).
      Object.assign(plan, { basisAt: now, basisCounter: counterNow ?? plan.basisCounter, lastDoneAt: now });
      await plan.save({ transaction });
    }
    const w = await MaintenanceWindow.findOne({
      where: { workOrderId: wo.id, status: 'booked' },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (w && w.endsAt > now) await w.update({ endsAt: now > w.startsAt ? now : w.startsAt, sequence: w.sequence + 1 }, { transaction });
    changed(deps, wo, transaction);
    deps.events.publish({ type: 'maintenance.window_changed', audience: 'all', payload: { toolId: wo.toolId } }, transaction);
    // The board's "Maintenance planned" line travels with the tool's board entry.
    announceBoardTools(deps, [wo.toolId], transaction);
    return presentOrder(wo);
  });
}

/** Skipping is recorded and counts against compliance; the plan moves on from the skipped due point. */
export async function skipWorkOrder(deps: AppDeps, id: number, input: { version: number; reason: string }) {
  return deps.sequelize.transaction(async (transaction) => {
    const wo = await lockOrder(id, input.version, 'skip', transaction);
    Object.assign(wo, { status: 'skipped', skipReason: input.reason, withinGrace: wo.kind === 'preventive' ? false : null });
    wo.changed('updatedAt', true);
    await wo.save({ transaction });
    const w = await MaintenanceWindow.findOne({
      where: { workOrderId: wo.id, status: 'booked' },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (w) await w.update({ status: 'cancelled', sequence: w.sequence + 1 }, { transaction });
    if (wo.planId) {
      const plan = await MaintenancePlan.findByPk(wo.planId, { transaction, lock: transaction.LOCK.UPDATE });
      if (plan) {
        Object.assign(plan, { basisAt: wo.dueAt ?? new Date(), basisCounter: wo.dueCounter ?? plan.basisCounter });
        await plan.save({ transaction });
      }
    }
    changed(deps, wo, transaction);
    deps.events.publish({ type: 'maintenance.window_changed', audience: 'all', payload: { toolId: wo.toolId } }, transaction);
    // The board's "Maintenance planned" line travels with the tool's board entry.
    announceBoardTools(deps, [wo.toolId], transaction);
    return presentOrder(wo);
  });
}

export function presentOrder(wo: WorkOrder) {
  return {
    id: wo.id,
    toolId: wo.toolId,
    moduleId: wo.moduleId,
    planId: wo.planId,
    ticketId: wo.ticketId,
    kind: wo.kind,
    title: wo.title,
    status: wo.status,
    dueAt: wo.dueAt?.toISOString() ?? null,
    dueCounter: wo.dueCounter,
    graceUntil: wo.graceUntil?.toISOString() ?? null,
    graceUntilCounter: wo.graceUntilCounter,
    checklist: wo.checklist,
    results: wo.results as StepResult[],
    estimatedMinutes: wo.estimatedMinutes,
    handsOnMinutes: wo.handsOnMinutes ?? null,
    notes: wo.notes ?? null,
    skipReason: wo.skipReason ?? null,
    returnProof: wo.returnProof ?? null,
    startedAt: wo.startedAt?.toISOString() ?? null,
    startedById: wo.startedById ?? null,
    doneAt: wo.doneAt?.toISOString() ?? null,
    doneById: wo.doneById ?? null,
    withinGrace: wo.withinGrace ?? null,
    version: wo.version,
    createdAt: wo.createdAt.toISOString(),
  };
}

/** Everything the work-order page and its printed sheet show. */
export async function getWorkOrder(deps: AppDeps, id: number) {
  const wo = await WorkOrder.findByPk(id);
  if (!wo) throw notFound('That work order');
  const [tool, plan, window, parts, records, people] = await Promise.all([
    toolInfo(deps.sequelize, wo.toolId),
    wo.planId ? MaintenancePlan.findByPk(wo.planId) : null,
    MaintenanceWindow.findOne({ where: { workOrderId: wo.id } }),
    deps.sequelize.query<{
      id: number;
      partId: number | null;
      name: string | null;
      partNumber: string | null;
      freeText: string | null;
      quantity: number;
      usedAt: Date;
    }>(
      `SELECT u.id, u.part_id AS partId, p.name, p.part_number AS partNumber, u.free_text AS freeText, u.quantity, u.used_at AS usedAt
         FROM part_uses u LEFT JOIN parts p ON p.id = u.part_id WHERE u.work_order_id = :id ORDER BY u.used_at`,
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
    RequalRecord.findAll({
      where: { toolId: wo.toolId, recordedAt: { [Op.gte]: wo.startedAt ?? wo.createdAt } },
      order: [['recordedAt', 'ASC']],
    }),
    deps.sequelize.query<{ id: number; name: string }>(`SELECT id, name FROM users WHERE id IN (:ids)`, {
      type: QueryTypes.SELECT,
      replacements: { ids: [wo.startedById ?? 0, wo.doneById ?? 0, ...wo.results.map((r) => r.by ?? 0)] },
    }),
  ]);
  const names = Object.fromEntries(people.map((p) => [p.id, p.name]));
  return {
    workOrder: presentOrder(wo),
    tool: { id: tool.id, code: tool.code, name: tool.name },
    plan: plan ? await presentPlan(deps, plan) : null,
    window: window
      ? { uid: window.uid, startsAt: window.startsAt.toISOString(), endsAt: window.endsAt.toISOString(), status: window.status }
      : null,
    parts: parts.map((p) => ({ ...p, usedAt: new Date(p.usedAt).toISOString() })),
    requalRecords: records.map((r) => ({ id: r.id, templateId: r.templateId, passed: r.passed, recordedAt: r.recordedAt.toISOString() })),
    people: names,
  };
}

export async function listWorkOrders(query: { toolId?: number; status?: WorkOrderStatus; open?: boolean; limit: number; offset: number }) {
  const where: Record<string, unknown> = {};
  if (query.toolId) where.toolId = query.toolId;
  if (query.status) where.status = query.status;
  else if (query.open !== undefined) where.status = query.open ? OPEN_WORK_ORDER : ['done', 'skipped'];
  const { rows, count } = await WorkOrder.findAndCountAll({
    where,
    order:
      query.open === false || query.status === 'done'
        ? [
            ['doneAt', 'DESC'],
            ['id', 'DESC'],
          ]
        : [
            ['dueAt', 'ASC'],
            ['id', 'ASC'],
          ],
    limit: query.limit,
    offset: query.offset,
  });
  return { items: rows.map(presentOrder), total: count, limit: query.limit, offset: query.offset };
}

/**
 * The maintenance page: open work orders (soonest first) with their tool and window, and the
 * plans overdue now. Three indexed queries, whatever the history's length.
 */
export async function maintenanceOverview(deps: AppDeps, filter: { toolId?: number } = {}) {
  const now = new Date();
  const toolWhere = filter.toolId ? 'AND w.tool_id = :toolId' : '';
  const open = await deps.sequelize.query<{
    id: number;
    toolId: number;
    toolCode: string;
    toolName: string;
    title: string;
    status: WorkOrderStatus;
    kind: string;
    dueAt: Date | null;
    dueCounter: number | null;
    graceUntil: Date | null;
    startsAt: Date | null;
    endsAt: Date | null;
    version: number;
  }>(
    `SELECT w.id, w.tool_id AS toolId, t.code AS toolCode, t.name AS toolName, w.title, w.status, w.kind,
            w.due_at AS dueAt, w.due_counter AS dueCounter, w.grace_until AS graceUntil,
            mw.starts_at AS startsAt, mw.ends_at AS endsAt, w.version
       FROM work_orders w JOIN tools t ON t.id = w.tool_id
       LEFT JOIN maintenance_windows mw ON mw.work_order_id = w.id AND mw.status = 'booked'
      WHERE w.status IN ('planned','scheduled','in_progress') ${toolWhere}
      ORDER BY COALESCE(mw.starts_at, w.due_at) IS NULL, COALESCE(mw.starts_at, w.due_at), w.id
      LIMIT 500`,
    { type: QueryTypes.SELECT, replacements: { toolId: filter.toolId ?? 0 } },
  );
  // Only the columns that tell what is overdue, as plain rows: building thousands of model
  // instances cost most of this page's time (docs/performance.md).
  const plans = (
    await deps.sequelize.query<{
      id: number;
      toolId: number;
      title: string;
      everyDays: number | null;
      everyUnits: number | null;
      counterName: string | null;
      basisAt: Date;
      basisCounter: number | null;
      graceFactor: number | string;
    }>(
      `SELECT id, tool_id AS toolId, title, every_days AS everyDays, every_units AS everyUnits, counter_name AS counterName,
              basis_at AS basisAt, basis_counter AS basisCounter, grace_factor AS graceFactor
         FROM maintenance_plans WHERE active = 1 ${filter.toolId ? 'AND tool_id = :toolId' : ''}`,
      { type: QueryTypes.SELECT, replacements: { toolId: filter.toolId ?? 0 } },
    )
  ).map((p) => ({
    ...p,
    basisAt: new Date(p.basisAt),
    basisCounter: p.basisCounter === null ? null : Number(p.basisCounter),
    graceFactor: Number(p.graceFactor),
  }));
  const tools = new Map(
    (
      await deps.sequelize.query<{ id: number; code: string; name: string }>(`SELECT id, code, name FROM tools`, {
        type: QueryTypes.SELECT,
      })
    ).map((t) => [t.id, t]),
  );
  const readings = await latestReadings(
    deps,
    plans.filter((p) => p.counterName).map((p) => p.toolId),
  );
  const overdue = [];
  for (const p of plans) {
    const counterNow = p.counterName ? (readings.get(readingKey(p.toolId, p.counterName)) ?? null) : null;
    const due = planDue(p, counterNow);
    if (!isOverdue(due, now, counterNow)) continue;
    const pastGrace =
      (due.graceUntil !== null && new Date(due.graceUntil) < now) ||
      (due.graceUntilCounter !== null && counterNow !== null && counterNow > due.graceUntilCounter);
    const tool = tools.get(p.toolId);
    overdue.push({
      planId: p.id,
      title: p.title,
      toolId: p.toolId,
      toolCode: tool?.code ?? '',
      toolName: tool?.name ?? '',
      dueAt: due.dueAt,
      dueAtCounter: due.dueAtCounter,
      counterNow,
      pastGrace,
    });
  }
  const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
  return {
    generatedAt: now.toISOString(),
    open: open.map((o) => ({
      ...o,
      dueAt: iso(o.dueAt),
      graceUntil: iso(o.graceUntil),
      startsAt: iso(o.startsAt),
      endsAt: iso(o.endsAt),
      late: o.dueAt !== null && new Date(o.dueAt) < now,
    })),
    overdue,
    planCount: plans.length,
  };
}
