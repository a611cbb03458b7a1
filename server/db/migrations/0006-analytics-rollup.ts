import type { QueryInterface } from 'sequelize';
import { E10_STATES, STATE_REASONS } from '../../../shared/equipment-state';

const list = (xs: readonly string[]) => xs.map((x) => `'${x}'`).join(',');
const DOWN = `'scheduled_downtime','unscheduled_downtime'`;

// Analytics read a year of a few hundred tools' state log on every page view; summing and
// window-scanning every interval each time is too slow (about 100,000 intervals a year for
// 300 tools). Three derived tables, all about the tool's own log (module_id IS NULL):
//
// - state_hours_monthly: hours of CLOSED intervals per calendar month (UTC), tool, state and
//   reason. Open intervals and the partial months at a period's edges are read from the log.
// - downtime_hours_by_ticket: the same for unscheduled downtime, per linked ticket (0: none),
//   for the Pareto of downtime by failure mode.
// - state_stretch_starts: the intervals that start a stretch of scheduled or unscheduled
//   downtime, i.e. whose predecessor (the interval of the same tool ending where they start)
//   is in another state. Each unscheduled one is a failure (E10 counts one failure per
//   contiguous stretch of unscheduled downtime, whatever its sub-states).
//
// How they stay correct: triggers on state_intervals run in the writing statement itself.
// Every insert adds the interval (its hours if closed; its own stretch start; and removes its
// successor's start if the successor continues the same stretch), every delete does the
// reverse, and an update is a delete of the old row plus an insert of the new one. That holds
// whoever writes the log and in whatever order rows arrive (the state service, seeds, tests, a
// manual correction). `npm run db:migrate` on an existing database fills them from the log.
//
// Operations note: with binary logging on, creating triggers and procedures needs SUPER (or
// log_bin_trust_function_creators=1) for the migrating user.
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);

  await q(`CREATE TABLE state_hours_monthly (
    month DATE NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    state ENUM(${list(E10_STATES)}) NOT NULL,
    reason ENUM(${list(STATE_REASONS)}) NOT NULL,
    micros BIGINT NOT NULL,
    PRIMARY KEY (month, tool_id, state, reason),
    KEY state_hours_tool (tool_id, month)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE downtime_hours_by_ticket (
    month DATE NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    ticket_id INT UNSIGNED NOT NULL,
    micros BIGINT NOT NULL,
    PRIMARY KEY (month, tool_id, ticket_id),
    KEY downtime_hours_tool (tool_id, month)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE state_stretch_starts (
    interval_id BIGINT UNSIGNED NOT NULL PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    state ENUM(${DOWN}) NOT NULL,
    started_at DATETIME(3) NOT NULL,
    KEY stretch_time (state, started_at, tool_id),
    KEY stretch_tool (tool_id, state, started_at)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // The triggers look up predecessors (by end) and successors (by start, state_tool_time).
  await q(`CREATE INDEX state_tool_end ON state_intervals (tool_id, module_key, ended_at, state)`);
  // Raw edges of a period and open intervals, read without touching the table rows.
  await q(`CREATE INDEX state_time_cover ON state_intervals (module_key, started_at, ended_at, tool_id, state, reason, ticket_id)`);
  await q(`CREATE INDEX state_open ON state_intervals (open_flag, module_key, tool_id)`);
  // Assists by when they were fixed; response times of the tickets reported in a period.
  await q(`CREATE INDEX tickets_fixed ON tickets (fixed_at, fix_kind, tool_id)`);
  await q(`CREATE INDEX tickets_response ON tickets (created_at, status, priority, tool_id, acknowledged_at, resolved_at, fixed_at)`);

  // Adds (sign 1) or removes (sign -1) one closed interval's time, split at month starts.
  await q(`CREATE PROCEDURE analytics_hours_apply(
    IN p_tool INT UNSIGNED, IN p_state VARCHAR(32), IN p_reason VARCHAR(32), IN p_ticket INT UNSIGNED,
    IN p_start DATETIME(3), IN p_end DATETIME(3), IN p_sign INT)
  BEGIN
    DECLARE m DATETIME(3) DEFAULT CAST(DATE_FORMAT(p_start, '%Y-%m-01') AS DATETIME(3));
    DECLARE m_next DATETIME(3);
    DECLARE us BIGINT;
    WHILE m < p_end DO
      SET m_next = m + INTERVAL 1 MONTH;
      SET us = p_sign * TIMESTAMPDIFF(MICROSECOND, GREATEST(p_start, m), LEAST(p_end, m_next));
      INSERT INTO state_hours_monthly (month, tool_id, state, reason, micros) VALUES (DATE(m), p_tool, p_state, p_reason, us)
        ON DUPLICATE KEY UPDATE micros = micros + VALUES(micros);
      IF p_state = 'unscheduled_downtime' THEN
        INSERT INTO downtime_hours_by_ticket (month, tool_id, ticket_id, micros) VALUES (DATE(m), p_tool, COALESCE(p_ticket, 0), us)
          ON DUPLICATE KEY UPDATE micros = micros + VALUES(micros);
      END IF;
      SET m = m_next;
    END WHILE;
  END`);

  // One tool-level interval added (sign 1) to or removed (sign -1) from the log.
  await q(`CREATE PROCEDURE analytics_interval_apply(
    IN p_id BIGINT UNSIGNED, IN p_tool INT UNSIGNED, IN p_state VARCHAR(32), IN p_reason VARCHAR(32),
    IN p_ticket INT UNSIGNED, IN p_start DATETIME(3), IN p_end DATETIME(3), IN p_sign INT)
  BEGIN
    IF p_end IS NOT NULL THEN
      CALL analytics_hours_apply(p_tool, p_state, p_reason, p_ticket, p_start, p_end, p_sign);
    END IF;
    IF p_state IN (${DOWN}) THEN
      IF p_sign = 1 THEN
        IF NOT EXISTS (SELECT 1 FROM state_intervals p WHERE p.tool_id = p_tool AND p.module_key = 0
                        AND p.ended_at = p_start AND p.state = p_state AND p.id <> p_id) THEN
          INSERT IGNORE INTO state_stretch_starts (interval_id, tool_id, state, started_at) VALUES (p_id, p_tool, p_state, p_start);
        END IF;
        -- A successor in the same state now continues this stretch instead of starting one.
        IF p_end IS NOT NULL THEN
          DELETE ss FROM state_stretch_starts ss JOIN state_intervals s ON s.id = ss.interval_id
           WHERE s.tool_id = p_tool AND s.module_key = 0 AND s.started_at = p_end AND s.state = p_state AND s.id <> p_id;
        END IF;
      ELSE
        DELETE FROM state_stretch_starts WHERE interval_id = p_id;
        -- Its successor in the same state starts the stretch now, unless another predecessor joins it.
        IF p_end IS NOT NULL THEN
          INSERT IGNORE INTO state_stretch_starts (interval_id, tool_id, state, started_at)
          SELECT s.id, s.tool_id, s.state, s.started_at FROM state_intervals s
           WHERE s.tool_id = p_tool AND s.module_key = 0 AND s.started_at = p_end AND s.state = p_state AND s.id <> p_id
             AND NOT EXISTS (SELECT 1 FROM state_intervals p WHERE p.tool_id = p_tool AND p.module_key = 0
                              AND p.ended_at = s.started_at AND p.state = s.state AND p.id <> s.id AND p.id <> p_id);
        END IF;
      END IF;
    END IF;
  END`);

  await q(`CREATE TRIGGER state_intervals_analytics_insert AFTER INSERT ON state_intervals FOR EACH ROW
  BEGIN
    IF NEW.module_id IS NULL THEN
      CALL analytics_interval_apply(NEW.id, NEW.tool_id, NEW.state, NEW.reason, NEW.ticket_id, NEW.started_at, NEW.ended_at, 1);
    END IF;
  END`);

  await q(`CREATE TRIGGER state_intervals_analytics_update AFTER UPDATE ON state_intervals FOR EACH ROW
  BEGIN
    IF NOT (OLD.tool_id <=> NEW.tool_id AND OLD.module_id <=> NEW.module_id AND OLD.state <=> NEW.state
            AND OLD.reason <=> NEW.reason AND OLD.ticket_id <=> NEW.ticket_id
            AND OLD.started_at <=> NEW.started_at AND OLD.ended_at <=> NEW.ended_at) THEN
      IF OLD.module_id IS NULL THEN
        CALL analytics_interval_apply(OLD.id, OLD.tool_id, OLD.state, OLD.reason, OLD.ticket_id, OLD.started_at, OLD.ended_at, -1);
      END IF;
      IF NEW.module_id IS NULL THEN
        CALL analytics_interval_apply(NEW.id, NEW.tool_id, NEW.state, NEW.reason, NEW.ticket_id, NEW.started_at, NEW.ended_at, 1);
      END IF;
    END IF;
  END`);

  await q(`CREATE TRIGGER state_intervals_analytics_delete AFTER DELETE ON state_intervals FOR EACH ROW
  BEGIN
    IF OLD.module_id IS NULL THEN
      CALL analytics_interval_apply(OLD.id, OLD.tool_id, OLD.state, OLD.reason, OLD.ticket_id, OLD.started_at, OLD.ended_at, -1);
    END IF;
  END`);

  // Existing history (an upgrade of a running installation), set by set.
  const months = `WITH RECURSIVE months (m) AS (
      SELECT CAST(DATE_FORMAT(MIN(started_at), '%Y-%m-01') AS DATETIME(3)) FROM state_intervals WHERE module_id IS NULL AND ended_at IS NOT NULL
      UNION ALL
      SELECT m + INTERVAL 1 MONTH FROM months WHERE m + INTERVAL 1 MONTH < (SELECT MAX(ended_at) FROM state_intervals WHERE module_id IS NULL)
    )`;
  const spread = `FROM state_intervals si
    JOIN months ON si.started_at < months.m + INTERVAL 1 MONTH AND si.ended_at > months.m
    WHERE si.module_key = 0 AND si.ended_at IS NOT NULL`;
  const clipped = `TIMESTAMPDIFF(MICROSECOND, GREATEST(si.started_at, months.m), LEAST(si.ended_at, months.m + INTERVAL 1 MONTH))`;
  await q(`INSERT INTO state_hours_monthly (month, tool_id, state, reason, micros)
    ${months} SELECT DATE(months.m), si.tool_id, si.state, si.reason, SUM(${clipped}) ${spread}
    GROUP BY months.m, si.tool_id, si.state, si.reason`);
  await q(`INSERT INTO downtime_hours_by_ticket (month, tool_id, ticket_id, micros)
    ${months} SELECT DATE(months.m), si.tool_id, COALESCE(si.ticket_id, 0), SUM(${clipped}) ${spread} AND si.state = 'unscheduled_downtime'
    GROUP BY months.m, si.tool_id, COALESCE(si.ticket_id, 0)`);
  await q(`INSERT INTO state_stretch_starts (interval_id, tool_id, state, started_at)
    SELECT si.id, si.tool_id, si.state, si.started_at FROM state_intervals si
     WHERE si.module_key = 0 AND si.state IN (${DOWN})
       AND NOT EXISTS (SELECT 1 FROM state_intervals p WHERE p.tool_id = si.tool_id AND p.module_key = 0
                        AND p.ended_at = si.started_at AND p.state = si.state AND p.id <> si.id)`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const trigger of ['state_intervals_analytics_delete', 'state_intervals_analytics_update', 'state_intervals_analytics_insert']) {
    await q(`DROP TRIGGER IF EXISTS ${trigger}`);
  }
  await q(`DROP PROCEDURE IF EXISTS analytics_interval_apply`);
  await q(`DROP PROCEDURE IF EXISTS analytics_hours_apply`);
  await q(`DROP INDEX tickets_response ON tickets`);
  await q(`DROP INDEX tickets_fixed ON tickets`);
  await q(`DROP INDEX state_open ON state_intervals`);
  await q(`DROP INDEX state_time_cover ON state_intervals`);
  await q(`DROP INDEX state_tool_end ON state_intervals`);
  for (const table of ['state_stretch_starts', 'downtime_hours_by_ticket', 'state_hours_monthly']) {
    await q(`DROP TABLE IF EXISTS ${table}`);
  }
}
