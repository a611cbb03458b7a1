// Benchmark: GET /api/board with 300 tools, beside GET /api/health as the floor, on loopback
// against the real server and MariaDB (data: scripts/bench/lib/bench-data.ts).
//   npm run bench            (all benchmarks)      npm run bench -- board   (this one)
//   BENCH_SECONDS=20 BENCH_CONNECTIONS=20 npm run bench -- board
import { startServer } from '../../server/server';
import { benchConfig, buildBenchFacility, loadAverage, measure, signIn, TOOLS } from './lib/bench-data';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);

const config = benchConfig();
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
  const results = [
    await measure('GET /api/health (floor)', `${server.url}/api/health`, opts),
    await measure('GET /api/board (display key)', `${server.url}/api/board`, { ...opts, headers: { 'x-display-key': displayKey } }),
    await measure('GET /api/board (signed-in member)', `${server.url}/api/board`, { ...opts, headers: { cookie } }),
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
