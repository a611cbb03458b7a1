// The benchmark facility: 300 tools in 10 areas, a fifth with 3 modules, 300 state intervals
// per tool, 1500 tickets, a bench admin, a bench member and one lobby display key. It lives in
// the separate database faultline_bench, dropped and rebuilt on every run (never the demo or
// test database). Shared by the benchmarks so they measure the same data.
import crypto from 'node:crypto';
import os from 'node:os';
import autocannon from 'autocannon';
import { loadConfig } from '../../../server/config';
import { createSequelize, createMigrator } from '../../../server/db';
import { hashPassword } from '../../../server/modules/users/password';
import { createRandom } from '../../../server/db/seed/random';
import { localSecrets } from '../../lib/local-secrets';

export const TOOLS = 300;
export const AREAS = 10;
const HISTORY_PER_TOOL = 300;
export const PASSWORD = 'bench-password-not-secret';
export const ADMIN_EMAIL = 'bench-admin@bench.test';
export const MEMBER_EMAIL = 'bench-member@bench.test';

const secrets = localSecrets();

/** The server configuration of a benchmark: the bench database, production mode, no logs. */
export function benchConfig(overrides: Record<string, string> = {}) {
  return loadConfig(process.env, {
    DB_NAME: 'faultline_bench',
    DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
    SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
    PORT: '0',
    LOG_LEVEL: 'silent',
    NODE_ENV: 'production',
    ...overrides,
  });
}

const fmt = (d: Date) => d.toISOString().replace('T', ' ').replace('Z', '');

/** Drops and recreates faultline_bench with every migration and no rows; returns a connection to it. */
export async function emptyBenchDatabase() {
  const config = benchConfig();
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_bench');
  await admin.query('CREATE DATABASE faultline_bench CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  return sequelize;
}

/** Drops, recreates and fills faultline_bench; returns the display key and the row count. */
export async function buildBenchFacility() {
  const sequelize = await emptyBenchDatabase();
  const displayKey = crypto.randomBytes(32).toString('base64url');
  const started = Date.now();
  try {
    const intervals = await fill(sequelize, displayKey);
    console.log(
      `Data: ${TOOLS} tools in ${AREAS} areas, ${intervals} state intervals, 1500 tickets (filled in ${((Date.now() - started) / 1000).toFixed(1)} s).`,
    );
  } finally {
    await sequelize.close();
  }
  return { displayKey };
}

async function fill(sequelize: ReturnType<typeof createSequelize>, displayKey: string) {
  const rnd = createRandom(300);
  const now = Date.now();
  const q = (sql: string) => sequelize.query(sql);
  const hash = await hashPassword(PASSWORD);
  await q(`INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES
    ('${ADMIN_EMAIL}', 'Bench admin', 'admin', '${hash}', 1, 0, NOW(3), NOW(3)),
    ('${MEMBER_EMAIL}', 'Bench member', 'member', '${hash}', 1, 0, NOW(3), NOW(3))`);
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

/** Signs in through the API; returns the session cookie and its CSRF token. */
export async function signIn(url: string, email = MEMBER_EMAIL): Promise<{ cookie: string; csrfToken: string }> {
  const first = await fetch(`${url}/api/session`);
  const cookie = first.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const r = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (r.status !== 200) throw new Error(`bench sign-in failed: ${r.status}`);
  const signedIn = r.headers.get('set-cookie')!.split(';')[0];
  const session = (await (await fetch(`${url}/api/session`, { headers: { cookie: signedIn } })).json()) as { csrfToken: string };
  return { cookie: signedIn, csrfToken: session.csrfToken };
}

export interface LatencyRow {
  name: string;
  rps: number;
  p50: number;
  p90: number;
  p99: number;
  requests: number;
  bad: number;
}

/** autocannon against one URL after a short warm-up, so JIT and pools settle first. */
export async function measure(
  name: string,
  url: string,
  opts: { headers?: Record<string, string>; connections: number; seconds: number },
): Promise<LatencyRow> {
  const { headers = {}, connections, seconds } = opts;
  await autocannon({ url, headers, connections, duration: 2 });
  const r = await autocannon({ url, headers, connections, duration: seconds });
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

/** The machine's load while the benchmark ran: its figures mean little without it. */
export function loadAverage() {
  return `load average ${os
    .loadavg()
    .map((n) => n.toFixed(2))
    .join(' ')} (${os.cpus().length} cores)`;
}
