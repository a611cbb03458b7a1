import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { startDatabase, stopDatabase } from '../support/database';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  startDatabase(); // never leave the database down for the next file
  await server.close();
});

async function poll(check: () => Promise<boolean>, timeoutMs: number) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, 200));
  }
  return false;
}

describe('health', () => {
  it('when MariaDB stops, then health says 503 db down and API calls get a clear 503; after it restarts, the same process recovers', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const up = await fetch(`${server.url}/api/health`);
    expect(up.status).toBe(200);
    expect(await up.json()).toEqual({ status: 'ok', db: 'ok' });

    stopDatabase();
    const down = await fetch(`${server.url}/api/health`);
    expect(down.status).toBe(503);
    expect(await down.json()).toMatchObject({ db: 'down' });
    const call = await client.get('/api/users');
    expect(call.status).toBe(503);
    expect(call.body.error.code).toBe('db_unavailable');

    startDatabase();
    expect(await poll(async () => (await fetch(`${server.url}/api/health`)).status === 200, 15_000)).toBe(true);
    // The signed-in session survived too: sessions live in MariaDB, not in the process.
    expect(await poll(async () => (await client.get('/api/users')).status === 200, 15_000)).toBe(true);
  });
});
