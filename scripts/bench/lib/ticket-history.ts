// The people and ticket timelines of the generated five-year facility (scripts/bench/analytics.ts
// makes the tools, state log and tickets): staff and members, a reporter and (once
// acknowledged) an assignee on every ticket, hazards, report texts, about half a million
// timeline events, one member with hundreds of reports and one ticket with ~300 events.
// Everything is derived from the ticket ids in SQL, so it is fixed and fast to load.
// All names are invented.
import type { Sequelize } from 'sequelize';
import { hashPassword } from '../../../server/modules/users/password';

export const BENCH_PASSWORD = 'bench-manager-password-42';
export const BENCH_MANAGER = { id: 1, email: 'bench.manager@bench.faultline.test' };
/** The member with hundreds of reports (their own and ones they added to). */
export const BENCH_MEMBER = { id: 2, email: 'bench.member@bench.faultline.test' };
const TECHNICIANS = 20; // ids 3..22
const MEMBERS = 240; // ids 23..262
const FIRST_TECH = 3;
const FIRST_MEMBER = FIRST_TECH + TECHNICIANS;
/** The ticket whose timeline runs to about 300 events. */
export const LONG_TICKET_ID = 1000;
const LONG_EXTRA_EVENTS = 300;

const reply = 'Thanks, we are looking at it. The chamber was vented and the part is on order.';

export async function generatePeopleAndTimelines(sequelize: Sequelize, startMs: number) {
  const q = (sql: string, replacements?: unknown[]) => sequelize.query(sql, replacements ? { replacements } : undefined);
  const created = new Date(startMs).toISOString().slice(0, 23).replace('T', ' ');
  const hash = await hashPassword(BENCH_PASSWORD);
  const users: string[] = [
    `(${BENCH_MANAGER.id}, '${BENCH_MANAGER.email}', 'Bench manager', 'manager', :hash, '${created}', '${created}')`,
    `(${BENCH_MEMBER.id}, '${BENCH_MEMBER.email}', 'Bench frequent reporter', 'member', :hash, '${created}', '${created}')`,
  ];
  for (let i = 0; i < TECHNICIANS; i++)
    users.push(
      `(${FIRST_TECH + i}, 'bench.tech${i + 1}@bench.faultline.test', 'Bench technician ${i + 1}', 'technician', NULL, '${created}', '${created}')`,
    );
  for (let i = 0; i < MEMBERS; i++)
    users.push(
      `(${FIRST_MEMBER + i}, 'bench.member${i + 1}@bench.faultline.test', 'Bench member ${i + 1}', 'member', NULL, '${created}', '${created}')`,
    );
  await sequelize.query(`INSERT INTO users (id, email, name, role, password_hash, created_at, updated_at) VALUES ${users.join(',')}`, {
    replacements: { hash },
  });

  // Engineers per tool; the manager looks after every 25th tool (the "my tools" filter).
  await q(`UPDATE tools SET primary_engineer_id = IF(id % 25 = 0, ${BENCH_MANAGER.id}, ${FIRST_TECH} + id % ${TECHNICIANS}),
                            backup_engineer_id = ${FIRST_TECH} + (id + 7) % ${TECHNICIANS}`);

  await q(`UPDATE tickets SET
      reporter_id = IF(id % 200 = 0, ${BENCH_MEMBER.id}, ${FIRST_MEMBER} + (id * 7919) % ${MEMBERS}),
      assignee_id = IF(acknowledged_at IS NULL, NULL, IF(id % 50 = 0, ${BENCH_MANAGER.id}, ${FIRST_TECH} + (id * 104729) % ${TECHNICIANS})),
      hazards = CASE id % 29 WHEN 0 THEN '["leak"]' WHEN 1 THEN '["smell","electrical"]' ELSE '[]' END,
      description = CONCAT('Bench report ', id, '. ', REPEAT('The tool stopped in the middle of a run and showed an alarm on the controller. ', 5)),
      alarm_text = CONCAT('ALM-', 1000 + id % 900, ' interlock open'),
      cause = IF(fixed_at IS NULL, NULL, REPEAT('Worn seal on the lift assembly; particles on the sensor. ', 3)),
      work_done = IF(fixed_at IS NULL, NULL, REPEAT('Replaced the seal, cleaned the sensor, ran two test wafers. ', 3)),
      parts_used = IF(fixed_at IS NULL, NULL, 'Seal kit, lint-free wipes'),
      hands_on_minutes = IF(fixed_at IS NULL, NULL, 20 + id % 100)`);

  const insert = `INSERT INTO ticket_events (ticket_id, actor_id, kind, internal, body, data, created_at)`;
  await q(`${insert} SELECT t.id, t.reporter_id, 'reported', 0, t.description,
      JSON_OBJECT('category', t.category, 'impact', t.impact, 'hazards', JSON_EXTRACT(t.hazards, '$'), 'alarmText', t.alarm_text), t.created_at
    FROM tickets t`);
  await q(`${insert} SELECT t.id, NULL, 'tool_state', 0, NULL,
      JSON_OBJECT('to', JSON_OBJECT('state', 'unscheduled_downtime', 'reason', 'repair'), 'source', 'staff', 'confirmed', true), t.created_at + INTERVAL 2 SECOND
    FROM tickets t WHERE t.impact = 'tool_stopped'`);
  await q(`${insert} SELECT t.id, t.assignee_id, 'assignment', 0, NULL,
      JSON_OBJECT('from', NULL, 'to', JSON_OBJECT('id', t.assignee_id, 'name', u.name), 'automatic', false), t.acknowledged_at
    FROM tickets t JOIN users u ON u.id = t.assignee_id WHERE t.acknowledged_at IS NOT NULL`);
  await q(`${insert} SELECT t.id, t.assignee_id, 'status', 0, NULL, JSON_OBJECT('action', 'acknowledge', 'from', 'reported', 'to', 'acknowledged'), t.acknowledged_at + INTERVAL 1 SECOND
    FROM tickets t WHERE t.acknowledged_at IS NOT NULL`);
  await q(
    `${insert} SELECT t.id, t.assignee_id, 'reply', 0, ?, NULL, t.acknowledged_at + INTERVAL 10 MINUTE
    FROM tickets t WHERE t.acknowledged_at IS NOT NULL AND t.id % 2 = 0`,
    [reply],
  );
  await q(`${insert} SELECT t.id, t.assignee_id, 'note', 1, 'Checked the log; same alarm as last month.', NULL, t.fixed_at - INTERVAL 1 MINUTE
    FROM tickets t WHERE t.fixed_at IS NOT NULL AND t.id % 3 = 0`);
  await q(`${insert} SELECT t.id, t.assignee_id, 'status', 0, NULL, JSON_OBJECT('action', 'fix', 'from', 'in_repair', 'to', 'fixed'), t.fixed_at
    FROM tickets t WHERE t.fixed_at IS NOT NULL`);
  await q(`${insert} SELECT t.id, t.assignee_id, 'status', 0, NULL, JSON_OBJECT('action', 'close', 'from', 'fixed', 'to', 'closed'), t.closed_at
    FROM tickets t WHERE t.closed_at IS NOT NULL`);
  // The frequent reporter also added their report to other people's tickets.
  await q(`${insert} SELECT t.id, ${BENCH_MEMBER.id}, 'added_report', 0, 'Same here, the tool stopped on my run too.', JSON_OBJECT('impact', t.impact), t.created_at + INTERVAL 30 MINUTE
    FROM tickets t WHERE t.id % 600 = 300`);
  // One long-running ticket: a long exchange of replies and notes.
  await q(
    `${insert} SELECT t.id, IF(s.seq % 2 = 0, t.reporter_id, ${FIRST_TECH}), IF(s.seq % 5 = 0, 'note', 'reply'), s.seq % 5 = 0,
      CONCAT('Update ', s.seq, ': ', ?), NULL, t.created_at + INTERVAL (s.seq * 7) MINUTE
    FROM tickets t JOIN seq_1_to_${LONG_EXTRA_EVENTS} s WHERE t.id = ${LONG_TICKET_ID}`,
    [reply],
  );
  await q('ANALYZE TABLE users, tickets, ticket_events, tools');
  const [[row]] = (await sequelize.query('SELECT COUNT(*) AS n FROM ticket_events')) as [Array<{ n: number }>, unknown];
  return { events: Number(row.n) };
}
