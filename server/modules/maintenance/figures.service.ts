import { QueryTypes } from 'sequelize';
import type { AppDeps } from '../../lib/http';
import { maintenanceOverview } from './work-orders.service';
import { counterUsageByTool } from '../alarms/counters.service';

// Maintenance figures for a period: PM compliance (share of preventive work orders due in
// the period that were done within their grace window; skipped and unfinished ones count
// against it), planned vs unplanned downtime hours (E10 scheduled vs unscheduled downtime of
// the tools themselves), mean time to perform PM (E10: start to completion of the work
// order), overdue plans now, and MCBF (wafers between failures) where a wafer counter exists.

const ratio = (a: number, b: number) => (b > 0 ? a / b : null);

export async function maintenanceFigures(deps: AppDeps, q: { from: Date; to: Date; toolId?: number }) {
  const toolSql = q.toolId ? 'AND w.tool_id = :toolId' : '';
  const r = { from: q.from, to: q.to, toolId: q.toolId ?? 0, now: new Date() };
  const [compliance, downtime, perform, waferUse] = await Promise.all([
    deps.sequelize.query<{
      toolId: number;
      code: string;
      name: string;
      due: number;
      onTime: number;
      late: number;
      skipped: number;
      open: number;
    }>(
      `SELECT w.tool_id AS toolId, t.code, t.name, COUNT(*) AS due,
              SUM(w.status = 'done' AND w.within_grace = 1) AS onTime,
              SUM(w.status = 'done' AND w.within_grace = 0) AS late,
              SUM(w.status = 'skipped') AS skipped,
              SUM(w.status IN ('planned','scheduled','in_progress')) AS open
         FROM work_orders w JOIN tools t ON t.id = w.tool_id
        WHERE w.kind = 'preventive' AND w.due_at >= :from AND w.due_at < :to ${toolSql}
        GROUP BY w.tool_id, t.code, t.name ORDER BY t.name`,
      { type: QueryTypes.SELECT, replacements: r },
    ),
    deps.sequelize.query<{ state: string; hours: number }>(
      `SELECT si.state, SUM(TIMESTAMPDIFF(MICROSECOND, GREATEST(si.started_at, :from), LEAST(COALESCE(si.ended_at, :now), :to))) / 3600e6 AS hours
         FROM state_intervals si
        WHERE si.module_key = 0 AND si.state IN ('scheduled_downtime','unscheduled_downtime')
          AND si.started_at < :to AND COALESCE(si.ended_at, :now) > :from ${q.toolId ? 'AND si.tool_id = :toolId' : ''}
        GROUP BY si.state`,
      { type: QueryTypes.SELECT, replacements: r },
    ),
    deps.sequelize.query<{ n: number; hours: number | null }>(
      `SELECT COUNT(*) AS n, AVG(TIMESTAMPDIFF(MICROSECOND, w.started_at, w.done_at)) / 3600e6 AS hours
         FROM work_orders w WHERE w.kind = 'preventive' AND w.status = 'done' AND w.started_at IS NOT NULL
          AND w.done_at >= :from AND w.done_at < :to ${toolSql}`,
      { type: QueryTypes.SELECT, replacements: r },
    ),
    counterUsageByTool(deps, 'wafers', q),
  ]);

  // Failures of the tools that counted wafers in the period (MCBF needs both).
  const failures = waferUse.length
    ? await deps.sequelize.query<{ toolId: number; n: number }>(
        `SELECT k.tool_id AS toolId, COUNT(*) AS n FROM tickets k
          WHERE k.tool_id IN (:ids) AND k.fix_kind = 'failure' AND k.fixed_at >= :from AND k.fixed_at < :to
          GROUP BY k.tool_id`,
        { type: QueryTypes.SELECT, replacements: { ...r, ids: waferUse.map((w) => w.toolId) } },
      )
    : [];
  const wafers = waferUse.map((w) => ({
    toolId: w.toolId,
    wafers: w.used,
    failures: Number(failures.find((f) => Number(f.toolId) === w.toolId)?.n ?? 0),
  }));

  const perTool = compliance.map((c) => {
    const due = Number(c.due);
    const onTime = Number(c.onTime ?? 0);
    return {
      toolId: c.toolId,
      code: c.code,
      name: c.name,
      due,
      onTime,
      late: Number(c.late ?? 0),
      skipped: Number(c.skipped ?? 0),
      open: Number(c.open ?? 0),
      compliance: ratio(onTime, due),
    };
  });
  const dueAll = perTool.reduce((a, t) => a + t.due, 0);
  const onTimeAll = perTool.reduce((a, t) => a + t.onTime, 0);
  const hours = (state: string) => Number(downtime.find((d) => d.state === state)?.hours ?? 0);
  const waferTotal = wafers.reduce((a, w) => a + Number(w.wafers), 0);
  const failureTotal = wafers.reduce((a, w) => a + Number(w.failures), 0);
  const overview = await maintenanceOverview(deps, { toolId: q.toolId });

  return {
    from: q.from.toISOString(),
    to: q.to.toISOString(),
    compliance: { facility: ratio(onTimeAll, dueAll), due: dueAll, onTime: onTimeAll, perTool },
    downtimeHours: { planned: hours('scheduled_downtime'), unplanned: hours('unscheduled_downtime') },
    meanTimeToPerformPmHours: perform[0]?.hours === null || perform[0] === undefined ? null : Number(perform[0].hours),
    pmDone: Number(perform[0]?.n ?? 0),
    overdueNow: overview.overdue.length,
    mcbf: {
      // Only tools with a wafer counter contribute; without counters MCBF cannot be told.
      toolsWithCounter: wafers.length,
      wafers: waferTotal,
      failures: failureTotal,
      wafersPerFailure: ratio(waferTotal, failureTotal),
    },
  };
}
