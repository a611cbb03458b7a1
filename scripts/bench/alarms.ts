// Benchmark: the ingest API under a facility's steady alarm traffic (300 tools, one event a
// second each) plus a 10,000-event burst from one tool (a host computer sending its buffer
// after a day offline), with the status board read alongside. Figures are printed next to the
// /api/health floor measured in the same run, with the load average. Loopback only; data in
// the separate faultline_bench database, dropped and rebuilt on every run.
//   npm run bench -- alarms          BENCH_SECONDS=20 npm run bench -- alarms
import crypto from 'node:crypto';
import os from 'node:os';
import autocannon from 'autocannon';
import { loadConfig } from '../../server/config';
import { createSequelize, createMigrator } from '../../server/db';
import { startServer } from '../../server/server';
import { localSecrets } from '../lib/local-secrets';

const TOOLS = 300;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 15);
const BURST_EVENTS = Number(process.env.BENCH_BURST ?? 10_000);
const BURST_BATCH = 500;

const secrets = localSecrets();
const config = loadConfig(process.env, {
  DB_NAME: 'faultline_bench',
  DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
  SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
  PORT: '0',
  LOG_LEVEL: 'silent',
  NODE_ENV: 'production',
  DB_POOL_MAX: process.env.DB_POOL_MAX ?? '10',
});

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

async function rebuild() {
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_bench');
  await admin.query('CREATE DATABASE faultline_bench CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  const q = (sql: string) => sequelize.query(sql);
  await q(`INSERT INTO areas (name, code, sort_order, created_at, updated_at) VALUES ('Bench area', 'BA', 1, NOW(3), NOW(3))`);
  await q(
    `INSERT INTO tools (area_id, name, code, criticality, created_at, updated_at) VALUES ${Array.from({ length: TOOLS + 1 }, (_, i) => `(1, 'Bench tool ${i + 1}', 'BT-${i + 1}', 'normal', NOW(3), NOW(3))`).join(',')}`,
  );
  await q(
    `INSERT INTO state_intervals (tool_id, module_id, state, reason, started_at, source, confirmed, created_at) SELECT id, NULL, 'standby', 'none', NOW(3) - INTERVAL 1 DAY, 'system', 1, NOW(3) FROM tools`,
  );
  const keys = Array.from({ length: TOOLS + 1 }, (_, i) => `flt_bench_${i + 1}_${crypto.randomBytes(16).toString('hex')}`);
  await q(
    `INSERT INTO tool_keys (tool_id, label, key_hash, key_hint, created_at) VALUES ${keys.map((k, i) => `(${i + 1}, 'bench', '${sha256(k)}', '${k.slice(0, 10)}', NOW(3))`).join(',')}`,
  );
  const displayKey = crypto.randomBytes(32).toString('base64url');
  await q(
    `INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES ('bench@bench.test', 'Bench', 'admin', 'x', 1, 0, NOW(3), NOW(3))`,
  );
  await q(
    `INSERT INTO display_links (name, key_hash, created_by_id, created_at, updated_at) VALUES ('Bench screen', '${sha256(displayKey)}', 1, NOW(3), NOW(3))`,
  );
  await sequelize.close();
  return { keys, displayKey };
}

const pct = (values: number[], p: number) => {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
};

const errors = new Map<string, number>();

/** One request and its latency; a network failure is status 0 (counted, never hidden). */
async function timed(url: string, init: RequestInit): Promise<{ ms: number; status: number; body: string }> {
  const t = performance.now();
  try {
    const res = await fetch(url, init);
    const body = await res.text();
    return { ms: performance.now() - t, status: res.status, body };
  } catch (error) {
    const why = String((error as { cause?: { code?: string } }).cause?.code ?? error);
    errors.set(why, (errors.get(why) ?? 0) + 1);
    return { ms: performance.now() - t, status: 0, body: '' };
  }
}

let busyAnswers = 0;

/** Posts like a real sender: a 503 (ingest busy) is retried after its Retry-After, up to 10 times. */
async function postEvents(url: string, key: string, events: unknown[]) {
  const t = performance.now();
  for (let attempt = 0; ; attempt++) {
    const r = await timed(`${url}/api/ingest/v1/alarms`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
      body: JSON.stringify({ events }),
    });
    if (r.status !== 503 || attempt >= 10) return { ...r, ms: performance.now() - t };
    busyAnswers++;
    await new Promise((res) => setTimeout(res, 1000));
  }
}

/** Reads the board in a loop on two connections, recording each answer's latency, until stopped. */
function boardReader(url: string, displayKey: string) {
  const samples: { at: number; ms: number }[] = [];
  let running = true;
  let bad = 0;
  const loop = async () => {
    while (running) {
      const r = await timed(`${url}/api/board`, { headers: { 'x-display-key': displayKey } });
      if (r.status !== 200) bad++;
      samples.push({ at: performance.now(), ms: r.ms });
    }
  };
  const loops = [loop(), loop()];
  return {
    samples,
    get bad() {
      return bad;
    },
    async stop() {
      running = false;
      await Promise.all(loops);
    },
  };
}

let seq = 0;
const event = (alarm: number, set: boolean) => ({
  id: `b-${++seq}`,
  alarmId: alarm,
  set,
  text: `Bench alarm ${alarm}`,
  at: new Date().toISOString(),
});

/** 300 tools, each posting one event a second, spread evenly over the second. */
async function sustained(url: string, keys: string[], seconds: number, during?: () => Promise<void>) {
  const latencies: number[] = [];
  let accepted = 0;
  let bad = 0;
  const inflight: Promise<void>[] = [];
  const started = performance.now();
  const total = TOOLS * seconds;
  const gap = 1000 / TOOLS;
  const burst = during
    ? (async () => {
        await new Promise((r) => setTimeout(r, 2000));
        await during();
      })()
    : Promise.resolve();
  for (let i = 0; i < total; i++) {
    const due = started + i * gap;
    const wait = due - performance.now();
    if (wait > 1) await new Promise((r) => setTimeout(r, wait));
    const tool = i % TOOLS;
    const round = Math.floor(i / TOOLS);
    inflight.push(
      postEvents(url, keys[tool], [event(100 + (round % 40), round % 2 === 0)]).then((r) => {
        latencies.push(r.ms);
        if (r.status === 202) accepted += (JSON.parse(r.body) as { accepted: number }).accepted;
        else bad++;
      }),
    );
  }
  await Promise.all(inflight);
  await burst;
  const elapsed = (performance.now() - started) / 1000;
  return { latencies, accepted, bad, elapsed };
}

/** One tool sends 10,000 buffered events in requests of 500, two at a time. */
async function burstFrom(url: string, key: string) {
  const latencies: number[] = [];
  let accepted = 0;
  let bad = 0;
  const t0 = performance.now();
  const batches = Array.from({ length: BURST_EVENTS / BURST_BATCH }, (_, b) =>
    Array.from({ length: BURST_BATCH }, (_, i) => {
      const n = b * BURST_BATCH + i;
      return {
        id: `burst-${n}`,
        alarmId: 5000 + (n % 200),
        set: Math.floor(n / 200) % 2 === 0,
        text: `Buffered alarm ${5000 + (n % 200)}`,
        at: new Date(Date.now() - 86_400_000 + n * 1000).toISOString(),
      };
    }),
  );
  const worker = async () => {
    for (let batch = batches.shift(); batch; batch = batches.shift()) {
      const r = await postEvents(url, key, batch);
      latencies.push(r.ms);
      if (r.status === 202) accepted += (JSON.parse(r.body) as { accepted: number }).accepted;
      else bad++;
    }
  };
  const window = { from: t0, to: 0 };
  await Promise.all([worker(), worker()]);
  window.to = performance.now();
  return { latencies, accepted, bad, seconds: (window.to - t0) / 1000, window };
}

const { keys, displayKey } = await rebuild();
console.log(`Data: ${TOOLS} tools with a key each, plus one tool for the burst. ${SECONDS} s of steady traffic per phase.`);
const server = await startServer(config, { outboxWorker: false, serveClient: false });
try {
  const floor = await autocannon({ url: `${server.url}/api/health`, connections: 10, duration: 5 });
  const idleBoard = boardReader(server.url, displayKey);
  await new Promise((r) => setTimeout(r, 5000));
  await idleBoard.stop();

  // Phase 1: steady traffic alone, board read alongside.
  const board1 = boardReader(server.url, displayKey);
  const steady = await sustained(server.url, keys.slice(0, TOOLS), SECONDS);
  await board1.stop();
  // Printed as it comes: on a busy machine the burst phase can take minutes.
  console.log(
    `steady phase: ${steady.accepted} events in ${steady.elapsed.toFixed(1)} s; ingest p50 ${pct(steady.latencies, 50).toFixed(1)} ms, p99 ${pct(steady.latencies, 99).toFixed(1)} ms; ` +
      `board p99 ${pct(
        board1.samples.map((x) => x.ms),
        99,
      ).toFixed(1)} ms; load ${os.loadavg()[0].toFixed(2)}`,
  );

  // Phase 2: steady traffic plus the burst; the board's figures are taken during the burst.
  const board2 = boardReader(server.url, displayKey);
  let burst: Awaited<ReturnType<typeof burstFrom>> | null = null;
  const steady2 = await sustained(server.url, keys.slice(0, TOOLS), SECONDS, async () => {
    burst = await burstFrom(server.url, keys[TOOLS]);
  });
  await board2.stop();
  const b = burst as unknown as Awaited<ReturnType<typeof burstFrom>>;
  const duringBurst = board2.samples.filter((s) => s.at >= b.window.from && s.at <= b.window.to).map((s) => s.ms);

  const f = (n: number) => n.toFixed(1).padStart(8);
  const load = os
    .loadavg()
    .map((l) => l.toFixed(2))
    .join(' ');
  console.log(`\nLoad average (1, 5, 15 min) at the end: ${load}; ${os.cpus().length} CPUs.\n`);
  console.log(`${'measure'.padEnd(52)} ${'p50 ms'.padStart(8)} ${'p99 ms'.padStart(8)} ${'count'.padStart(8)}`);
  console.log(
    `${'GET /api/health (floor, autocannon 10 conn)'.padEnd(52)} ${f(floor.latency.p50)} ${f(floor.latency.p99)} ${String(floor.requests.total).padStart(8)}`,
  );
  console.log(
    `${'GET /api/board, no ingest'.padEnd(52)} ${f(
      pct(
        idleBoard.samples.map((s) => s.ms),
        50,
      ),
    )} ${f(
      pct(
        idleBoard.samples.map((s) => s.ms),
        99,
      ),
    )} ${String(idleBoard.samples.length).padStart(8)}`,
  );
  console.log(
    `${'GET /api/board, steady ingest (no burst)'.padEnd(52)} ${f(
      pct(
        board1.samples.map((s) => s.ms),
        50,
      ),
    )} ${f(
      pct(
        board1.samples.map((s) => s.ms),
        99,
      ),
    )} ${String(board1.samples.length).padStart(8)}`,
  );
  console.log(
    `${'GET /api/board, during the 10,000-event burst'.padEnd(52)} ${f(pct(duringBurst, 50))} ${f(pct(duringBurst, 99))} ${String(duringBurst.length).padStart(8)}`,
  );
  console.log(
    `${'POST ingest, steady (1 event a request)'.padEnd(52)} ${f(pct(steady.latencies, 50))} ${f(pct(steady.latencies, 99))} ${String(steady.latencies.length).padStart(8)}`,
  );
  console.log(
    `${'POST ingest, steady while the burst runs'.padEnd(52)} ${f(pct(steady2.latencies, 50))} ${f(pct(steady2.latencies, 99))} ${String(steady2.latencies.length).padStart(8)}`,
  );
  console.log(
    `${'POST ingest, burst (500 events a request)'.padEnd(52)} ${f(pct(b.latencies, 50))} ${f(pct(b.latencies, 99))} ${String(b.latencies.length).padStart(8)}`,
  );
  console.log(
    `\nEvents accepted: steady ${steady.accepted} in ${steady.elapsed.toFixed(1)} s = ${(steady.accepted / steady.elapsed).toFixed(0)} events/s (offered ${TOOLS}/s); ` +
      `burst ${b.accepted} in ${b.seconds.toFixed(1)} s = ${(b.accepted / b.seconds).toFixed(0)} events/s.`,
  );
  const bad = steady.bad + steady2.bad + b.bad + board1.bad + board2.bad + idleBoard.bad + floor.non2xx;
  console.log(`Answers "busy, send again" (503, retried like a sender): ${busyAnswers}.`);
  console.log(`Failed requests: ${bad}${errors.size ? ` (network: ${[...errors].map(([k, v]) => `${k} ×${v}`).join(', ')})` : ''}.`);
  if (bad > 0) process.exitCode = 1;
} finally {
  await server.close();
}
