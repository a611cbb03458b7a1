// Benchmark: GET /api/board with 300 tools, beside GET /api/health as the floor, on loopback
// against the real server and MariaDB (data: scripts/bench/lib/bench-data.ts).
//   npm run bench            (all benchmarks)      npm run bench -- board   (this one)
//   BENCH_SECONDS=20 BENCH_CONNECTIONS=20 npm run bench -- board
import http from 'node:http';
import { startServer } from '../../server/server';
import { benchConfig, buildBenchFacility, loadAverage, measure, signIn, TOOLS } from './lib/bench-data';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);

const config = benchConfig();

/** Bytes on the wire for one GET (Node's fetch would decompress and hide them). */
function rawSize(url: string, headers: Record<string, string>): Promise<number> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers }, (res) => {
        let n = 0;
        res.on('data', (c: Buffer) => (n += c.length));
        res.on('end', () => resolve(n));
      })
      .on('error', reject);
  });
}
const { displayKey } = await buildBenchFacility();

const server = await startServer(config, { outboxWorker: false, serveClient: false });
try {
  const { cookie } = await signIn(server.url);
  const check = await fetch(`${server.url}/api/board`, { headers: { 'x-display-key': displayKey } });
  const body = await check.text();
  const board = JSON.parse(body) as { total: number; areas: { tools: unknown[] }[] };
  if (check.status !== 200 || board.total !== TOOLS) throw new Error(`unexpected board answer: ${check.status}, ${board.total} tools`);
  console.log(`Board answer: ${board.total} tools, ${(Buffer.byteLength(body) / 1024).toFixed(0)} KiB of JSON.`);
  console.log(`autocannon: ${CONNECTIONS} connections, ${SECONDS} s per endpoint, loopback, after a 2 s warm-up.\n`);

  const opts = { connections: CONNECTIONS, seconds: SECONDS };
  // What a browser sends: compressed answers accepted (brotli is chosen when offered).
  const compressed = { 'accept-encoding': 'gzip, deflate, br' };
  const sizes = await Promise.all(
    ['gzip', 'br'].map(async (encoding) => {
      const r = await rawSize(`${server.url}/api/board`, { 'x-display-key': displayKey, 'accept-encoding': encoding });
      return `${encoding} ${(r / 1024).toFixed(1)} KiB`;
    }),
  );
  console.log(`Compressed board: ${sizes.join(', ')}.`);
  const results = [
    await measure('GET /api/health (floor)', `${server.url}/api/health`, opts),
    await measure('GET /api/board (display key, br)', `${server.url}/api/board`, {
      ...opts,
      headers: { 'x-display-key': displayKey, ...compressed },
    }),
    await measure('GET /api/board (signed-in, br)', `${server.url}/api/board`, { ...opts, headers: { cookie, ...compressed } }),
    await measure('GET /api/board (signed-in, plain)', `${server.url}/api/board`, { ...opts, headers: { cookie } }),
  ];
  const pad = (s: string | number, n: number) => String(s).padStart(n);
  console.log(
    `${'endpoint'.padEnd(36)} ${pad('req/s', 8)} ${pad('p50 ms', 7)} ${pad('p90 ms', 7)} ${pad('p99 ms', 7)} ${pad('requests', 9)} ${pad('non-2xx', 8)}`,
  );
  for (const r of results)
    console.log(
      `${r.name.padEnd(36)} ${pad(r.rps.toFixed(0), 8)} ${pad(r.p50, 7)} ${pad(r.p90, 7)} ${pad(r.p99, 7)} ${pad(r.requests, 9)} ${pad(r.bad, 8)}`,
    );
  console.log(`\n${loadAverage()}`);
  if (results.some((r) => r.bad > 0)) process.exitCode = 1;
  // Let the last requests' session writes finish before the pool closes.
  await new Promise((resolve) => setTimeout(resolve, 1000));
} finally {
  await server.close();
}
