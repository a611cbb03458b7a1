// Benchmark: how long one tool state change takes to reach every open board. 50, 200 and 500
// simulated boards (half signed-in members, half lobby display keys), each a real
// socket.io-client socket, against the real server in its own process (and then through two
// processes behind HAProxy with Redis, as `npm run cluster` runs them). The clock runs from
// the state-change request until the last board holds the new state. Each simulated board
// does what the browser does with what it receives: an event that carries the board entry is
// applied as is; an event that only names the tool makes the board refetch /api/board (after
// the browser's 150 ms batching), counted as a refetch.
//   npm run bench -- fanout      FANOUT_BOARDS=50,200 FANOUT_ROUNDS=5 FANOUT_CLUSTER=0 npm run bench -- fanout
import autocannon from 'autocannon';
import { io, type Socket } from 'socket.io-client';
import { ADMIN_EMAIL, benchConfig, buildBenchFacility, loadAverage, signIn } from './lib/bench-data';
import { ensureClusterPackages, startCluster, startServerProcess } from '../lib/cluster';

const BOARD_COUNTS = (process.env.FANOUT_BOARDS ?? '50,200,500').split(',').map(Number);
const ROUNDS = Number(process.env.FANOUT_ROUNDS ?? 5);
const CLUSTER = process.env.FANOUT_CLUSTER !== '0';
const MEMBER_SESSIONS = 10;
const ROUND_TIMEOUT_MS = 60_000;
const BATCH_MS = 150; // the browser folds a burst of announcements into one refetch

interface BoardTool {
  id: number;
  state: string;
}
interface BoardData {
  areas: { tools: BoardTool[] }[];
}

const config = benchConfig();
const { displayKey } = await buildBenchFacility();
const serverEnv = {
  DB_NAME: 'faultline_bench',
  DB_HOST: config.DB_HOST,
  DB_PORT: String(config.DB_PORT),
  DB_USER: config.DB_USER,
  DB_PASSWORD: config.DB_PASSWORD,
  SESSION_SECRET: config.SESSION_SECRET,
  NODE_ENV: 'production',
  LOG_LEVEL: 'silent',
  MAIL_CATCHER: 'false',
  // No follows in the bench data, so no mail is queued; the worker still polls as in production.
};

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];

/** GET /api/health latency under light load: the floor every other figure is read against. */
async function healthFloor(url: string) {
  const r = await autocannon({ url: `${url}/api/health`, connections: 10, duration: 3 });
  return { p50: r.latency.p50, p99: r.latency.p99 };
}

interface SimBoard {
  socket: Socket;
  headers: Record<string, string>;
  /** The state this board currently shows for the tool under test. */
  shown: Map<number, string>;
}

async function openBoards(url: string, count: number, cookies: string[]) {
  const boards: SimBoard[] = [];
  for (let i = 0; i < count; i++) {
    const member = i % 2 === 0;
    const headers: Record<string, string> = member ? { cookie: cookies[i % cookies.length] } : { 'x-display-key': displayKey };
    const socket = io(url, {
      path: '/socket.io',
      transports: ['websocket'],
      forceNew: true,
      reconnection: false,
      ...(member ? { extraHeaders: { cookie: headers.cookie } } : { auth: { displayKey } }),
    });
    boards.push({ socket, headers, shown: new Map() });
  }
  await Promise.all(
    boards.map(
      (b) =>
        new Promise<void>((resolve, reject) =>
          b.socket.connected ? resolve() : (b.socket.once('connect', () => resolve()), b.socket.once('connect_error', reject)),
        ),
    ),
  );
  return boards;
}

async function runRounds(url: string, label: string, count: number, cookies: string[], admin: { cookie: string; csrfToken: string }) {
  const boards = await openBoards(url, count, cookies);
  const latencies: number[] = [];
  let refetches = 0;
  let serverErrors = 0;
  let missing = 0;
  try {
    for (let round = 0; round < ROUNDS; round++) {
      const toolId = 1 + ((round * 37 + count) % 300);
      const target = round % 2 === 0 ? 'unscheduled_downtime' : 'standby';
      let t0 = 0;
      const reached = boards.map(
        (b) =>
          new Promise<number | null>((resolve) => {
            const timer = setTimeout(() => resolve(null), ROUND_TIMEOUT_MS);
            const done = () => {
              clearTimeout(timer);
              b.socket.off('board.tool_changed', onEntry);
              b.socket.off('tool.state_changed', onAnnounce);
              resolve(performance.now() - t0);
            };
            // The board entry rides on the event: the board shows it at once.
            const onEntry = (change: { tool: BoardTool }) => {
              b.shown.set(change.tool.id, change.tool.state);
              if (change.tool.id === toolId && change.tool.state === target) done();
            };
            // Only "tool X changed": the board asks the API for the whole board again.
            let batch: ReturnType<typeof setTimeout> | null = null;
            const onAnnounce = () => {
              batch ??= setTimeout(async () => {
                batch = null;
                refetches++;
                const r = await fetch(`${url}/api/board`, { headers: { ...b.headers, 'accept-encoding': 'gzip, br' } }).catch(() => null);
                if (!r || r.status >= 500) {
                  serverErrors++;
                  return;
                }
                if (!r.ok) return;
                const data = (await r.json()) as BoardData;
                const tool = data.areas.flatMap((a) => a.tools).find((t) => t.id === toolId);
                if (tool?.state === target) done();
              }, BATCH_MS);
            };
            b.socket.on('board.tool_changed', onEntry);
            b.socket.on('tool.state_changed', onAnnounce);
          }),
      );
      t0 = performance.now();
      const r = await fetch(`${url}/api/tools/${toolId}/state`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie: admin.cookie, 'x-csrf-token': admin.csrfToken, origin: url },
        body: JSON.stringify(target === 'standby' ? { state: 'standby' } : { state: target, note: 'Bench: fan-out round' }),
      });
      if (r.status !== 201) throw new Error(`state change answered ${r.status}: ${await r.text()}`);
      for (const ms of await Promise.all(reached)) {
        if (ms === null) missing++;
        else latencies.push(ms);
      }
      // Let stragglers' refetches drain before the next round.
      await new Promise((resolve) => setTimeout(resolve, 300));
    }
  } finally {
    for (const b of boards) b.socket.disconnect();
  }
  latencies.sort((a, b) => a - b);
  return { label, count, p50: pct(latencies, 50), p99: pct(latencies, 99), max: latencies.at(-1) ?? NaN, refetches, serverErrors, missing };
}

type Row = Awaited<ReturnType<typeof runRounds>>;

async function measureTarget(name: string, url: string): Promise<{ rows: Row[]; floor: { p50: number; p99: number } }> {
  const floor = await healthFloor(url);
  const cookies: string[] = [];
  for (let i = 0; i < MEMBER_SESSIONS; i++) cookies.push((await signIn(url)).cookie);
  const admin = await signIn(url, ADMIN_EMAIL);
  const rows: Row[] = [];
  for (const count of BOARD_COUNTS) rows.push(await runRounds(url, name, count, cookies, admin));
  return { rows, floor };
}

function print(results: { rows: Row[]; floor: { p50: number; p99: number } }[]) {
  const pad = (s: string | number, n: number) => String(s).padStart(n);
  const ms = (n: number) => (Number.isFinite(n) ? n.toFixed(0) : '–');
  console.log(
    `\n${'setup'.padEnd(26)} ${pad('boards', 6)} ${pad('p50 ms', 7)} ${pad('p99 ms', 7)} ${pad('max ms', 7)} ${pad('refetch', 8)} ${pad('5xx', 5)} ${pad('missed', 7)} ${pad('health p50/p99', 15)}`,
  );
  for (const { rows, floor } of results) {
    for (const r of rows) {
      console.log(
        `${r.label.padEnd(26)} ${pad(r.count, 6)} ${pad(ms(r.p50), 7)} ${pad(ms(r.p99), 7)} ${pad(ms(r.max), 7)} ${pad(r.refetches, 8)} ${pad(r.serverErrors, 5)} ${pad(r.missing, 7)} ${pad(`${floor.p50}/${floor.p99} ms`, 15)}`,
      );
    }
  }
}

console.log(
  `Fan-out: ${ROUNDS} state changes per row; boards half signed-in (${MEMBER_SESSIONS} sessions), half display key; websocket transport.`,
);
const results: Awaited<ReturnType<typeof measureTarget>>[] = [];
const single = await startServerProcess(serverEnv);
try {
  results.push(await measureTarget('one process', single.url));
  print(results);
} finally {
  await single.stop();
}
if (CLUSTER) {
  ensureClusterPackages();
  const cluster = await startCluster({ nodes: 2, env: serverEnv });
  try {
    const two = await measureTarget('2 processes + HAProxy', cluster.url);
    results.push(two);
    print([two]);
  } finally {
    await cluster.stop();
  }
}
console.log(`\n${loadAverage()}`);
if (results.some((r) => r.rows.some((row) => row.serverErrors > 0 || row.missing > 0))) process.exitCode = 1;
