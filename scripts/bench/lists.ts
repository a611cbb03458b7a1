// Benchmark: every paged list over five years of generated history (300 tools, ~530,000 state
// intervals, ~77,000 tickets, ~470,000 timeline events; see analytics.ts and
// lib/ticket-history.ts): the queue's "every ticket" view and its filters, first and last
// page; My reports of a member with hundreds of reports; a tool's state history; a ticket page;
// a ticket with ~300 events. Each is measured one request at a time (p50/p99) and with 10
// connections (autocannon p50/p99), next to GET /api/health in the same run, with the load
// average.
//
//   npm run bench -- lists
//   node --import tsx scripts/bench/lists.ts [--fresh] [--explain]
//     (--fresh generates the data again; --explain prints the ticket lists' query plans first)

import os from 'node:os';
import { QueryTypes, type Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { startServer } from '../../server/server';
import { benchConfig, cannon, prepareDatabase, signIn, timed } from './analytics';
import { BENCH_MANAGER, BENCH_MEMBER, LONG_TICKET_ID } from './lib/ticket-history';
import { countSql, pageIdsSql } from '../../server/modules/tickets/ticket-list.service';
import { ticketListQuerySchema } from '../../shared/schemas/tickets';

const SEQUENTIAL = 40;
const CONNECTIONS = 10;
const SECONDS = 4;
const PAGE = 25;
/** The acceptance goals: one request at a time, and under 10 connections. */
const GOAL_P50_MS = 50;
const GOAL_FLOOR_TIMES = 15;
const GOAL_LOADED_P99_MS = 300;

interface Target {
  name: string;
  path: string;
  who: 'manager' | 'member';
}

const fmt = (ms: number) => ms.toFixed(1).padStart(7);

async function totalOf(url: string, headers: Record<string, string>) {
  const res = await fetch(url, { headers });
  const body = (await res.json()) as { total: number; totalCapped?: boolean };
  if (res.status !== 200) throw new Error(`${url} → ${res.status}`);
  return { total: body.total, capped: Boolean(body.totalCapped) };
}

interface PlanRow {
  id: number;
  select_type: string;
  table: string;
  type: string;
  key: string | null;
  rows: number;
  r_rows: number | null;
  Extra: string | null;
}

/**
 * The query plans of the ticket lists' SQL (page ids both ways, and the count), as markdown.
 * MariaDB's ANALYZE runs the query: `r_rows` is what it really read, where `rows` is the
 * planner's estimate (which ignores a LIMIT inside a derived table).
 */
async function explainLists(sequelize: Sequelize) {
  const cases: [string, Record<string, string>, number][] = [
    ['every ticket', { status: 'all' }, BENCH_MANAGER.id],
    ['every ticket + my tools', { status: 'all', myTools: 'true' }, BENCH_MANAGER.id],
    ['every ticket + hazard', { status: 'all', hazard: 'true' }, BENCH_MANAGER.id],
    ['every ticket + area', { status: 'all', areaId: '3' }, BENCH_MANAGER.id],
    ['resolved, newest', { status: 'resolved', sort: 'newest' }, BENCH_MANAGER.id],
    ['my reports', { status: 'all', sort: 'newest', reportedByMe: 'true' }, BENCH_MEMBER.id],
  ];
  for (const [name, raw, userId] of cases) {
    const q = ticketListQuerySchema.parse(raw);
    const user = { id: userId, email: '', name: '', role: 'manager' as const };
    for (const [label, built] of [
      ['page ids', pageIdsSql(user, q, false)],
      ['page ids, backwards', pageIdsSql(user, q, true)],
      ['count', countSql(user, q)],
    ] as const) {
      const plan = await sequelize.query<PlanRow>(`ANALYZE ${built.sql}`, {
        type: QueryTypes.SELECT,
        replacements: { ...built.replacements, limit: PAGE, offset: 0 },
      });
      console.log(
        `\n${name} — ${label}\n\n| id | select_type | table | type | key | rows | r_rows | Extra |\n|---|---|---|---|---|---:|---:|---|`,
      );
      for (const r of plan)
        console.log(
          `| ${r.id} | ${r.select_type} | ${r.table} | ${r.type} | ${r.key ?? ''} | ${r.rows} | ${r.r_rows ?? ''} | ${r.Extra ?? ''} |`,
        );
    }
  }
  console.log('');
}

async function main() {
  const { counts } = await prepareDatabase(!process.argv.includes('--fresh'));
  const config = benchConfig();
  const sequelize = createSequelize({ ...config, DB_POOL_MAX: 1 });
  const [busiest] = await sequelize.query<{ toolId: number; n: number }>(
    'SELECT tool_id AS toolId, COUNT(*) AS n FROM state_intervals GROUP BY tool_id ORDER BY n DESC, tool_id LIMIT 1',
    { type: QueryTypes.SELECT },
  );
  const [ordinary] = await sequelize.query<{ id: number }>("SELECT id FROM tickets WHERE status = 'in_repair' ORDER BY id LIMIT 1", {
    type: QueryTypes.SELECT,
  });
  const [middle] = await sequelize.query<{ id: number }>('SELECT id FROM tickets ORDER BY priority, created_at, id LIMIT 1 OFFSET 38660', {
    type: QueryTypes.SELECT,
  });
  const [long] = await sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM ticket_events WHERE ticket_id = ?', {
    type: QueryTypes.SELECT,
    replacements: [LONG_TICKET_ID],
  });
  if (process.argv.includes('--explain')) await explainLists(sequelize);
  await sequelize.close();

  console.log(
    `lists bench · ${counts.tickets.toLocaleString('en')} tickets, ${counts.intervals.toLocaleString('en')} state intervals, ${counts.events.toLocaleString('en')} timeline events; ` +
      `busiest tool ${busiest.toolId} (${Number(busiest.n).toLocaleString('en')} intervals); ticket ${LONG_TICKET_ID} has ${long.n} events`,
  );

  const server = await startServer(config, { serveClient: false, outboxWorker: false });
  try {
    const base = `http://127.0.0.1:${server.port}`;
    const heads = { manager: await signIn(base), member: await signIn(base, BENCH_MEMBER.email) };
    const lists: Target[] = [
      { name: 'queue, open (default)', path: '/api/tickets?status=open&sort=queue', who: 'manager' },
      { name: 'every ticket', path: '/api/tickets?status=all&sort=queue', who: 'manager' },
      { name: 'every ticket + my tools', path: '/api/tickets?status=all&sort=queue&myTools=true', who: 'manager' },
      { name: 'every ticket + hazard', path: '/api/tickets?status=all&sort=queue&hazard=true', who: 'manager' },
      { name: 'every ticket + area', path: '/api/tickets?status=all&sort=queue&areaId=3', who: 'manager' },
      { name: 'resolved, newest', path: '/api/tickets?status=resolved&sort=newest', who: 'manager' },
      { name: 'my reports', path: '/api/tickets?status=all&sort=newest&reportedByMe=true', who: 'member' },
      { name: 'tool state history', path: `/api/tools/${busiest.toolId}/history`, who: 'manager' },
    ];
    const targets: Target[] = [];
    for (const l of lists) {
      const size = l.path.includes('/history') ? 20 : PAGE;
      const sep = l.path.includes('?') ? '&' : '?';
      const first = `${l.path}${sep}limit=${size}`;
      const { total, capped } = await totalOf(`${base}${first}`, heads[l.who]);
      const last = Math.max(0, Math.floor((total - 1) / size) * size);
      targets.push({ ...l, name: `${l.name}, first page (of ${total.toLocaleString('en')}${capped ? '+' : ''})`, path: first });
      // Past the count cap the pager's Last reads from the end; below it, the last offset does.
      if (capped) targets.push({ ...l, name: `${l.name}, last page (last=true)`, path: `${first}&last=true` });
      else if (last > 0) targets.push({ ...l, name: `${l.name}, last page`, path: `${first}&offset=${last}` });
      if (l.name === 'every ticket')
        targets.push({ ...l, name: `${l.name}, Next half-way down (after=${middle.id})`, path: `${first}&after=${middle.id}` });
    }
    targets.push({ name: `ticket page (#${ordinary.id}, open tool states)`, path: `/api/tickets/${ordinary.id}`, who: 'manager' });
    targets.push({ name: `ticket page, ${long.n} events (#${LONG_TICKET_ID})`, path: `/api/tickets/${LONG_TICKET_ID}`, who: 'manager' });

    // Warm the pool and the buffer pool, then the floor of this run.
    for (const t of targets) await timed(`${base}${t.path}`, heads[t.who], 2);
    const floor = await timed(`${base}/api/health`, {}, 200);
    const floorLoaded = await cannon(`${base}/api/health`, {}, CONNECTIONS, SECONDS);
    console.log(
      `  floor GET /api/health: sequential p50 ${floor.median.toFixed(2)} ms, p99 ${floor.p99.toFixed(2)} ms; ${CONNECTIONS} connections p50 ${floorLoaded.latency.p50} ms, p99 ${floorLoaded.latency.p99} ms`,
    );
    console.log(
      `  load average before: ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' / ')} (1 / 5 / 15 min, ${os.cpus().length} cores)\n`,
    );

    console.log(`| list | seq p50 | seq p99 | × floor | ${CONNECTIONS} conn p50 | ${CONNECTIONS} conn p99 | non-2xx, errors | goal |`);
    console.log('|---|---:|---:|---:|---:|---:|---:|---|');
    let missed = 0;
    for (const t of targets) {
      const url = `${base}${t.path}`;
      const seq = await timed(url, heads[t.who], SEQUENTIAL);
      const loaded = await cannon(url, heads[t.who], CONNECTIONS, SECONDS);
      // autocannon stops with requests still running on the server: let them finish.
      await new Promise((resolve) => setTimeout(resolve, 500));
      const times = seq.median / floor.median;
      // Under load a slow list may finish no request within the run: that is a miss, not 0 ms.
      const finished = loaded.requests.total > 0 && loaded.latency.p99 > 0;
      const ok =
        seq.median <= GOAL_P50_MS &&
        times <= GOAL_FLOOR_TIMES &&
        finished &&
        loaded.latency.p99 <= GOAL_LOADED_P99_MS &&
        loaded.non2xx === 0;
      const under = (ms: number) => (finished ? fmt(ms) : `> ${SECONDS} s`);
      if (!ok) missed++;
      console.log(
        `| ${t.name} | ${fmt(seq.median)} | ${fmt(seq.p99)} | ${times.toFixed(1).padStart(6)}× | ${under(loaded.latency.p50)} | ${under(loaded.latency.p99)} | ${loaded.non2xx + loaded.errors + loaded.timeouts} | ${ok ? 'met' : 'NOT met'} |`,
      );
    }
    const floorAfter = await timed(`${base}/api/health`, {}, 200);
    console.log(`\n  floor again after the lists: sequential p50 ${floorAfter.median.toFixed(2)} ms, p99 ${floorAfter.p99.toFixed(2)} ms`);
    console.log(
      `  load average after: ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' / ')} (1 / 5 / 15 min)`,
    );
    console.log(
      `  goals: sequential p50 ≤ ${GOAL_P50_MS} ms and ≤ ${GOAL_FLOOR_TIMES}× the floor; ${CONNECTIONS} connections p99 ≤ ${GOAL_LOADED_P99_MS} ms — ${missed === 0 ? 'all met' : `${missed} NOT met`}`,
    );
    if (missed > 0) process.exitCode = 1;
  } finally {
    await server.close();
  }
}

await main();
