import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import type { RegisteredRoute } from '../../server/lib/http';
import { concretePath, schemaObjects } from '../support/schema-walk';
import { LONE_SURROGATE_MESSAGE, INSTANT_RANGE_MESSAGE } from '../../shared/schemas/text';
import { createTool, reportBody } from './tickets-fixtures';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const concrete = concretePath;

// Keys every plain JavaScript object inherits; a map of field messages built from a plain
// object would find them already "set" (and `__proto__` would replace its prototype).
// (Two bodies only: the password-reset route's per-address limit allows few requests.)
const INHERITED_KEYS = [
  { constructor: 1, toString: 'x', valueOf: 2, hasOwnProperty: [], __defineGetter__: 'x', isPrototypeOf: null },
  JSON.parse('{"__proto__": {"polluted": true}}'),
];

/** Text with a lone high surrogate in the middle (long enough for any minimum length). */
const LONE_SURROGATE_TEXT = 'pump alarm \uD800 on the load lock';
/** Valid ISO instants the database's DATETIME(3) cannot hold, or that are plainly typos. */
const OUT_OF_RANGE_INSTANTS = ['9999-12-31T23:30:00.000-01:00', '0001-01-01T00:00:00Z', '1969-12-31T23:59:59Z', '2100-01-01T00:00:00Z'];

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
    // The ingest API (tool keys) has its own walk in alarms-ingest.test.ts; the signed SMS
    // webhook refuses unsigned bodies with 401 before reading them (its walk: oncall.test.ts).
    const routes = (server.app.locals.routeRegistry as RegisteredRoute[]).filter(
      (r) => r.hasBody && r.access !== 'tool' && r.access !== 'webhook',
    );
    expect(routes.length).toBeGreaterThan(2);
    const before = await rowCounts();
    for (const r of routes) {
      for (const body of [{ surpriseField: 'x' }, { email: 42, name: ['not', 'text'], password: {} }, 'just a string', ...INHERITED_KEYS]) {
        const res = await client.request(r.method.toUpperCase(), `/api${concrete(r.path)}`, body);
        expect(res.status, `${r.method} ${r.path} ${JSON.stringify(body)}`).toBe(400);
        expect(res.body.error.code).toMatch(/validation_failed|bad_request/);
        if (res.body.error.code === 'validation_failed') expect(Object.keys(res.body.error.fields ?? {}).length).toBeGreaterThan(0);
      }
    }
    expect(await rowCounts()).toEqual(before);
  });

  it('when any text field of any body holds a lone UTF-16 surrogate, then 400 naming that field, and nothing is written', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const routes = (server.app.locals.routeRegistry as RegisteredRoute[]).filter((r) => r.hasBody);
    const before = await rowCounts();
    let checked = 0;
    for (const r of routes) {
      for (const { fields, literals } of schemaObjects(r.schemas.body)) {
        const textFields = Object.keys(fields).filter((k) => fields[k] === 'text');
        if (textFields.length === 0) continue;
        const body = { ...literals, ...Object.fromEntries(textFields.map((k) => [k, LONE_SURROGATE_TEXT])) };
        const res = await client.request(r.method.toUpperCase(), `/api${concrete(r.path)}`, body);
        const where = `${r.method} ${r.path} ${JSON.stringify(literals)}`;
        expect(res.status, where).toBe(400);
        for (const k of textFields) expect(res.body.error.fields?.[k], `${where} ${k}`).toBeDefined();
        checked += textFields.length;
      }
    }
    expect(checked).toBeGreaterThan(20);
    expect(await rowCounts()).toEqual(before);
  });

  it('when a valid report carries a lone surrogate in its alarm text, then 400 says which field and why', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const res = await client.post(
      '/api/tickets',
      reportBody(tool.id, { alarmText: LONE_SURROGATE_TEXT, wafersCount: 2, wafersOwner: `lot \uDC00 owner` }),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields.alarmText).toContain(LONE_SURROGATE_MESSAGE);
    expect(res.body.error.fields.wafersOwner).toContain(LONE_SURROGATE_MESSAGE);
    // A well-formed pair (an emoji) is fine.
    const ok = await client.post('/api/tickets', reportBody(tool.id, { alarmText: 'alarm 42 \u{1F525}' }));
    expect(ok.status).toBe(201);
  });

  it('when any date in any body or query lies outside 2000–2099 (or past what the database stores), then 400 naming that field, and nothing is written', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const routes = server.app.locals.routeRegistry as RegisteredRoute[];
    const before = await rowCounts();
    let checked = 0;
    for (const r of routes) {
      for (const part of ['body', 'query'] as const) {
        for (const { fields, literals } of schemaObjects(r.schemas[part])) {
          const instants = Object.keys(fields).filter((k) => fields[k] === 'instant');
          for (const k of instants) {
            for (const value of OUT_OF_RANGE_INSTANTS) {
              const where = `${r.method} ${r.path} ${JSON.stringify(literals)} ${k}=${value}`;
              let res;
              if (part === 'body') {
                res = await client.request(r.method.toUpperCase(), `/api${concrete(r.path)}`, { ...literals, [k]: value });
              } else {
                // The other instant of a period gets a sane value, so only this one is at fault.
                const others = Object.fromEntries(instants.filter((o) => o !== k).map((o) => [o, '2030-01-01T00:00:00Z']));
                res = await client.get(`/api${concrete(r.path)}?${new URLSearchParams({ ...others, [k]: value })}`);
              }
              expect(res.status, where).toBe(400);
              const key = part === 'body' ? k : `query.${k}`;
              expect(res.body.error.fields?.[key], where).toContain(INSTANT_RANGE_MESSAGE);
              checked++;
            }
          }
        }
      }
    }
    // set-state of a tool, set_state of a ticket, and the analytics periods at least.
    expect(checked).toBeGreaterThanOrEqual(5 * OUT_OF_RANGE_INSTANTS.length);
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
