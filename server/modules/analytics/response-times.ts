// Response figures from tickets reported in the period: time to acknowledge
// (acknowledged_at − created_at) and time to restore (resolved_at, or fixed_at, − created_at),
// mean and 90th percentile per priority, against the service targets. A ticket still waiting
// past its target counts as missed already; one still inside its target is not counted yet.
// Merged tickets are left out: their clock lives on in the ticket they were merged into.

import { QueryTypes, type Sequelize } from 'sequelize';
import { PRIORITIES, SERVICE_TARGET_DEFAULTS, type Priority, type ServiceTarget } from '../../../shared/priority';
import type { ResponseRow } from '../../../shared/schemas/analytics';
import type { PeriodPlan } from './period-plan';
import type { Scope } from './analytics.service';

/** The targets in force: the service_targets row of each priority, or the shared default. */
export async function effectiveTargets(sequelize: Sequelize): Promise<Record<Priority, ServiceTarget>> {
  const rows = await sequelize.query<{ priority: Priority; ack: number; restore: number }>(
    'SELECT priority, acknowledge_minutes AS ack, restore_minutes AS `restore` FROM service_targets',
    { type: QueryTypes.SELECT },
  );
  const targets = { ...SERVICE_TARGET_DEFAULTS };
  for (const row of rows) targets[row.priority] = { acknowledgeMinutes: Number(row.ack), restoreMinutes: Number(row.restore) };
  return targets;
}

function scopeSql(scope: Scope): string {
  if (scope.kind === 'tool') return ' AND tk.tool_id = :scopeToolId';
  if (scope.kind === 'area') return ' AND tk.tool_id IN (SELECT id FROM tools WHERE area_id = :scopeAreaId)';
  return '';
}

const targetCase = (kind: 'ack' | 'restore') =>
  `CASE tk.priority ${PRIORITIES.map((p) => `WHEN '${p}' THEN :${kind}${p}`).join(' ')} END * 60`;

interface ResponseSqlRow {
  priority: Priority;
  tickets: number;
  acknowledged: number;
  ackMeanS: number | string | null;
  ackMet: number | string | null;
  restored: number;
  restoreMeanS: number | string | null;
  restoreMet: number | string | null;
}

interface PercentileRow {
  priority: Priority;
  ackP90: number | string | null;
  restoreP90: number | string | null;
  ackP90All: number | string | null;
  restoreP90All: number | string | null;
}

const num = (v: unknown) => Number(v ?? 0);
const minutes = (seconds: unknown) => (seconds === null || seconds === undefined ? null : Number(seconds) / 60);
const share = (met: number, decided: number) => (decided > 0 ? met / decided : null);

export async function responseFigures(
  sequelize: Sequelize,
  plan: PeriodPlan,
  scope: Scope,
  now: Date,
): Promise<{ byPriority: ResponseRow[]; overall: ResponseRow }> {
  const targets = await effectiveTargets(sequelize);
  const replacements: Record<string, unknown> = { from: plan.from, to: plan.to, now };
  if (scope.kind === 'tool') replacements.scopeToolId = scope.toolId;
  if (scope.kind === 'area') replacements.scopeAreaId = scope.areaId;
  for (const p of PRIORITIES) {
    replacements[`ack${p}`] = targets[p].acknowledgeMinutes;
    replacements[`restore${p}`] = targets[p].restoreMinutes;
  }
  const base = `FROM tickets tk WHERE tk.created_at >= :from AND tk.created_at < :to AND tk.status <> 'merged'${scopeSql(scope)}`;
  const ack = 'TIMESTAMPDIFF(SECOND, tk.created_at, tk.acknowledged_at)';
  const restoredAt = 'COALESCE(tk.resolved_at, tk.fixed_at)';
  const restore = `TIMESTAMPDIFF(SECOND, tk.created_at, ${restoredAt})`;

  // Two queries side by side: plain aggregates per priority, and the percentiles. MariaDB has
  // PERCENTILE_CONT only as a window function (DISTINCT folds it to one row per priority);
  // NULLs, tickets not yet acknowledged or restored, drop out of the ordering. Folding the
  // aggregates into the window query as well made it several times slower.
  const [sums, percentiles] = await Promise.all([
    sequelize.query<ResponseSqlRow>(
      `SELECT tk.priority,
              COUNT(*) AS tickets,
              COUNT(tk.acknowledged_at) AS acknowledged,
              AVG(${ack}) AS ackMeanS,
              SUM(tk.acknowledged_at IS NOT NULL AND ${ack} <= ${targetCase('ack')}) AS ackMet,
              COUNT(${restoredAt}) AS restored,
              AVG(${restore}) AS restoreMeanS,
              SUM(${restoredAt} IS NOT NULL AND ${restore} <= ${targetCase('restore')}) AS restoreMet
         ${base}
        GROUP BY tk.priority ORDER BY NULL`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<PercentileRow>(
      `SELECT DISTINCT x.priority,
              PERCENTILE_CONT(0.9) WITHIN GROUP (ORDER BY x.ack) OVER (PARTITION BY x.priority) AS ackP90,
              PERCENTILE_CONT(0.9) WITHIN GROUP (ORDER BY x.rst) OVER (PARTITION BY x.priority) AS restoreP90,
              PERCENTILE_CONT(0.9) WITHIN GROUP (ORDER BY x.ack) OVER () AS ackP90All,
              PERCENTILE_CONT(0.9) WITHIN GROUP (ORDER BY x.rst) OVER () AS restoreP90All
         FROM (SELECT tk.priority, ${ack} AS ack, ${restore} AS rst ${base}) x`,
      { type: QueryTypes.SELECT, replacements },
    ),
  ]);

  // Still open past the target at the period's end counts as missed, whenever the ticket was
  // reported: a ticket from before the period that nobody has acknowledged is missing its target
  // now, and the share must not read "100 %" beside it.
  const overdue = await sequelize.query<{ priority: string; ackOverdue: number | string | null; restoreOverdue: number | string | null }>(
    `SELECT tk.priority,
            SUM(tk.acknowledged_at IS NULL AND TIMESTAMPDIFF(SECOND, tk.created_at, :to) > ${targetCase('ack')}) AS ackOverdue,
            SUM(${restoredAt} IS NULL AND TIMESTAMPDIFF(SECOND, tk.created_at, :to) > ${targetCase('restore')}) AS restoreOverdue
       FROM tickets tk
      WHERE tk.created_at < :to AND tk.status NOT IN ('merged', 'closed', 'no_fault_found')
        AND (tk.acknowledged_at IS NULL OR ${restoredAt} IS NULL)${scopeSql(scope)}
      GROUP BY tk.priority ORDER BY NULL`,
    { type: QueryTypes.SELECT, replacements },
  );
  const byOverdue = new Map(overdue.map((r) => [r.priority, r]));
  const bySum = new Map(sums.map((r) => [r.priority, r]));
  const byPct = new Map(percentiles.map((r) => [r.priority, r]));
  const totals = {
    tickets: 0,
    acknowledged: 0,
    ackSeconds: 0,
    ackMet: 0,
    ackDecided: 0,
    restored: 0,
    restoreSeconds: 0,
    restoreMet: 0,
    restoreDecided: 0,
    ackOverdue: 0,
    restoreOverdue: 0,
  };

  const byPriority: ResponseRow[] = PRIORITIES.map((priority) => {
    const s = bySum.get(priority);
    const p = byPct.get(priority);
    const acknowledged = num(s?.acknowledged);
    const restored = num(s?.restored);
    const ackMet = num(s?.ackMet);
    const restoreMet = num(s?.restoreMet);
    const ackOverdue = num(byOverdue.get(priority)?.ackOverdue);
    const restoreOverdue = num(byOverdue.get(priority)?.restoreOverdue);
    const ackDecided = acknowledged + ackOverdue;
    const restoreDecided = restored + restoreOverdue;
    totals.ackOverdue += ackOverdue;
    totals.restoreOverdue += restoreOverdue;
    totals.tickets += num(s?.tickets);
    totals.acknowledged += acknowledged;
    totals.ackSeconds += num(s?.ackMeanS) * acknowledged;
    totals.ackMet += ackMet;
    totals.ackDecided += ackDecided;
    totals.restored += restored;
    totals.restoreSeconds += num(s?.restoreMeanS) * restored;
    totals.restoreMet += restoreMet;
    totals.restoreDecided += restoreDecided;
    return {
      priority,
      tickets: num(s?.tickets),
      acknowledged,
      ackMeanMinutes: acknowledged > 0 ? minutes(s?.ackMeanS) : null,
      ackP90Minutes: minutes(p?.ackP90),
      ackTargetMinutes: targets[priority].acknowledgeMinutes,
      ackMetShare: share(ackMet, ackDecided),
      ackOverdue,
      restored,
      restoreMeanMinutes: restored > 0 ? minutes(s?.restoreMeanS) : null,
      restoreP90Minutes: minutes(p?.restoreP90),
      restoreTargetMinutes: targets[priority].restoreMinutes,
      restoreMetShare: share(restoreMet, restoreDecided),
      restoreOverdue,
    };
  });

  const anyPct = percentiles[0];
  const overall: ResponseRow = {
    priority: 'all',
    tickets: totals.tickets,
    acknowledged: totals.acknowledged,
    ackMeanMinutes: totals.acknowledged > 0 ? totals.ackSeconds / totals.acknowledged / 60 : null,
    ackP90Minutes: minutes(anyPct?.ackP90All),
    ackTargetMinutes: null,
    ackMetShare: share(totals.ackMet, totals.ackDecided),
    ackOverdue: totals.ackOverdue,
    restored: totals.restored,
    restoreMeanMinutes: totals.restored > 0 ? totals.restoreSeconds / totals.restored / 60 : null,
    restoreP90Minutes: minutes(anyPct?.restoreP90All),
    restoreTargetMinutes: null,
    restoreMetShare: share(totals.restoreMet, totals.restoreDecided),
    restoreOverdue: totals.restoreOverdue,
  };
  return { byPriority, overall };
}
