import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import type { RegisteredRoute } from '../../server/lib/http';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const concrete = (path: string) =>
  path.replace(/:(\w+)/g, (_m, name: string) => (/token|key/i.test(name) ? 'x'.repeat(43) : /code/i.test(name) ? 'NOPE' : '1'));

// Counters and sessions change on every request by design; everything else must stay put.
const VOLATILE = new Set(['throttles', 'sessions', 'schema_migrations']);

async function rowCounts() {
  const tables = await server.deps.sequelize.query<{ name: string }>(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'`,
    { type: QueryTypes.SELECT },
  );
  const counts: Record<string, number> = {};
  for (const { name } of tables) {
    if (VOLATILE.has(name)) continue;
    const [row] = await server.deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${name}\``, { type: QueryTypes.SELECT });
    counts[name] = Number(row.n);
  }
  return counts;
}

describe('bad input', () => {
  it('when any route with a body gets unknown or malformed fields, then 400 with field messages and nothing is written', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const routes = (server.app.locals.routeRegistry as RegisteredRoute[]).filter((r) => r.hasBody);
    expect(routes.length).toBeGreaterThan(2);
    const before = await rowCounts();
    for (const r of routes) {
      for (const body of [{ surpriseField: 'x' }, { email: 42, name: ['not', 'text'], password: {} }, 'just a string']) {
        const res = await client.request(r.method.toUpperCase(), `/api${concrete(r.path)}`, body);
        expect(res.status, `${r.method} ${r.path} ${JSON.stringify(body)}`).toBe(400);
        expect(res.body.error.code).toMatch(/validation_failed|bad_request/);
        if (res.body.error.code === 'validation_failed') expect(Object.keys(res.body.error.fields ?? {}).length).toBeGreaterThan(0);
      }
    }
    expect(await rowCounts()).toEqual(before);
  });

  it('when an unknown field rides along with valid ones, then it is refused by name, not ignored', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const r = await client.post('/api/users', {
      email: `ok-${Date.now()}@test.faultline.test`,
      name: 'Fine',
      role: 'member',
      isSuperuser: true,
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toHaveProperty('isSuperuser');
  });
});
