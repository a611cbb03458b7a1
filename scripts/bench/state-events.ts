// Benchmark: how long a state change takes to reach a watching socket, and how long the demo
// facility seed takes, beside the /api/health round trip measured in the same run. These
// figures used to be asserted in tests; speed is measured here instead.
//   npm run bench -- state-events        BENCH_ROUNDS=200 npm run bench -- state-events
import { io } from 'socket.io-client';
import { startServer } from '../../server/server';
import { changeState, openInitialState } from '../../server/modules/facility/state.service';
import { seedFacility } from '../../server/db/seed/facility';
import { User } from '../../server/modules/users/user.model';
import { hashPassword } from '../../server/modules/users/password';
import { Area, Tool } from '../../server/modules/facility/facility.model';
import { benchConfig, emptyBenchDatabase, loadAverage, PASSWORD, signIn } from './lib/bench-data';

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 100);
const config = benchConfig();

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
const summary = (name: string, ms: number[]) => {
  const s = [...ms].sort((a, b) => a - b);
  return `${name.padEnd(44)} ${String(s.length).padStart(6)} ${percentile(s, 50).toFixed(1).padStart(8)} ${percentile(s, 90).toFixed(1).padStart(8)} ${s[s.length - 1].toFixed(1).padStart(8)}`;
};

await (await emptyBenchDatabase()).close();

const server = await startServer(config, { outboxWorker: false, serveClient: false });
try {
  const sequelize = server.deps.sequelize;
  const area = await Area.create({ name: 'Bench bay', code: 'BB', sortOrder: 0 });
  const tool = await Tool.create({
    areaId: area.id,
    name: 'Bench furnace',
    code: 'BF-1',
    description: null,
    criticality: 'normal',
    primaryEngineerId: null,
    backupEngineerId: null,
    retiredAt: null,
  });
  await sequelize.transaction((t) => openInitialState(tool.id, null, new Date(Date.now() - 3600_000), null, t));

  // The floor: one /api/health round trip at a time, the same way the events are timed.
  const floor: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    const started = performance.now();
    await (await fetch(`${server.url}/api/health`)).text();
    floor.push(performance.now() - started);
  }

  // Every board listens in the room 'all'; a signed-in member's socket joins it.
  const hash = await hashPassword(PASSWORD);
  await User.create({ email: 'bench@bench.test', name: 'Bench member', role: 'member', passwordHash: hash, lastSignInAt: null });
  const { cookie } = await signIn(server.url, 'bench@bench.test');
  const socket = io(server.url, { path: '/socket.io', transports: ['websocket'], extraHeaders: { cookie }, forceNew: true });
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });

  const toEvent: number[] = [];
  const states = ['engineering', 'standby'] as const;
  for (let i = 0; i < ROUNDS; i++) {
    const state = states[i % 2];
    const heard = new Promise<void>((resolve) => socket.once('board.tool_changed', () => resolve()));
    const started = performance.now();
    await changeState(server.deps, { toolId: tool.id, state, note: state === 'engineering' ? 'Bench' : null, actorId: null });
    await heard;
    toEvent.push(performance.now() - started);
  }
  socket.disconnect();

  // The demo seed, in a transaction that is rolled back.
  const staff = await Promise.all(
    [1, 2, 3, 4, 5].map((i) =>
      User.create({ email: `tech${i}@bench.test`, name: `Bench tech ${i}`, role: 'technician', passwordHash: null, lastSignInAt: null }),
    ),
  );
  const members = await Promise.all(
    [1, 2, 3].map((i) =>
      User.create({ email: `m${i}@bench.test`, name: `Bench member ${i}`, role: 'member', passwordHash: null, lastSignInAt: null }),
    ),
  );
  const seedMs: number[] = [];
  for (let i = 0; i < 3; i++) {
    await sequelize
      .transaction(async (t) => {
        const started = performance.now();
        await seedFacility(t, { staff, members }, new Date('2026-06-15T10:00:00.000Z'));
        seedMs.push(performance.now() - started);
        throw new Error('rollback');
      })
      .catch((e) => {
        if ((e as Error).message !== 'rollback') throw e;
      });
  }

  console.log(`${loadAverage()}; loopback.\n`);
  console.log(`${'figure (ms)'.padEnd(44)} ${'n'.padStart(6)} ${'p50'.padStart(8)} ${'p90'.padStart(8)} ${'max'.padStart(8)}`);
  console.log(summary('GET /api/health round trip (floor)', floor));
  console.log(summary('state change → board.tool_changed on socket', toEvent));
  console.log(summary('demo facility seed (40 tools, a year)', seedMs));
} finally {
  await server.close();
}
