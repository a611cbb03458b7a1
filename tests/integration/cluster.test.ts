import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailCatcher } from '../../server/lib/mail-catcher';
import { ensureClusterPackages, startCluster, type Cluster } from '../../scripts/lib/cluster';
import { testConfig } from '../support/env';
import { TestClient } from '../support/client';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { connected, openTestSocket, waitUntil, type TestSocket } from '../support/sockets';
import { makeTool } from './facility-fixtures';
import { acquireSequelize, releaseSequelize } from '../../server/db';
import type { BoardToolChange } from '../../shared/events';

// Several server processes on real parts (environment.md "More than one server process"):
// Redis for socket.io's adapter, two Faultline processes as child processes on ephemeral
// ports, HAProxy in front. The test process holds only the SMTP catcher and the clients.

let cluster: Cluster;
let catcher: MailCatcher;
// Fixtures write rows through the models, bound to the test database in this process.
const sequelize = acquireSequelize(testConfig());
const sockets: TestSocket[] = [];

beforeAll(async () => {
  ensureClusterPackages();
  catcher = new MailCatcher(0);
  await catcher.start();
  const c = testConfig();
  cluster = await startCluster({
    nodes: 2,
    env: {
      NODE_ENV: 'test',
      LOG_LEVEL: 'silent',
      DB_HOST: c.DB_HOST,
      DB_PORT: String(c.DB_PORT),
      DB_USER: c.DB_USER,
      DB_PASSWORD: c.DB_PASSWORD,
      DB_NAME: c.DB_NAME,
      SESSION_SECRET: c.SESSION_SECRET,
      SMTP_PORT: String(catcher.port),
      MAIL_CATCHER: 'false',
      OUTBOX_POLL_MS: '200',
      SIGNIN_MAX_FAILURES_PER_ADDRESS: '100000',
      UPLOAD_DIR: c.UPLOAD_DIR,
    },
  });
}, 120_000);
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  await cluster?.stop();
  await catcher?.stop();
  await releaseSequelize(sequelize);
});

async function signIn(baseUrl: string, role: 'member' | 'technician') {
  const user = await createUser(role);
  const client = new TestClient(baseUrl);
  const r = await client.signIn(user.email, TEST_PASSWORD);
  if (r.status !== 200) throw new Error(`sign-in failed: ${r.status}`);
  return { client, user };
}

function open(url: string, cookie: string, reconnection = false) {
  const ear = openTestSocket(url, { cookie, reconnection });
  sockets.push(ear.socket);
  return ear;
}

const heardState = (packets: { event: string; args: unknown[] }[], toolId: number, state: string) =>
  packets.some(
    (p) =>
      p.event === 'board.tool_changed' &&
      (p.args[0] as BoardToolChange).tool.id === toolId &&
      (p.args[0] as BoardToolChange).tool.state === state,
  );

describe('two processes', () => {
  it('when a technician changes a state through process A, then a board connected to process B gets it within a second, and the follower’s mail is sent exactly once', async () => {
    const [a, b] = cluster.nodes;
    const { client: tech } = await signIn(a.url, 'technician');
    const { client: follower, user } = await signIn(a.url, 'member');
    const { tool } = await makeTool(sequelize);
    expect((await follower.put(`/api/tools/${tool.id}/follow`)).status).toBe(200);
    const board = open(b.url, follower.cookie!);
    await connected(board.socket);

    const r = await tech.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', note: 'Vacuum fault' });
    expect(r.status).toBe(201);
    await waitUntil(() => heardState(board.packets, tool.id, 'unscheduled_downtime'), 1000, 'the change on process B');

    // Both processes' outbox workers poll every 200 ms; the row is claimed by one of them.
    await catcher.waitFor((m) => m.to.includes(user.email), 10_000);
    await new Promise((resolve) => setTimeout(resolve, 2000));
    expect(catcher.messages.filter((m) => m.to.includes(user.email))).toHaveLength(1);
  });

  it('when process A stops, then its clients reconnect through the balancer to B, and no change is lost', async () => {
    const [a, b] = cluster.nodes;
    const { client: member } = await signIn(cluster.url, 'member');
    const { client: tech } = await signIn(b.url, 'technician');
    const { tool } = await makeTool(sequelize);
    // Round-robin spreads new connections over both processes. The balancer's stickiness
    // cookie from the sign-in would pin all six to one process, as if one browser; these are
    // six browsers sharing the session cookie only.
    const sessionOnly = member
      .cookie!.split('; ')
      .filter((c) => !c.startsWith('FLNODE='))
      .join('; ');
    const boards = Array.from({ length: 6 }, () => open(cluster.url, sessionOnly, true));
    await Promise.all(boards.map((e) => connected(e.socket)));
    const dropped = new Set<number>();
    boards.forEach((e, i) => e.socket.on('disconnect', () => dropped.add(i)));

    await a.stop('SIGTERM');
    await waitUntil(() => dropped.size > 0, 5000, 'the sockets of process A to drop');
    // A change while they are away: they learn of it by reloading once they are back.
    expect((await tech.post(`/api/tools/${tool.id}/state`, { state: 'engineering', note: 'While A is down' })).status).toBe(201);
    await waitUntil(() => boards.every((e) => e.socket.connected), 15_000, 'every socket to be connected again');
    const afterReconnect = await member.get('/api/board');
    expect(afterReconnect.status).toBe(200);
    expect(afterReconnect.body.areas.flatMap((x: any) => x.tools).find((t: any) => t.id === tool.id).state).toBe('engineering');

    // And live again: every board, reconnected or not, hears the next change.
    expect((await tech.post(`/api/tools/${tool.id}/state`, { state: 'standby' })).status).toBe(201);
    await waitUntil(() => boards.every((e) => heardState(e.packets, tool.id, 'standby')), 3000, 'the next change on every board');
    expect(dropped.size).toBeGreaterThan(0);
    expect(dropped.size).toBeLessThan(boards.length);
  });
});
