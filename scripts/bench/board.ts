// Benchmark: GET /api/board with 300 tools, beside GET /api/health as the floor, on loopback
// against the real server and MariaDB. Data goes into the separate database faultline_bench,
// which is dropped and rebuilt on every run (never the demo or test database).
//   npm run bench            (all benchmarks)      npm run bench -- board   (this one)
//   BENCH_SECONDS=20 BENCH_CONNECTIONS=20 npm run bench -- board
import crypto from 'node:crypto';
import autocannon from 'autocannon';
import { startServer } from '../../server/server';
import { hashPassword } from '../../server/modules/users/password';
import { createRandom } from '../../server/db/seed/random';
import { benchConfig, rebuildBenchDatabase, signInCookie } from '../lib/bench';

const TOOLS = 300;
const AREAS = 10;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
const HISTORY_PER_TOOL = 300;
const PASSWORD = 'bench-password-not-secret';

const config = benchConfig({ DB_POOL_MAX: process.env.DB_POOL_MAX ?? '10' });

const fmt = (d: Date) => d.toISOString().replace('T', ' ').replace('Z', '');

/** 300 tools in 10 areas, a fifth with 3 modules, 300 intervals each, and some tickets. */
async function fill(sequelize: Awaited<ReturnType<typeof rebuildBenchDatabase>>, displayKey: string) {
  const rnd = createRandom(300);
  const now = Date.now();
  const q = (sql: string) => sequelize.query(sql);
  const hash = await hashPassword(PASSWORD);
  await q(`INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES
    ('bench-admin@bench.test', 'Bench admin', 'admin', '${hash}', 1, 0, NOW(3), NOW(3)),
    ('bench-member@bench.test', 'Bench member', 'member', '${hash}', 1, 0, NOW(3), NOW(3))`);
  const areas = Array.from({ length: AREAS }, (_, i) => `('Bench area ${i + 1}', 'BA${i + 1}', ${i}, NOW(3), NOW(3))`);
  await q(`INSERT INTO areas (name, code, sort_order, created_at, updated_at) VALUES ${areas.join(',')}`);
  const tools = Array.from(
    { length: TOOLS },
    (_, i) => `(${(i % AREAS) + 1}, 'Bench tool ${i + 1}', 'BT-${i + 1}', 'normal', 1, NOW(3), NOW(3))`,
  );
  await q(`INSERT INTO tools (area_id, name, code, criticality, primary_engineer_id, created_at, updated_at) VALUES ${tools.join(',')}`);
  const modules: string[] = [];
  for (let t = 1; t <= TOOLS; t++)
    if (t % 5 === 0) for (let m = 1; m <= 3; m++) modules.push(`(${t}, 'Chamber ${m}', 'PM${m}', ${m}, NOW(3), NOW(3))`);
  await q(`INSERT INTO modules (tool_id, name, code, sort_order, created_at, updated_at) VALUES ${modules.join(',')}`);

  const states = ['productive', 'standby', 'standby', 'engineering', 'scheduled_downtime', 'unscheduled_downtime', 'non_scheduled'];
  const reasons: Record<string, string> = {
    productive: 'none',
    standby: 'none',
    engineering: 'process_development',
    scheduled_downtime: 'preventive_maintenance',
    unscheduled_downtime: 'repair',
    non_scheduled: 'not_staffed',
  };
  const rows: string[] = [];
  const log = (toolId: number, moduleId: number | null, count: number) => {
    let t = now - 365 * 86_400_000;
    const step = (365 * 86_400_000) / count;
    for (let i = 0; i < count; i++) {
      const state = i === count - 1 && rnd.chance(0.15) ? rnd.pick(states.slice(3)) : rnd.pick(states);
      const end = i === count - 1 ? null : t + step * (0.5 + rnd.next());
      rows.push(
        `(${toolId}, ${moduleId ?? 'NULL'}, '${state}', '${reasons[state]}', ${state === 'productive' || state === 'standby' ? 'NULL' : `'Bench note ${i}'`}, '${fmt(new Date(t))}', ${end ? `'${fmt(new Date(end))}'` : 'NULL'}, 'staff', 1, NOW(3))`,
      );
      if (end) t = end;
    }
  };
  for (let t = 1; t <= TOOLS; t++) log(t, null, HISTORY_PER_TOOL);
  let moduleId = 0;
  for (let t = 1; t <= TOOLS; t++) if (t % 5 === 0) for (let m = 0; m < 3; m++) log(t, ++moduleId, 20);
  for (let i = 0; i < rows.length; i += 5000) {
    await q(
      `INSERT INTO state_intervals (tool_id, module_id, state, reason, note, started_at, ended_at, source, confirmed, created_at) VALUES ${rows.slice(i, i + 5000).join(',')}`,
    );
  }
  const statuses = ['reported', 'acknowledged', 'in_repair', 'waiting', 'fixed', 'closed', 'closed', 'closed'];
  const tickets = Array.from(
    { length: 1500 },
    (_, i) => `(${rnd.int(1, TOOLS)}, 'other', 'Bench ticket ${i}', 'tool_stopped', '[]', '${rnd.pick(statuses)}', 'P3', NOW(3), NOW(3))`,
  );
  await q(
    `INSERT INTO tickets (tool_id, category, title, impact, hazards, status, priority, created_at, updated_at) VALUES ${tickets.join(',')}`,
  );
  const keyHash = crypto.createHash('sha256').update(displayKey).digest('hex');
  await q(
    `INSERT INTO display_links (name, key_hash, created_by_id, created_at, updated_at) VALUES ('Bench screen', '${keyHash}', 1, NOW(3), NOW(3))`,
  );
  return rows.length;
}

interface Row {
  name: string;
  rps: number;
  p50: number;
  p90: number;
  p99: number;
  requests: number;
  bad: number;
}

async function measure(name: string, url: string, headers: Record<string, string> = {}): Promise<Row> {
  // A short warm-up so JIT and pools settle before the measured run.
  await autocannon({ url, headers, connections: CONNECTIONS, duration: 2 });
  const r = await autocannon({ url, headers, connections: CONNECTIONS, duration: SECONDS });
  return {
    name,
    rps: r.requests.average,
    p50: r.latency.p50,
    p90: r.latency.p90,
    p99: r.latency.p99,
    requests: r.requests.total,
    bad: r.non2xx + r.errors + r.timeouts,
  };
}

const sequelize = await rebuildBenchDatabase(config);
const displayKey = crypto.randomBytes(32).toString('base64url');
const started = Date.now();
const intervals = await fill(sequelize, displayKey);
await sequelize.close();
console.log(
  `Data: ${TOOLS} tools in ${AREAS} areas, ${intervals} state intervals, 1500 tickets (filled in ${((Date.now() - started) / 1000).toFixed(1)} s).`,
);

const server = await startServer(config, { outboxWorker: false, serveClient: false });
try {
  const cookie = await signInCookie(server.url, 'bench-member@bench.test', PASSWORD);
  const check = await fetch(`${server.url}/api/board`, { headers: { 'x-display-key': displayKey } });
  const body = await check.text();
  const board = JSON.parse(body) as { total: number; areas: { tools: unknown[] }[] };
  if (check.status !== 200 || board.total !== TOOLS) throw new Error(`unexpected board answer: ${check.status}, ${board.total} tools`);
  console.log(`Board answer: ${board.total} tools, ${(Buffer.byteLength(body) / 1024).toFixed(0)} KiB of JSON.`);
  console.log(`autocannon: ${CONNECTIONS} connections, ${SECONDS} s per endpoint, loopback, after a 2 s warm-up.\n`);

  const results = [
    await measure('GET /api/health (floor)', `${server.url}/api/health`),
    await measure('GET /api/board (display key)', `${server.url}/api/board`, { 'x-display-key': displayKey }),
    await measure('GET /api/board (signed-in member)', `${server.url}/api/board`, { cookie }),
  ];
  const pad = (s: string | number, n: number) => String(s).padStart(n);
  console.log(
    `${'endpoint'.padEnd(36)} ${pad('req/s', 8)} ${pad('p50 ms', 7)} ${pad('p90 ms', 7)} ${pad('p99 ms', 7)} ${pad('requests', 9)} ${pad('non-2xx', 8)}`,
  );
  for (const r of results)
    console.log(
      `${r.name.padEnd(36)} ${pad(r.rps.toFixed(0), 8)} ${pad(r.p50, 7)} ${pad(r.p90, 7)} ${pad(r.p99, 7)} ${pad(r.requests, 9)} ${pad(r.bad, 8)}`,
    );
  if (results.some((r) => r.bad > 0)) process.exitCode = 1;
  // Let the last requests' session writes finish before the pool closes.
  await new Promise((resolve) => setTimeout(resolve, 1000));
} finally {
  await server.close();
}
