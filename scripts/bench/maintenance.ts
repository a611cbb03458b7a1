// Benchmark: the maintenance page (GET /api/maintenance) and the plan list (GET
// /api/maintenance/plans) with 300 tools, 7 plans each (2,100, a third by wafer count) and
// five years of work orders, beside GET /api/health as the floor; then the scheduler's pass
// over those 2,100 plans (wall time of one pass, and of two passes run at once by two
// connection pools as two server processes would). Data goes into faultline_bench, dropped
// and rebuilt on every run.
//   npm run bench -- maintenance        BENCH_SECONDS=20 npm run bench -- maintenance
import os from 'node:os';
import autocannon from 'autocannon';
import { QueryTypes } from 'sequelize';
import { loadConfig } from '../../server/config';
import { createSequelize, createMigrator } from '../../server/db';
import { startServer } from '../../server/server';
import { hashPassword } from '../../server/modules/users/password';
import { runSchedulerPass } from '../../server/modules/maintenance/scheduler';
import { createRandom } from '../../server/db/seed/random';
import { localSecrets } from '../lib/local-secrets';

const TOOLS = 300;
const PLANS_PER_TOOL = 7;
const YEARS = 5;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
const PASSWORD = 'bench-password-not-secret';
const DAY = 86_400_000;

const secrets = localSecrets();
const config = loadConfig(process.env, {
  DB_NAME: 'faultline_bench',
  DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
  SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
  PORT: '0',
  LOG_LEVEL: 'silent',
  NODE_ENV: 'production',
  MAINTENANCE_SCHEDULER_MS: '0',
  DB_POOL_MAX: process.env.DB_POOL_MAX ?? '10',
});

const fmt = (d: number) => new Date(d).toISOString().replace('T', ' ').replace('Z', '');

async function rebuildDatabase() {
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_bench');
  await admin.query('CREATE DATABASE faultline_bench CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  return sequelize;
}

async function fill(sequelize: Awaited<ReturnType<typeof rebuildDatabase>>) {
  const rnd = createRandom(2100);
  const now = Date.now();
  const q = (sql: string) => sequelize.query(sql);
  const hash = await hashPassword(PASSWORD);
  await q(
    `INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES ('bench-tech@bench.test', 'Bench technician', 'technician', '${hash}', 1, 0, NOW(3), NOW(3))`,
  );
  await q(`INSERT INTO areas (name, code, sort_order, created_at, updated_at) VALUES ('Bench area', 'BA1', 0, NOW(3), NOW(3))`);
  await q(
    `INSERT INTO tools (area_id, name, code, criticality, primary_engineer_id, created_at, updated_at) VALUES ${Array.from({ length: TOOLS }, (_, i) => `(1, 'Bench tool ${i + 1}', 'BT-${i + 1}', 'normal', 1, NOW(3), NOW(3))`).join(',')}`,
  );
  await q(
    `INSERT INTO state_intervals (tool_id, module_id, state, reason, started_at, source, confirmed, created_at) VALUES ${Array.from({ length: TOOLS }, (_, i) => `(${i + 1}, NULL, 'standby', 'none', '${fmt(now - YEARS * 365 * DAY)}', 'system', 1, NOW(3))`).join(',')}`,
  );

  const plans: string[] = [];
  const orders: string[] = [];
  const readings: string[] = [];
  let planId = 0;
  for (let t = 1; t <= TOOLS; t++) {
    let counter = 0;
    for (let d = YEARS * 365; d >= 0; d -= 7) {
      const at = fmt(now - d * DAY);
      readings.push(`(${t}, 'seed-${readings.length + 1}', 'wafers', ${(counter += rnd.int(100, 300))}, '${at}', '${at}')`);
    }
    for (let p = 0; p < PLANS_PER_TOOL; p++) {
      const id = ++planId;
      const usage = p % 3 === 2;
      const every = rnd.pick([30, 45, 60, 90, 180]);
      let basis = now - YEARS * 365 * DAY;
      for (;;) {
        const due = basis + every * DAY;
        if (due > now - 5 * DAY) break;
        const done = due + rnd.int(-3, 10) * DAY;
        const status = rnd.chance(0.04) ? 'skipped' : 'done';
        orders.push(
          `(${t}, ${id}, 'preventive', 'Bench PM', '${status}', '${new Date(due).toISOString()}|-', '${fmt(due)}', '${fmt(basis + every * 1.25 * DAY)}', '[]', '[]', 60, '${fmt(done - 3 * 3600_000)}', ${status === 'done' ? `'${fmt(done)}'` : 'NULL'}, ${status === 'done' ? (done <= basis + every * 1.25 * DAY ? 1 : 0) : 0}, '${fmt(due - 7 * DAY)}', '${fmt(done)}')`,
        );
        basis = status === 'done' ? done : due;
      }
      plans.push(
        `(${id}, ${t}, 'Bench plan ${p}', '[{"text":"Check","unit":null,"min":null,"max":null,"asksValue":false}]', 60, ${usage ? 'NULL' : every}, ${usage ? 5000 : 'NULL'}, ${usage ? "'wafers'" : 'NULL'}, 7, 500, '${fmt(basis)}', ${usage ? counter - rnd.int(0, 6000) : 'NULL'}, '${fmt(basis)}', NOW(3), NOW(3))`,
      );
    }
  }
  await q(
    `INSERT INTO maintenance_plans (id, tool_id, title, checklist, estimated_minutes, every_days, every_units, counter_name, lead_days, lead_units, basis_at, basis_counter, last_done_at, created_at, updated_at) VALUES ${plans.join(',')}`,
  );
  for (let i = 0; i < orders.length; i += 5000) {
    await q(
      `INSERT INTO work_orders (tool_id, plan_id, kind, title, status, due_key, due_at, grace_until, checklist, results, estimated_minutes, started_at, done_at, within_grace, created_at, updated_at) VALUES ${orders.slice(i, i + 5000).join(',')}`,
    );
  }
  for (let i = 0; i < readings.length; i += 5000)
    await q(
      `INSERT INTO counter_readings (tool_id, sender_id, counter, value, at, received_at) VALUES ${readings.slice(i, i + 5000).join(',')}`,
    );
  return { plans: plans.length, orders: orders.length, readings: readings.length };
}

async function signIn(url: string): Promise<string> {
  const first = await fetch(`${url}/api/session`);
  const cookie = first.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const r = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie },
    body: JSON.stringify({ email: 'bench-tech@bench.test', password: PASSWORD }),
  });
  if (r.status !== 200) throw new Error(`bench sign-in failed: ${r.status}`);
  return r.headers.get('set-cookie')!.split(';')[0];
}

async function measure(name: string, url: string, headers: Record<string, string> = {}) {
  await autocannon({ url, headers, connections: CONNECTIONS, duration: 2 });
  const r = await autocannon({ url, headers, connections: CONNECTIONS, duration: SECONDS });
  return {
    name,
    rps: r.requests.average,
    p50: r.latency.p50,
    p99: r.latency.p99,
    requests: r.requests.total,
    bad: r.non2xx + r.errors + r.timeouts,
  };
}

const sequelize = await rebuildDatabase();
const t0 = Date.now();
const filled = await fill(sequelize);
console.log(
  `Data: ${TOOLS} tools, ${filled.plans} plans, ${filled.orders} work orders over ${YEARS} years, ${filled.readings} counter readings (filled in ${((Date.now() - t0) / 1000).toFixed(1)} s).`,
);
console.log(
  `Load average at start (1/5/15 min): ${os
    .loadavg()
    .map((l) => l.toFixed(2))
    .join(' / ')} on ${os.cpus().length} cores.`,
);

const server = await startServer(config, { outboxWorker: false, serveClient: false });
const second = await startServer(config, { outboxWorker: false, serveClient: false });
try {
  const cookie = await signIn(server.url);
  const check = await fetch(`${server.url}/api/maintenance`, { headers: { cookie } });
  const overview = (await check.json()) as { overdue: unknown[]; planCount: number };
  if (check.status !== 200 || overview.planCount !== filled.plans) throw new Error(`unexpected maintenance answer: ${check.status}`);
  console.log(`Maintenance page: ${overview.planCount} plans, ${overview.overdue.length} overdue now.`);
  console.log(`autocannon: ${CONNECTIONS} connections, ${SECONDS} s per endpoint, loopback, after a 2 s warm-up.\n`);
  const results = [
    await measure('GET /api/health (floor)', `${server.url}/api/health`),
    await measure('GET /api/maintenance', `${server.url}/api/maintenance`, { cookie }),
    await measure('GET /api/maintenance/plans (500)', `${server.url}/api/maintenance/plans?limit=500`, { cookie }),
    await measure('GET /api/maintenance/plans?toolId', `${server.url}/api/maintenance/plans?toolId=150`, { cookie }),
  ];
  const pad = (s: string | number, n: number) => String(s).padStart(n);
  console.log(
    `${'endpoint'.padEnd(36)} ${pad('req/s', 8)} ${pad('p50 ms', 7)} ${pad('p99 ms', 7)} ${pad('requests', 9)} ${pad('non-2xx', 8)}`,
  );
  for (const r of results)
    console.log(
      `${r.name.padEnd(36)} ${pad(r.rps.toFixed(0), 8)} ${pad(r.p50, 7)} ${pad(r.p99, 7)} ${pad(r.requests, 9)} ${pad(r.bad, 8)}`,
    );
  if (results.some((r) => r.bad > 0)) process.exitCode = 1;

  // Scheduler: the first pass makes the work orders of plans in their lead; the next finds
  // nothing new. Two servers' passes at once must still make no duplicate.
  const timed = async (label: string, run: () => Promise<unknown>) => {
    const s = performance.now();
    const out = await run();
    console.log(`${label.padEnd(48)} ${(performance.now() - s).toFixed(0).padStart(6)} ms  ${JSON.stringify(out)}`);
  };
  console.log('');
  await timed('scheduler pass over all plans (creates)', () => runSchedulerPass(server.deps));
  await timed('scheduler pass again (nothing new)', () => runSchedulerPass(server.deps));
  await timed("two servers' passes at the same moment", () => Promise.all([runSchedulerPass(server.deps), runSchedulerPass(second.deps)]));
  const [dupes] = await server.deps.sequelize.query<{ n: number }>(
    `SELECT COUNT(*) AS n FROM (SELECT plan_id FROM work_orders WHERE status IN ('planned','scheduled','in_progress') GROUP BY plan_id HAVING COUNT(*) > 1) d`,
    { type: QueryTypes.SELECT },
  );
  console.log(`Plans with more than one open work order: ${dupes.n}.`);
  console.log(
    `Load average at end (1/5/15 min): ${os
      .loadavg()
      .map((l) => l.toFixed(2))
      .join(' / ')}.`,
  );
  if (Number(dupes.n) > 0) process.exitCode = 1;
  await new Promise((resolve) => setTimeout(resolve, 1000));
} finally {
  await server.close();
  await second.close();
}
