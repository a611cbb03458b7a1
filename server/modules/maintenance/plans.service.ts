import type { Transaction } from 'sequelize';
import { MaintenancePlan, PlanChange, WorkOrder } from './maintenance.model';
import { counterReading, latestReadings, readingKey } from './counters';
import { moduleBelongs, toolInfo } from './lookups';
import { AppError, badRequest, notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { nextDue, type NextDue } from '../../../shared/maintenance-plan';
import type { PlanCreateInput, PlanUpdateInput } from '../../../shared/schemas/maintenance';

export interface PlanView {
  id: number;
  toolId: number;
  moduleId: number | null;
  title: string;
  checklist: MaintenancePlan['checklist'];
  estimatedMinutes: number;
  everyDays: number | null;
  everyUnits: number | null;
  counterName: string | null;
  leadDays: number;
  leadUnits: number;
  graceFactor: number;
  lastDoneAt: string | null;
  basisAt: string;
  basisCounter: number | null;
  counterNow: number | null;
  due: NextDue;
  /** Past the calendar due time or the counter due reading, and no work order done since. */
  overdue: boolean;
  active: boolean;
  version: number;
}

/** Next due point of a plan from its basis (last completion or skipped due) and the counter now. */
/** What the due date depends on: a plan instance, or a row read for that alone. */
export type PlanTrigger = Pick<MaintenancePlan, 'everyDays' | 'everyUnits' | 'basisAt' | 'basisCounter' | 'graceFactor'>;

export function planDue(plan: PlanTrigger, counterNow: number | null): NextDue {
  return nextDue({
    everyDays: plan.everyDays,
    everyUnits: plan.everyUnits,
    lastDoneAt: plan.basisAt,
    lastDoneCounter: plan.basisCounter,
    counterNow,
    graceFactor: plan.graceFactor,
  });
}

export function isOverdue(due: NextDue, now: Date, counterNow: number | null) {
  return (
    (due.dueAt !== null && new Date(due.dueAt) < now) ||
    (due.dueAtCounter !== null && counterNow !== null && counterNow >= due.dueAtCounter)
  );
}

export async function presentPlan(deps: AppDeps, plan: MaintenancePlan, now = new Date(), transaction?: Transaction): Promise<PlanView> {
  const counterNow = plan.counterName ? await counterReading(deps, plan.toolId, plan.counterName, transaction) : null;
  return presentWithReading(plan, counterNow, now);
}

function presentWithReading(plan: MaintenancePlan, counterNow: number | null, now: Date): PlanView {
  const due = planDue(plan, counterNow);
  return {
    id: plan.id,
    toolId: plan.toolId,
    moduleId: plan.moduleId,
    title: plan.title,
    checklist: plan.checklist,
    estimatedMinutes: plan.estimatedMinutes,
    everyDays: plan.everyDays,
    everyUnits: plan.everyUnits,
    counterName: plan.counterName,
    leadDays: plan.leadDays,
    leadUnits: plan.leadUnits,
    graceFactor: plan.graceFactor,
    lastDoneAt: plan.lastDoneAt?.toISOString() ?? null,
    basisAt: plan.basisAt.toISOString(),
    basisCounter: plan.basisCounter,
    counterNow,
    due,
    overdue: isOverdue(due, now, counterNow),
    active: plan.active,
    version: plan.version,
  };
}

function checkTriggers(p: { everyDays: number | null; everyUnits: number | null; counterName: string | null }) {
  if (p.everyDays === null && p.everyUnits === null)
    throw badRequest('A plan needs an interval.', { everyDays: ['Give an interval in days, in units of a counter, or both.'] });
  if (p.everyUnits !== null && !p.counterName)
    throw badRequest('Name the counter.', { counterName: ['Name the counter the units are read from (for example wafers).'] });
}

export async function createPlan(deps: AppDeps, input: PlanCreateInput, actorId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const tool = await toolInfo(deps.sequelize, input.toolId, transaction).catch(() => null);
    if (!tool) throw badRequest('Unknown tool.', { toolId: ['There is no such tool.'] });
    if (tool.retiredAt) throw new AppError(409, 'tool_retired', 'This tool is retired; it needs no maintenance plan.');
    if (!(await moduleBelongs(deps.sequelize, tool.id, input.moduleId, transaction)))
      throw badRequest('Unknown module.', { moduleId: ['That module does not belong to this tool.'] });
    const basisAt = input.lastDoneAt ?? new Date();
    const basisCounter = input.counterName ? ((await counterReading(deps, tool.id, input.counterName, transaction)) ?? 0) : null;
    const plan = await MaintenancePlan.create(
      {
        toolId: tool.id,
        moduleId: input.moduleId,
        title: input.title,
        checklist: input.checklist,
        estimatedMinutes: input.estimatedMinutes,
        everyDays: input.everyDays,
        everyUnits: input.everyUnits,
        counterName: input.counterName,
        leadDays: input.leadDays,
        leadUnits: input.leadUnits,
        graceFactor: input.graceFactor,
        basisAt,
        basisCounter,
        lastDoneAt: input.lastDoneAt ?? null,
        createdById: actorId,
      },
      { transaction },
    );
    await PlanChange.create({ planId: plan.id, actorId, changes: { created: { from: null, to: input.title } } }, { transaction });
    deps.events.publish({ type: 'maintenance.changed', audience: 'staff', payload: { toolId: tool.id, planId: plan.id } }, transaction);
    return presentPlan(deps, plan, new Date(), transaction);
  });
}

const EDITABLE = [
  'title',
  'checklist',
  'estimatedMinutes',
  'everyDays',
  'everyUnits',
  'counterName',
  'leadDays',
  'leadUnits',
  'graceFactor',
  'active',
] as const;

/** Every change is recorded field by field (from → to) in maintenance_plan_changes. */
export async function updatePlan(deps: AppDeps, id: number, input: PlanUpdateInput, actorId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const plan = await MaintenancePlan.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!plan) throw notFound('That plan');
    if (plan.version !== input.version)
      throw new AppError(
        409,
        'stale_version',
        'Someone else changed this plan while you had it open. Reload it and apply your change again.',
      );
    const changes: Record<string, { from: unknown; to: unknown }> = {};
    for (const key of EDITABLE) {
      const to = input[key];
      if (to === undefined) continue;
      const from = plan.get(key);
      if (JSON.stringify(from) === JSON.stringify(to)) continue;
      changes[key] = { from, to };
      plan.set(key, to as never);
    }
    checkTriggers(plan);
    if (Object.keys(changes).length > 0) {
      await plan.save({ transaction });
      await PlanChange.create({ planId: plan.id, actorId, changes }, { transaction });
      deps.events.publish(
        { type: 'maintenance.changed', audience: 'staff', payload: { toolId: plan.toolId, planId: plan.id } },
        transaction,
      );
    }
    return presentPlan(deps, plan, new Date(), transaction);
  });
}

export async function listPlans(deps: AppDeps, query: { toolId?: number; limit: number; offset: number }) {
  const where = query.toolId ? { toolId: query.toolId } : {};
  const { rows, count } = await MaintenancePlan.findAndCountAll({
    where,
    order: [
      ['toolId', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: query.limit,
    offset: query.offset,
  });
  const now = new Date();
  const readings = await latestReadings(
    deps,
    rows.filter((p) => p.counterName).map((p) => p.toolId),
  );
  const items = rows.map((p) =>
    presentWithReading(p, p.counterName ? (readings.get(readingKey(p.toolId, p.counterName)) ?? null) : null, now),
  );
  return { items, total: count, limit: query.limit, offset: query.offset };
}

export async function getPlan(deps: AppDeps, id: number) {
  const plan = await MaintenancePlan.findByPk(id);
  if (!plan) throw notFound('That plan');
  const [changes, workOrders] = await Promise.all([
    PlanChange.findAll({ where: { planId: id }, order: [['createdAt', 'DESC']], limit: 100 }),
    WorkOrder.findAll({
      where: { planId: id },
      order: [['createdAt', 'DESC']],
      limit: 20,
      attributes: ['id', 'status', 'dueAt', 'doneAt', 'withinGrace'],
    }),
  ]);
  return {
    plan: await presentPlan(deps, plan),
    changes: changes.map((c) => ({ id: Number(c.id), actorId: c.actorId, changes: c.changes, at: c.createdAt.toISOString() })),
    workOrders: workOrders.map((w) => ({
      id: w.id,
      status: w.status,
      dueAt: w.dueAt?.toISOString() ?? null,
      doneAt: w.doneAt?.toISOString() ?? null,
      withinGrace: w.withinGrace,
    })),
  };
}
