import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { startScratchDatabase, type ScratchDatabase } from '../support/database';
import { startStandInServer } from '../support/stand-in';

// The outage happens on a throw-away MariaDB of this file's own; a second server on the shared
// database (standing in for a demo running at the same time) must keep answering throughout.
let db: ScratchDatabase;
let server: TestServer;
let standIn: Awaited<ReturnType<typeof startStandInServer>>;
beforeAll(async () => {
  db = await startScratchDatabase();
  server = await startTestServer(db.overrides);
  standIn = await startStandInServer();
});
afterAll(async () => {
  await server?.close();
  await standIn?.stop();
  db?.destroy();
});

async function poll(check: () => Promise<boolean>, timeoutMs: number) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, 200));
  }
  return false;
}

/** Asks the stand-in's health every 100 ms until stopped; resolves with every status seen. */
function watchHealth(url: string) {
  const statuses: number[] = [];
  let running = true;
  const done = (async () => {
    while (running) {
      statuses.push(
        await fetch(`${url}/api/health`).then(
          (r) => r.status,
          () => 0,
        ),
      );
      await new Promise((r) => setTimeout(r, 100));
    }
    return statuses;
  })();
  return { stop: () => ((running = false), done) };
}

describe('health', () => {
  it('when MariaDB stops, then health says 503 db down and API calls get a clear 503; after it restarts, the same process recovers', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const up = await fetch(`${server.url}/api/health`);
    expect(up.status).toBe(200);
    expect(await up.json()).toEqual({ status: 'ok', db: 'ok' });
    const watch = watchHealth(standIn.url);

    db.stop();
    const down = await fetch(`${server.url}/api/health`);
    expect(down.status).toBe(503);
    expect(await down.json()).toMatchObject({ db: 'down' });
    const call = await client.get('/api/users');
    expect(call.status).toBe(503);
    expect(call.body.error.code).toBe('db_unavailable');
    // Meanwhile the server on the shared database (a running demo) still answers.
    expect((await fetch(`${standIn.url}/api/health`)).status).toBe(200);

    await db.start();
    expect(await poll(async () => (await fetch(`${server.url}/api/health`)).status === 200, 15_000)).toBe(true);
    // The signed-in session survived too: sessions live in MariaDB, not in the process.
    expect(await poll(async () => (await client.get('/api/users')).status === 200, 15_000)).toBe(true);

    const seen = await watch.stop();
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.every((s) => s === 200)).toBe(true);
  });
});
