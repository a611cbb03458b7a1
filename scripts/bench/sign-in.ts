// Benchmark: the cost of the sign-in and session defences, beside GET /api/health as the floor,
// on loopback against the real server and MariaDB (database faultline_bench_auth, dropped and
// rebuilt on every run).
//   (a) a signed-in GET and how many times the session row was written during it
//   (b) a refused (throttled) sign-in: the counting UPDATE without a password check
//   (c) a signed-out GET: the per-address limit and the CSRF cookie, no session row
//   (d) 200 parallel wrong guesses at one account: how many were checked, time until all answered
//   npm run bench -- sign-in          BENCH_SECONDS=20 npm run bench -- sign-in
import os from 'node:os';
import autocannon from 'autocannon';
import { loadConfig } from '../../server/config';
import { createSequelize, createMigrator } from '../../server/db';
import { startServer } from '../../server/server';
import { hashPassword } from '../../server/modules/users/password';
import { localSecrets } from '../lib/local-secrets';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
const PASSWORD = 'bench-password-not-secret';
const DB_NAME = 'faultline_bench_auth';

const secrets = localSecrets();
const config = loadConfig(process.env, {
  DB_NAME,
  DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
  SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
  PORT: '0',
  LOG_LEVEL: 'silent',
  NODE_ENV: 'production',
  // Every request comes from loopback: the per-address limits must not end the run early.
  SIGNIN_MAX_FAILURES_PER_ADDRESS: '1000000',
  ANONYMOUS_REQUESTS_PER_MINUTE: '100000000',
});

async function rebuildDatabase() {
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query(`DROP DATABASE IF EXISTS ${DB_NAME}`);
  await admin.query(`CREATE DATABASE ${DB_NAME} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  const hash = await hashPassword(PASSWORD);
  await sequelize.query(
    `INSERT INTO users (email, name, role, password_hash, active, created_at, updated_at) VALUES
       ('bench.member@bench.faultline.test', 'Bench Member', 'member', :hash, 1, NOW(3), NOW(3)),
       ('bench.target@bench.faultline.test', 'Bench Target', 'member', :hash, 1, NOW(3), NOW(3)),
       ('bench.burst@bench.faultline.test', 'Bench Burst', 'member', :hash, 1, NOW(3), NOW(3))`,
    { replacements: { hash } },
  );
  return sequelize;
}

/** Signs in like the browser: visitor token from GET /api/session, then POST. */
async function signIn(url: string, email: string, password: string) {
  const first = await fetch(`${url}/api/session`);
  const visitorCookie = first.headers.getSetCookie()[0].split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const r = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: visitorCookie },
    body: JSON.stringify({ email, password }),
  });
  const session = r.headers.getSetCookie().find((c) => c.startsWith('faultline.sid='));
  return { status: r.status, visitorCookie, csrfToken, cookie: session?.split(';')[0] ?? null };
}

interface Row {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  requests: number;
  statuses: string;
}

async function measure(name: string, opts: autocannon.Options): Promise<Row> {
  await autocannon({ ...opts, connections: CONNECTIONS, duration: 2 });
  const r = await autocannon({ ...opts, connections: CONNECTIONS, duration: SECONDS });
  const statuses = Object.entries(r.statusCodeStats ?? {})
    .map(([code, s]) => `${code}×${(s as { count: number }).count}`)
    .join(' ');
  return { name, rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, requests: r.requests.total, statuses };
}

const sequelize = await rebuildDatabase();
const server = await startServer(config, { outboxWorker: false, serveClient: false, accountMailQueue: false });
try {
  // Every write of a session row the server makes, counted while the signed-in client runs.
  let sessionWrites = 0;
  let counting = false;
  server.deps.sequelize.addHook('afterQuery', (_options, query) => {
    const sql = (query as unknown as { sql?: string }).sql;
    if (counting && sql && /^(UPDATE|INSERT INTO) `?sessions`?/i.test(sql.trim())) sessionWrites++;
  });
  // The counter's own check: signing in writes the new session.
  counting = true;
  const member = await signIn(server.url, 'bench.member@bench.faultline.test', PASSWORD);
  counting = false;
  if (member.status !== 200 || !member.cookie) throw new Error(`bench sign-in failed: ${member.status}`);
  const signInWrites = sessionWrites;
  sessionWrites = 0;
  console.log(`autocannon: ${CONNECTIONS} connections, ${SECONDS} s per endpoint, loopback, after a 2 s warm-up.`);
  const floor = await measure('GET /api/health (floor)', { url: `${server.url}/api/health` });
  counting = true;
  const signedIn = await measure('GET /api/session (signed in)', { url: `${server.url}/api/session`, headers: { cookie: member.cookie } });
  counting = false;

  // An account whose free attempts are used up: every further attempt is refused before any password check.
  const target = 'bench.target@bench.faultline.test';
  for (let i = 0; i < config.SIGNIN_MAX_FAILURES_PER_ACCOUNT; i++) await signIn(server.url, target, `wrong-${i}`);
  const refused = await signIn(server.url, target, 'wrong-again');
  if (refused.status !== 429) throw new Error(`expected the target account to be paused, got ${refused.status}`);

  const rows = [
    floor,
    signedIn,
    await measure('GET /api/session (signed out, no cookie)', { url: `${server.url}/api/session` }),
    await measure('POST /api/session (paused account)', {
      url: `${server.url}/api/session`,
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': refused.csrfToken, cookie: refused.visitorCookie },
      body: JSON.stringify({ email: target, password: 'wrong-again' }),
    }),
  ];
  const anonymousRows = (
    await sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM sessions WHERE user_id IS NULL', { type: 'SELECT' as never })
  )[0];

  const pad = (s: string | number, n: number) => String(s).padStart(n);
  console.log(`\n${'endpoint'.padEnd(42)} ${pad('req/s', 8)} ${pad('p50 ms', 7)} ${pad('p99 ms', 7)} ${pad('requests', 9)}  statuses`);
  for (const r of rows)
    console.log(`${r.name.padEnd(42)} ${pad(r.rps.toFixed(0), 8)} ${pad(r.p50, 7)} ${pad(r.p99, 7)} ${pad(r.requests, 9)}  ${r.statuses}`);
  console.log(
    `\nSession row writes during the signed-in run (${signedIn.requests} measured requests after a 2 s warm-up): ${sessionWrites} (at most one a minute by design; the sign-in itself wrote ${signInWrites}); anonymous session rows after ${rows[2].requests} signed-out requests: ${Number(anonymousRows.n)}.`,
  );

  // 200 wrong guesses at once against a fresh account.
  const burst = 'bench.burst@bench.faultline.test';
  const first = await fetch(`${server.url}/api/session`);
  const cookie = first.headers.getSetCookie()[0].split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const t0 = performance.now();
  const statuses = await Promise.all(
    Array.from({ length: 200 }, (_, i) =>
      fetch(`${server.url}/api/session`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie },
        body: JSON.stringify({ email: burst, password: `guess-${i}` }),
      }).then((r) => r.status),
    ),
  );
  const ms = performance.now() - t0;
  const count = (s: number) => statuses.filter((x) => x === s).length;
  console.log(
    `200 parallel wrong guesses: ${count(401)} checked (401), ${count(429)} refused unchecked (429), others ${200 - count(401) - count(429)}; all answered in ${ms.toFixed(0)} ms.`,
  );
  console.log(
    `Load average (1, 5, 15 min): ${os
      .loadavg()
      .map((l) => l.toFixed(2))
      .join(', ')} on ${os.cpus().length} cores.`,
  );
} finally {
  await server.close();
  await sequelize.close();
}
