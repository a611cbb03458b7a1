// Benchmark: photo uploads, against the real server in its own process (so its memory is
// measured alone) and MariaDB, on loopback, in the database faultline_bench (rebuilt here).
//   (1) server time of a fault report with six phone photos (4032×3024 JPEG, EXIF orientation
//       set) against the same report without photos, beside GET /api/health as the floor;
//   (2) 20 reports sent at once by 20 members, each with six 9 MB photos: the server's peak
//       resident memory (VmHWM), the answers (201 / 503 beyond the upload cap), and the
//       health latency meanwhile.
//   npm run bench -- uploads          BENCH_UPLOAD_ROUNDS=5 npm run bench -- uploads
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { loadConfig } from '../../server/config';
import { createSequelize, createMigrator } from '../../server/db';
import { hashPassword } from '../../server/modules/users/password';
import { localSecrets } from '../lib/local-secrets';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const ROUNDS = Number(process.env.BENCH_UPLOAD_ROUNDS ?? 3);
const BURST = 20;
const PHOTOS = 6;
const BURST_PHOTO_BYTES = 9 * 1024 * 1024;
const PASSWORD = 'bench-password-not-secret';

const secrets = localSecrets();
const env = {
  ...process.env,
  DB_NAME: 'faultline_bench',
  DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
  SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
  LOG_LEVEL: 'warn',
  NODE_ENV: 'production',
};
const config = loadConfig(env);
const load = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(2))
    .join(' ');
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

async function rebuildDatabase() {
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_bench');
  await admin.query('CREATE DATABASE faultline_bench CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  const hash = await hashPassword(PASSWORD);
  const users = Array.from(
    { length: BURST + 1 },
    (_, i) => `('bench-member-${i}@bench.test', 'Bench member ${i}', 'member', '${hash}', 1, 0, NOW(3), NOW(3))`,
  );
  await sequelize.query(
    `INSERT INTO users (email, name, role, password_hash, active, on_call, created_at, updated_at) VALUES ${users.join(',')}`,
  );
  await sequelize.query(
    `INSERT INTO areas (name, code, sort_order, created_at, updated_at) VALUES ('Bench area', 'BA', 0, NOW(3), NOW(3))`,
  );
  await sequelize.query(
    `INSERT INTO tools (area_id, name, code, criticality, created_at, updated_at) VALUES (1, 'Bench tool', 'BT-1', 'normal', NOW(3), NOW(3))`,
  );
  await sequelize.query(
    `INSERT INTO state_intervals (tool_id, module_id, state, reason, note, started_at, ended_at, source, confirmed, created_at) VALUES (1, NULL, 'standby', 'none', NULL, NOW(3) - INTERVAL 1 DAY, NULL, 'staff', 1, NOW(3))`,
  );
  await sequelize.close();
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

/** A phone-sized photo with texture (blurred noise over a gradient), taken "sideways" (orientation 6). */
async function phonePhoto(seed: number) {
  const w = 4032;
  const h = 3024;
  const raw = Buffer.alloc(w * h * 3);
  let x = (seed * 2654435761) >>> 0 || 1;
  for (let i = 0; i < raw.length; i++) {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    raw[i] = ((x & 0xff) >> 1) + (((i / 3) % w) / w) * 120;
  }
  return sharp(raw, { raw: { width: w, height: h, channels: 3 } })
    .blur(1.2)
    .jpeg({ quality: 92 })
    .withMetadata({ orientation: 6 })
    .toBuffer();
}

async function signIn(url: string, i: number) {
  const first = await fetch(`${url}/api/session`);
  const cookie = first.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const r = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie, origin: url },
    body: JSON.stringify({ email: `bench-member-${i}@bench.test`, password: PASSWORD }),
  });
  if (r.status !== 200) throw new Error(`bench sign-in failed: ${r.status}`);
  const session = r.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken: token } = (await r.json()) as { csrfToken: string };
  return { cookie: session, csrf: token };
}

const report = (n: number) => ({
  toolId: 1,
  category: 'other',
  description: `Bench report ${n}: the load lock door sticks`,
  impact: 'still_usable',
  hazards: [],
  wafersCount: 0,
});

async function send(url: string, who: { cookie: string; csrf: string }, n: number, photos: Blob[]) {
  const started = performance.now();
  const headers: Record<string, string> = { cookie: who.cookie, 'x-csrf-token': who.csrf, origin: url };
  let body: BodyInit;
  if (photos.length) {
    const form = new FormData();
    form.append('report', JSON.stringify(report(n)));
    photos.forEach((p, i) => form.append('photos', p, `IMG_${i}.jpg`));
    body = form;
  } else {
    headers['content-type'] = 'application/json';
    body = JSON.stringify(report(n));
  }
  try {
    const r = await fetch(`${url}/api/tickets`, { method: 'POST', headers, body });
    await r.arrayBuffer();
    return { status: r.status, ms: performance.now() - started };
  } catch {
    // A refusal answered before the body was read ends the connection while the client is
    // still sending; fetch then reports a closed socket instead of the 503. Counted as "closed".
    return { status: 0, ms: performance.now() - started };
  }
}

async function healthMs(url: string) {
  const t = performance.now();
  try {
    await (await fetch(`${url}/api/health`)).arrayBuffer();
  } catch {
    return Number.POSITIVE_INFINITY;
  }
  return performance.now() - t;
}

function rssOf(pid: number) {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (name: string) => Number(new RegExp(`${name}:\\s+(\\d+)`).exec(status)?.[1] ?? 0);
  return { rss: kb('VmRSS') / 1024, hwm: kb('VmHWM') / 1024 };
}

await rebuildDatabase();
const port = await freePort();
const url = `http://127.0.0.1:${port}`;
const uploads = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-bench-uploads-'));
const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
  cwd: root,
  env: {
    ...env,
    LOG_LEVEL: 'error',
    PORT: String(port),
    HOST: '127.0.0.1',
    PUBLIC_URL: url,
    UPLOAD_DIR: uploads,
    MAIL_CATCHER: 'false',
    SMTP_PORT: '9',
  },
  stdio: ['ignore', 'inherit', 'inherit'],
});
try {
  for (let i = 0; i < 200; i++) {
    try {
      if ((await fetch(`${url}/api/health`)).ok) break;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const members = await Promise.all(Array.from({ length: BURST + 1 }, (_, i) => signIn(url, i)));
  const photoBytes = await Promise.all(Array.from({ length: PHOTOS }, (_, i) => phonePhoto(i + 1)));
  const phone = photoBytes.map((b) => new Blob([new Uint8Array(b)], { type: 'image/jpeg' }));
  console.log(
    `Photos: ${PHOTOS} × 4032×3024 JPEG, ${photoBytes.map((b) => (b.length / 1e6).toFixed(1)).join(' / ')} MB, EXIF orientation 6.`,
  );
  console.log(`Load average before: ${load()} (1, 5, 15 min) on ${os.cpus().length} cores.\n`);

  // (1) Server time: one report at a time, after a warm-up of each kind.
  for (let i = 0; i < 10; i++) await healthMs(url);
  await send(url, members[BURST], 0, []);
  await send(url, members[BURST], 0, phone);
  const health: number[] = [];
  const plain: number[] = [];
  const six: number[] = [];
  for (let round = 0; round < ROUNDS; round++) {
    for (let i = 0; i < 10; i++) health.push(await healthMs(url));
    const a = await send(url, members[round % BURST], round, []);
    const b = await send(url, members[(round + 1) % BURST], round, phone);
    if (a.status !== 201 || b.status !== 201) throw new Error(`report failed: ${a.status} / ${b.status}`);
    plain.push(a.ms);
    six.push(b.ms);
  }
  console.log(`${'request (median of ' + ROUNDS + ' rounds)'.padEnd(44)} ms`);
  console.log(`${'GET /api/health (floor)'.padEnd(44)} ${median(health).toFixed(1)}`);
  console.log(`${'POST /api/tickets, no photo'.padEnd(44)} ${median(plain).toFixed(0)}`);
  console.log(
    `${'POST /api/tickets, six phone photos'.padEnd(44)} ${median(six).toFixed(0)}  (all rounds: ${six.map((m) => m.toFixed(0)).join(', ')})`,
  );
  console.log(`Load average after: ${load()}\n`);

  // (2) Burst: 20 members at once, six 9 MB photos each (the photo padded after its end
  // marker to 9 MB, so the bytes on the wire are the worst allowed and decoding is real).
  const padded = photoBytes.map(
    (b) => new Blob([new Uint8Array(b), new Uint8Array(Math.max(0, BURST_PHOTO_BYTES - b.length))], { type: 'image/jpeg' }),
  );
  const before = rssOf(child.pid!);
  let peak = before.rss;
  let healthMax = 0;
  let healthFailed = 0;
  let sampling = true;
  const sampler = (async () => {
    while (sampling) {
      peak = Math.max(peak, rssOf(child.pid!).rss);
      const ms = await healthMs(url);
      if (Number.isFinite(ms)) healthMax = Math.max(healthMax, ms);
      else healthFailed++;
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  const t0 = performance.now();
  const answers = await Promise.all(members.slice(0, BURST).map((m, i) => send(url, m, 1000 + i, padded)));
  const burstMs = performance.now() - t0;
  sampling = false;
  await sampler;
  const after = rssOf(child.pid!);
  const counts = answers.reduce<Record<number, number>>((c, a) => ((c[a.status] = (c[a.status] ?? 0) + 1), c), {});
  console.log(
    `Burst: ${BURST} reports at once, ${PHOTOS} × 9 MB photos each (${((BURST * PHOTOS * BURST_PHOTO_BYTES) / 2 ** 20).toFixed(0)} MiB sent), in ${(burstMs / 1000).toFixed(1)} s.`,
  );
  console.log(
    `  answers: ${Object.entries(counts)
      .map(([s, n]) => `${n} × ${s === '0' ? 'connection closed after an early refusal' : s}`)
      .join(', ')}`,
  );
  console.log(
    `  server RSS: ${before.rss.toFixed(0)} MiB before, peak ${Math.max(peak, after.hwm).toFixed(0)} MiB (VmHWM ${after.hwm.toFixed(0)} MiB), ${after.rss.toFixed(0)} MiB after`,
  );
  console.log(
    `  GET /api/health during the burst: worst ${healthMax.toFixed(0)} ms, ${healthFailed} failed (fetch error on the client's side)`,
  );
  console.log(`Load average at the end: ${load()}`);
} finally {
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  // The server drains its requests on SIGTERM; a benchmark does not wait long for that.
  const force = setTimeout(() => child.kill('SIGKILL'), 10_000);
  await exited;
  clearTimeout(force);
  fs.rmSync(uploads, { recursive: true, force: true });
}
