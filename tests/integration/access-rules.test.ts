import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { startTestServer, type TestServer } from '../support/server';
import { TestClient } from '../support/client';
import { signedInClient } from '../support/factories';
import type { RegisteredRoute } from '../../server/lib/http';
import { hasRole, ROLES } from '../../shared/roles';

let server: TestServer;
let routes: RegisteredRoute[];

beforeAll(async () => {
  server = await startTestServer();
  routes = server.app.locals.routeRegistry as RegisteredRoute[];
});
afterAll(() => server.close());

/** Fills route parameters with plausible values so the request reaches the access check. */
const concrete = (path: string) =>
  path.replace(/:(\w+)/g, (_m, name: string) => (/token|key/i.test(name) ? 'x'.repeat(43) : /code/i.test(name) ? 'NOPE' : '1'));

/** Counts route handlers Express really has, including nested routers. */
function countExpressRoutes(app: Express): number {
  let count = 0;
  const walk = (stack: any[]) => {
    for (const layer of stack) {
      if (layer.route) count += Object.keys(layer.route.methods).filter((m) => m !== '_all').length;
      else if (layer.handle?.stack) walk(layer.handle.stack);
    }
  };
  walk((app as any).router.stack);
  return count;
}

describe('access rules', () => {
  it('when the app is built, then every API route was declared with an access rule (none mounted around the registry)', () => {
    expect(routes.length).toBeGreaterThan(5);
    // Only the client's catch-all (absent in API-only tests) may exist outside the registry.
    expect(countExpressRoutes(server.app)).toBe(routes.length);
    for (const r of routes) expect(['public', 'display', 'tool', 'webhook', ...ROLES]).toContain(r.access);
  });

  it('when nobody is signed in, then every route that is not public answers 401', async () => {
    const anonymous = new TestClient(server.url);
    await anonymous.refreshCsrf(); // so that CSRF is not what refuses the call
    const checked: string[] = [];
    for (const r of routes.filter((x) => x.access !== 'public')) {
      const res = await anonymous.request(r.method.toUpperCase(), `/api${concrete(r.path)}`);
      expect(res.status, `${r.method} ${r.path}`).toBe(401);
      checked.push(`${r.method} ${r.path}`);
    }
    expect(checked.length).toBeGreaterThan(0);
  });

  it('when a member calls a route that needs a higher role, then 403', async () => {
    const { client } = await signedInClient(server.url, 'member');
    const staffOnly = routes.filter(
      (r) =>
        r.access !== 'public' && r.access !== 'display' && r.access !== 'tool' && r.access !== 'webhook' && !hasRole('member', r.access),
    );
    expect(staffOnly.length).toBeGreaterThan(0);
    for (const r of staffOnly) {
      const res = await client.request(r.method.toUpperCase(), `/api${concrete(r.path)}`);
      expect(res.status, `${r.method} ${r.path}`).toBe(403);
    }
  });

  it('when a technician calls an admin route, then 403', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    expect((await client.get('/api/users')).status).toBe(403);
    expect((await client.get('/api/mail')).status).toBe(403);
  });
});
