// Benchmark: facility-wide analytics for one year over five years of generated history for
// 300 tools (about half a million state intervals and 75,000 tickets), in its own database
// faultline_bench, against the real server on loopback.
//
//   npm run bench                    (every benchmark)
//   node --import tsx scripts/bench/analytics.ts [--keep]   (this one; --keep reuses the data)
//
// The history is invented and generated from a fixed seed.

import os from 'node:os';
import { performance } from 'node:perf_hooks';
import autocannon from 'autocannon';
import type { Sequelize } from 'sequelize';
import { loadConfig } from '../../server/config';
import { createMigrator, createSequelize } from '../../server/db';
import { createRandom, type Random } from '../../server/db/seed/random';
import { hashPassword } from '../../server/modules/users/password';
import { startServer } from '../../server/server';
import { TICKET_CATEGORIES } from '../../shared/report-options';
import type { E10State, StateReason } from '../../shared/equipment-state';
import { localSecrets } from '../lib/local-secrets';

// BENCH_DB_NAME lets a developer keep a second copy while another benchmark uses the default.
const DB_NAME = process.env.BENCH_DB_NAME ?? 'faultline_bench';
// It is dropped and recreated: never let a typo point this at the app's or the tests' data.
if (!/^faultline_bench\w*$/.test(DB_NAME)) throw new Error(`BENCH_DB_NAME must start with faultline_bench, got ${DB_NAME}`);
const TOOLS = 300;
const AREAS = 12;
const YEARS = 5;
const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
const PASSWORD = 'bench-manager-password-42';
const ANALYTICS_MIGRATION = '0006-analytics-rollup.ts';

const FAILURE_MODES = [
  'Robot end effector misaligned',
  'Turbo pump fault',
  'RF generator trip',
  'Chuck helium leak',
  'Heater zone over temperature',
  'Mass flow controller drift',
  'Door interlock switch',
  'Wafer sensor dirty',
  'Controller hang',
  'Throttle valve stuck',
  'Cooling water flow low',
  'Dispense nozzle clogged',
  'Exhaust pressure low',
  'Vacuum gauge failed',
];

function sqlDate(ms: number): string {
  return `'${new Date(ms).toISOString().slice(0, 23).replace('T', ' ')}'`;
}

interface Interval {
  toolId: number;
  moduleId: number | null;
  state: E10State;
  reason: StateReason;
  start: number;
  end: number | null;
  ticketId: number | null;
}

interface TicketRow {
  id: number;
  toolId: number;
  category: string;
  priority: string;
  status: string;
  fixKind: 'failure' | 'assist' | null;
  failureMode: string | null;
  createdAt: number;
  acknowledgedAt: number | null;
  fixedAt: number | null;
  resolvedAt: number | null;
  closedAt: number | null;
}

/** Priority mix of a busy facility: few P1, most P2/P3. */
function pickPriority(rnd: Random): string {
  const r = rnd.next();
  return r < 0.05 ? 'P1' : r < 0.5 ? 'P2' : r < 0.88 ? 'P3' : 'P4';
}

const ACK_MEAN_MIN: Record<string, number> = { P1: 12, P2: 45, P3: 180, P4: 600 };

/** One tool's history: running stretches broken by failures, PM, engineering and shutdowns. */
function toolHistory(
  rnd: Random,
  toolId: number,
  start: number,
  now: number,
  nextTicketId: () => number,
  tickets: TicketRow[],
  out: Interval[],
) {
  let t = start;
  const push = (state: E10State, reason: StateReason, hours: number, ticketId: number | null = null) => {
    if (t >= now) return false;
    const end = t + Math.max(60_000, Math.round(hours * HOUR_MS));
    out.push({ toolId, moduleId: null, state, reason, start: t, end: end >= now ? null : end, ticketId });
    t = end;
    return end < now;
  };
  while (t < now) {
    if (!push(rnd.chance(0.85) ? 'standby' : 'productive', 'none', rnd.exp(50))) break;
    const r = rnd.next();
    if (r < 0.3) {
      const id = nextTicketId();
      const created = t + rnd.int(0, 600) * 1000;
      const priority = pickPriority(rnd);
      let up = push('unscheduled_downtime', 'repair', rnd.exp(3), id);
      if (up && rnd.chance(0.35))
        up =
          push('unscheduled_downtime', rnd.chance(0.7) ? 'waiting_parts' : 'maintenance_delay_supplier', rnd.exp(20), id) &&
          push('unscheduled_downtime', 'repair', rnd.exp(2), id);
      if (up && rnd.chance(0.3)) up = push('unscheduled_downtime', 'qualification', rnd.exp(1.5), id);
      const fixed = up ? t : null;
      const ack = created + rnd.exp(ACK_MEAN_MIN[priority]) * 60_000;
      tickets.push({
        id,
        toolId,
        category: rnd.pick(TICKET_CATEGORIES),
        priority,
        status: fixed ? 'closed' : 'in_repair',
        fixKind: fixed ? 'failure' : null,
        failureMode: fixed ? rnd.pick(FAILURE_MODES) : null,
        createdAt: created,
        acknowledgedAt: ack < now ? ack : null,
        fixedAt: fixed,
        resolvedAt: fixed,
        closedAt: fixed && fixed + DAY_MS < now ? fixed + DAY_MS : null,
      });
    } else if (r < 0.52) {
      push('scheduled_downtime', rnd.chance(0.8) ? 'preventive_maintenance' : 'consumables_change', rnd.exp(4));
    } else if (r < 0.7) {
      push('engineering', 'process_development', rnd.exp(6));
    } else if (r < 0.75) {
      push('non_scheduled', 'not_staffed', rnd.exp(48));
    } else {
      push('productive', 'none', rnd.exp(8));
    }
    // An assist: a stop cleared on the spot, recorded as a ticket without a state change.
    if (rnd.chance(0.05) && t < now) {
      const created = t - rnd.int(60, 3600) * 1000;
      tickets.push({
        id: nextTicketId(),
        toolId,
        category: 'wafer_handling',
        priority: 'P3',
        status: 'closed',
        fixKind: 'assist',
        failureMode: null,
        createdAt: created,
        acknowledgedAt: created + 5 * 60_000,
        fixedAt: created + 20 * 60_000,
        resolvedAt: created + 20 * 60_000,
        closedAt: created + 30 * 60_000,
      });
    }
  }
}

/** A sparse module log for some tools, so the tool-level filter has something to skip. */
function moduleHistory(rnd: Random, toolId: number, moduleId: number, start: number, now: number, out: Interval[]) {
  let t = start;
  while (t < now) {
    const down = out.length % 2 === 1;
    const hours = down ? rnd.exp(12) : rnd.exp(300);
    const end = t + Math.round(hours * HOUR_MS);
    out.push({
      toolId,
      moduleId,
      state: down ? 'unscheduled_downtime' : 'standby',
      reason: down ? 'repair' : 'none',
      start: t,
      end: end >= now ? null : end,
      ticketId: null,
    });
    t = end;
  }
}

async function insertRows(sequelize: Sequelize, table: string, columns: string, rows: string[], chunk = 4000) {
  for (let i = 0; i < rows.length; i += chunk) {
    await sequelize.query(`INSERT INTO ${table} (${columns}) VALUES ${rows.slice(i, i + chunk).join(',')}`);
  }
}

export async function generate(sequelize: Sequelize, now: number) {
  const rnd = createRandom(20_240_501);
  const start = now - YEARS * 365 * DAY_MS;
  const created = sqlDate(start);

  await sequelize.query('SET SESSION foreign_key_checks = 0, unique_checks = 0');
  await insertRows(
    sequelize,
    'areas',
    'id, name, code, sort_order, created_at, updated_at',
    Array.from({ length: AREAS }, (_, i) => `(${i + 1}, 'Bench bay ${i + 1}', 'BB${i + 1}', ${i}, ${created}, ${created})`),
  );
  await insertRows(
    sequelize,
    'tools',
    'id, area_id, name, code, criticality, created_at, updated_at',
    Array.from(
      { length: TOOLS },
      (_, i) =>
        `(${i + 1}, ${(i % AREAS) + 1}, 'Bench tool ${i + 1}', 'BT-${String(i + 1).padStart(3, '0')}', 'normal', ${created}, ${created})`,
    ),
  );
  const moduleTools = Array.from({ length: TOOLS }, (_, i) => i + 1).filter((id) => id % 3 === 0);
  await insertRows(
    sequelize,
    'modules',
    'id, tool_id, name, code, sort_order, created_at, updated_at',
    moduleTools.map((toolId, i) => `(${i + 1}, ${toolId}, 'Chamber A', 'A', 0, ${created}, ${created})`),
  );

  const intervals: Interval[] = [];
  const tickets: TicketRow[] = [];
  let ticketId = 0;
  const nextTicketId = () => ++ticketId;
  for (let toolId = 1; toolId <= TOOLS; toolId++) toolHistory(rnd, toolId, start, now, nextTicketId, tickets, intervals);
  moduleTools.forEach((toolId, i) => moduleHistory(rnd, toolId, i + 1, start, now, intervals));

  const q = (v: string | null) => (v === null ? 'NULL' : `'${v}'`);
  const d = (v: number | null) => (v === null ? 'NULL' : sqlDate(v));
  await insertRows(
    sequelize,
    'tickets',
    'id, tool_id, category, title, impact, hazards, status, priority, fix_kind, failure_mode, acknowledged_at, fixed_at, resolved_at, closed_at, created_at, updated_at',
    tickets.map(
      (t) =>
        `(${t.id}, ${t.toolId}, '${t.category}', 'Bench ticket ${t.id}', '${t.fixKind === 'assist' ? 'still_usable' : 'tool_stopped'}', '[]', '${t.status}', '${t.priority}', ${q(t.fixKind)}, ${q(t.failureMode)}, ${d(t.acknowledgedAt)}, ${d(t.fixedAt)}, ${d(t.resolvedAt)}, ${d(t.closedAt)}, ${sqlDate(t.createdAt)}, ${sqlDate(t.createdAt)})`,
    ),
  );
  await insertRows(
    sequelize,
    'state_intervals',
    'tool_id, module_id, state, reason, started_at, ended_at, ticket_id, source, confirmed, created_at',
    intervals.map(
      (iv) =>
        `(${iv.toolId}, ${iv.moduleId ?? 'NULL'}, '${iv.state}', '${iv.reason}', ${sqlDate(iv.start)}, ${d(iv.end)}, ${iv.ticketId ?? 'NULL'}, 'staff', 1, ${sqlDate(iv.start)})`,
    ),
  );
  await sequelize.query('SET SESSION foreign_key_checks = 1, unique_checks = 1');
  return { intervals: intervals.length, toolIntervals: intervals.filter((i) => i.moduleId === null).length, tickets: tickets.length };
}

function benchConfig() {
  // Run alone (not through run.ts), the local secrets are not in the environment yet.
  const secrets = localSecrets();
  return loadConfig(process.env, {
    DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
    SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-secret-bench-secret-bench-secret-0',
    DB_NAME,
    PORT: '0',
    LOG_LEVEL: 'silent',
    NODE_ENV: 'production',
    DB_POOL_MAX: '10',
  });
}

async function prepareDatabase(keep: boolean) {
  const config = benchConfig();
  if (!keep) {
    const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
    await admin.query(`DROP DATABASE IF EXISTS ${DB_NAME}`);
    await admin.query(`CREATE DATABASE ${DB_NAME} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.close();
  }
  // A pool of one, so the session settings of the bulk load stay on the one connection.
  const sequelize = createSequelize({ ...config, DB_POOL_MAX: 1 });
  try {
    const migrator = createMigrator(sequelize);
    // The history goes in before the analytics migration, as on an installation that upgrades
    // with years of data: the migration then fills its rollup set by set, which is much faster
    // than row-by-row triggers during a bulk load. (The triggers are tested in
    // tests/integration/analytics.test.ts.)
    const earlier = (await migrator.pending()).map((m) => m.name).filter((name) => name < ANALYTICS_MIGRATION);
    if (earlier.length > 0) await migrator.up({ migrations: earlier });
    const [[existing]] = (await sequelize.query('SELECT COUNT(*) AS n FROM state_intervals')) as [Array<{ n: number }>, unknown];
    if (keep && Number(existing.n) > 0) {
      await migrator.up();
      const [[counts]] = (await sequelize.query(
        `SELECT (SELECT COUNT(*) FROM state_intervals) AS intervals, (SELECT COUNT(*) FROM state_intervals WHERE module_id IS NULL) AS toolIntervals, (SELECT COUNT(*) FROM tickets) AS tickets, (SELECT MAX(started_at) FROM state_intervals) AS latest`,
      )) as [Array<{ intervals: number; toolIntervals: number; tickets: number; latest: Date }>, unknown];
      return {
        counts: { intervals: Number(counts.intervals), toolIntervals: Number(counts.toolIntervals), tickets: Number(counts.tickets) },
        seconds: 0,
        now: new Date(counts.latest).getTime(),
      };
    }
    const now = Date.now();
    const t0 = performance.now();
    const counts = await generate(sequelize, now);
    await migrator.up();
    await sequelize.query(
      'ANALYZE TABLE state_intervals, tickets, tools, state_hours_monthly, downtime_hours_by_ticket, state_stretch_starts',
    );
    const email = 'bench.manager@bench.faultline.test';
    const stamp = sqlDate(now);
    await sequelize.query(
      `INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES (?, 'Bench manager', 'manager', ?, 1, 0, ${stamp}, ${stamp})`,
      { replacements: [email, await hashPassword(PASSWORD)] },
    );
    return { counts, seconds: (performance.now() - t0) / 1000, now };
  } finally {
    await sequelize.close();
  }
}

async function signIn(url: string): Promise<Record<string, string>> {
  const first = await fetch(`${url}/api/session`);
  const cookie = first.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const res = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { cookie, 'content-type': 'application/json', 'x-csrf-token': csrfToken, origin: url },
    body: JSON.stringify({ email: 'bench.manager@bench.faultline.test', password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`bench sign-in failed: ${res.status} ${await res.text()}`);
  const fresh = res.headers.get('set-cookie');
  return { cookie: fresh ? fresh.split(';')[0] : cookie };
}

function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1));
  return sorted[i];
}

async function timed(url: string, headers: Record<string, string>, n: number) {
  const times: number[] = [];
  for (let i = 0; i < n; i++) {
    const t0 = performance.now();
    const res = await fetch(url, { headers });
    const body = await res.text();
    if (res.status !== 200) throw new Error(`${url} → ${res.status}: ${body.slice(0, 300)}`);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return { median: percentile(times, 0.5), p90: percentile(times, 0.9), p99: percentile(times, 0.99), n };
}

function cannon(url: string, headers: Record<string, string>, connections: number, duration: number) {
  return new Promise<autocannon.Result>((resolve, reject) => {
    autocannon({ url, headers, connections, duration }, (error, result) => (error ? reject(error) : resolve(result)));
  });
}

const fmt = (ms: number) => `${ms.toFixed(1)} ms`;

async function main() {
  const keep = process.argv.includes('--keep');
  const prepared = await prepareDatabase(keep);
  const { counts, now } = prepared;
  console.log(`analytics bench · database ${DB_NAME}`);
  console.log(
    `  data: ${TOOLS} tools in ${AREAS} areas, ${YEARS} years; ${counts.intervals.toLocaleString('en')} state intervals ` +
      `(${counts.toolIntervals.toLocaleString('en')} tool-level), ${counts.tickets.toLocaleString('en')} tickets` +
      (prepared.seconds ? `; generated and loaded in ${prepared.seconds.toFixed(1)} s` : '; reused'),
  );

  const server = await startServer(benchConfig(), { serveClient: false, outboxWorker: false });
  try {
    const base = `http://127.0.0.1:${server.port}`;
    const headers = await signIn(base);
    const to = new Date(now);
    const from = new Date(now - 365 * DAY_MS);
    const query = `from=${encodeURIComponent(from.toISOString())}&to=${encodeURIComponent(to.toISOString())}&scope=facility`;
    const target = `${base}/api/analytics?${query}`;

    const check = await fetch(target, { headers });
    const report = (await check.json()) as { totals: { failures: number; hours: Record<string, number> }; tools: unknown[] };
    console.log(`  one year facility-wide: ${report.totals.failures.toLocaleString('en')} failures over ${report.tools.length} tools`);

    await timed(target, headers, 3); // warm caches and the pool
    const sequential = await timed(target, headers, 40);
    const floor = await timed(`${base}/api/health`, {}, 200);
    console.log(
      `  sequential, ${sequential.n} requests: median ${fmt(sequential.median)}, p90 ${fmt(sequential.p90)}, p99 ${fmt(sequential.p99)}`,
    );
    console.log(`  floor (GET /api/health), ${floor.n} requests: median ${fmt(floor.median)}, p99 ${fmt(floor.p99)}`);

    const loaded = await cannon(target, headers, 4, 10);
    // autocannon stops with requests still running on the server: let them finish before closing.
    await new Promise((resolve) => setTimeout(resolve, 2000));
    console.log(
      `  autocannon, 4 connections for 10 s: ${loaded.requests.total} requests, ${loaded.requests.average.toFixed(1)} req/s, ` +
        `p50 ${fmt(loaded.latency.p50)}, p90 ${fmt(loaded.latency.p90)}, p99 ${fmt(loaded.latency.p99)}, non-2xx ${loaded.non2xx}`,
    );
    // Other work on the machine skews every figure above; say how busy it was.
    console.log(
      `  machine: ${os.cpus().length} cores, load average ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' / ')} (1 / 5 / 15 min)`,
    );
    const goal = sequential.median < 300;
    console.log(`  goal (median under 300 ms for one request at a time): ${goal ? 'met' : 'NOT met'}`);
    if (!goal) process.exitCode = 1;
  } finally {
    await server.close();
  }
}

await main();
