import { QueryTypes, UniqueConstraintError } from 'sequelize';
import { MaintenancePlan, WorkOrder } from './maintenance.model';
import { latestReadings, readingKey } from './counters';
import { planDue } from './plans.service';
import type { AppDeps } from '../../lib/http';
import { isWithinLead, type NextDue } from '../../../shared/maintenance-plan';

// Creates the work orders of plans coming due. Runs inside every server process; safe with
// several: each batch of plans is claimed with FOR UPDATE SKIP LOCKED (a plan another process
// holds is left to it), a plan with an open work order gets none, and the unique key
// (plan_id, due_key) refuses a second work order for the same due point whatever happens.

const OPEN = ['planned', 'scheduled', 'in_progress'];

/** The due point a work order is made for: calendar time and/or counter reading. */
export function dueKeyOf(due: NextDue) {
  return `${due.dueAt ?? '-'}|${due.dueAtCounter ?? '-'}`;
}

export interface SchedulerPass {
  examined: number;
  created: number;
}

export async function runSchedulerPass(deps: AppDeps, now = new Date(), batchSize = 250): Promise<SchedulerPass> {
  let lastId = 0;
  let examined = 0;
  let created = 0;
  for (;;) {
    const batch = await deps.sequelize.transaction(async (transaction) => {
      const plans = await MaintenancePlan.findAll({
        where: deps.sequelize.literal(`active = 1 AND id > ${Number(lastId)}`),
        order: [['id', 'ASC']],
        limit: batchSize,
        transaction,
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
      });
      if (plans.length === 0) return null;
      const open = await deps.sequelize.query<{ planId: number }>(
        `SELECT DISTINCT plan_id AS planId FROM work_orders WHERE plan_id IN (:ids) AND status IN (:open)`,
        { type: QueryTypes.SELECT, replacements: { ids: plans.map((p) => p.id), open: OPEN }, transaction },
      );
      const hasOpen = new Set(open.map((o) => Number(o.planId)));
      const readings = await latestReadings(
        deps,
        plans.filter((p) => p.counterName).map((p) => p.toolId),
        transaction,
      );
      let made = 0;
      for (const plan of plans) {
        if (hasOpen.has(plan.id)) continue;
        const counterNow = plan.counterName ? (readings.get(readingKey(plan.toolId, plan.counterName)) ?? null) : null;
        const due = planDue(plan, counterNow);
        if (!isWithinLead(due, plan, now, counterNow)) continue;
        try {
          await WorkOrder.create(
            {
              toolId: plan.toolId,
              moduleId: plan.moduleId,
              planId: plan.id,
              ticketId: null,
              kind: 'preventive',
              title: plan.title,
              dueKey: dueKeyOf(due),
              dueAt: due.dueAt ? new Date(due.dueAt) : null,
              dueCounter: due.dueAtCounter,
              graceUntil: due.graceUntil ? new Date(due.graceUntil) : null,
              graceUntilCounter: due.graceUntilCounter,
              checklist: plan.checklist,
              results: [],
              estimatedMinutes: plan.estimatedMinutes,
              createdById: null,
            },
            { transaction },
          );
          made++;
          deps.events.publish(
            { type: 'maintenance.changed', audience: 'staff', payload: { toolId: plan.toolId, planId: plan.id } },
            transaction,
          );
        } catch (err) {
          // Already made for this due point (a skipped or done one): nothing to do.
          if (!(err instanceof UniqueConstraintError)) throw err;
        }
      }
      return { count: plans.length, last: plans[plans.length - 1].id, made };
    });
    if (!batch) break;
    examined += batch.count;
    created += batch.made;
    lastId = batch.last;
  }
  return { examined, created };
}

/** Runs a pass now and then every `everyMs`; passes never overlap within one process. */
export function startScheduler(deps: AppDeps, everyMs: number) {
  let running: Promise<unknown> | null = null;
  let stopped = false;
  const tick = () => {
    if (running || stopped) return;
    running = runSchedulerPass(deps)
      .then((r) => r.created > 0 && deps.log.info({ created: r.created, examined: r.examined }, 'maintenance work orders created'))
      .catch((err) => deps.log.error({ err }, 'maintenance scheduler pass failed'))
      .finally(() => (running = null));
  };
  const timer = setInterval(tick, everyMs);
  timer.unref();
  setTimeout(tick, 1000).unref();
  return {
    async stop() {
      stopped = true;
      clearInterval(timer);
      await running;
    },
  };
}
