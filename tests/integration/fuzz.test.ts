import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, drainOutbox, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { schemaObjects, type FieldKind } from '../support/schema-walk';
import type { TestClient } from '../support/client';
import type { RegisteredRoute } from '../../server/lib/http';

// Property: whatever an admin (who passes every access rule) sends to any route, the server
// answers below 500. Inputs are generated from each route's own schema (its field names and
// kinds) mixed with hostile values: inherited key names, lone surrogates, dates outside what
// the database stores, huge and odd numbers, wrong JSON types and odd path segments.
// A fixed seed keeps runs repeatable; a failure prints the shrunk input to replay.

const SEED = 20261202;
// About 1,000 requests in all: under a minute on a small, shared two-core machine.
const RUNS_PER_ROUTE = 18;
// Routes that would end the fuzzing client's own session rather than test an input.
const SKIP = new Set(['delete /session']);

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await drainOutbox(server);
  await server.close();
});

const nastyKey = fc.constantFrom('constructor', '__proto__', 'toString', 'valueOf', 'hasOwnProperty', '__defineGetter__', '', 'a.b', '0');
const loneSurrogate = fc.constantFrom('\uD800', 'x\uDBFFy', '\uDC00abc', 'ok\uD83D', '\uDFFF\uD800');
const text = fc.oneof(
  fc.string({ maxLength: 30 }),
  fc.string({ unit: 'binary', maxLength: 30 }),
  loneSurrogate,
  fc.constant('a'.repeat(5000)),
  fc.constantFrom('ETCH-02', 'PM1', 'x@test.faultline.test'),
);
const instant = fc.oneof(
  fc.date({ min: new Date(-8.64e15), max: new Date(8.64e15), noInvalidDate: true }).map((d) => d.toISOString()),
  fc.constantFrom(
    '9999-12-31T23:30:00-01:00',
    '0001-01-01T00:00:00Z',
    '2024-02-30T00:00:00Z',
    '2030-01-01T00:00:00+14:00',
    '2030-01-01',
    'now',
  ),
);
const number = fc.oneof(fc.integer(), fc.integer({ min: -3, max: 50 }), fc.double(), fc.constantFrom(0, -1, 2 ** 31, 2 ** 53, 1e308, -0));
const anyJson = fc.jsonValue({ maxDepth: 2 });

function valueFor(kind: FieldKind): fc.Arbitrary<unknown> {
  const typed: Record<FieldKind, fc.Arbitrary<unknown>> = {
    text,
    instant,
    number,
    boolean: fc.boolean(),
    enum: text,
    array: fc.array(fc.oneof(text, number), { maxLength: 4 }),
    object: fc.object({ maxDepth: 1 }),
    other: anyJson,
  };
  return fc.oneof({ weight: 4, arbitrary: typed[kind] }, { weight: 1, arbitrary: anyJson }, { weight: 1, arbitrary: fc.constant(null) });
}

/** Adds an own property (also for `__proto__`, which an object literal would treat as the prototype). */
function withKey(target: Record<string, unknown>, key: string, value: unknown) {
  Object.defineProperty(target, key, { value, enumerable: true, configurable: true, writable: true });
  return target;
}

function objectsFor(part: RegisteredRoute['schemas']['body']) {
  return schemaObjects(part).map(({ fields, literals }) =>
    fc
      .tuple(
        fc.record(Object.fromEntries(Object.entries(fields).map(([k, kind]) => [k, valueFor(kind)])), { requiredKeys: [] }),
        fc.boolean(),
        fc.option(fc.tuple(nastyKey, anyJson), { freq: 3 }),
      )
      .map(([record, keepLiterals, extra]) => {
        const body: Record<string, unknown> = { ...record, ...(keepLiterals ? literals : {}) };
        return extra ? withKey(body, extra[0], extra[1]) : body;
      }),
  );
}

const bodyFor = (r: RegisteredRoute) =>
  fc.oneof({ weight: 6, arbitrary: fc.oneof(...objectsFor(r.schemas.body), fc.constant({})) }, { weight: 1, arbitrary: anyJson });

function queryFor(r: RegisteredRoute): fc.Arbitrary<[string, string][]> {
  const keys = schemaObjects(r.schemas.query).flatMap((o) => Object.entries(o.fields));
  const pair = keys.length
    ? fc.oneof(
        fc
          .constantFrom(...keys)
          .chain(([k, kind]) => valueFor(kind).map((v) => [k, typeof v === 'string' ? v : JSON.stringify(v)] as [string, string])),
        fc.tuple(nastyKey, fc.string({ maxLength: 10 })),
      )
    : fc.tuple(nastyKey, fc.string({ maxLength: 10 }));
  return fc.array(pair, { maxLength: 6 });
}

const segment = fc.oneof(
  fc.constantFrom('2147480000', '0', '-1', '1.5', '1e3', '99999999999999999999', 'NaN', '%00', 'ETCH-02', 'x'.repeat(43)),
  fc.string({ maxLength: 12 }).map(encodeURIComponent),
);

/** Path parameters: mostly an id no row has (so nothing real is changed), sometimes garbage. */
const pathFor = (r: RegisteredRoute) =>
  fc
    .array(fc.oneof({ weight: 3, arbitrary: fc.constant('2147480000') }, { weight: 2, arbitrary: segment }), { minLength: 4, maxLength: 4 })
    .map((values) => {
      let i = 0;
      return r.path.replace(/:(\w+)/g, (_m, name: string) =>
        /token/i.test(name) && i === 0 ? (i++, 'x'.repeat(43)) : values[i++ % values.length],
      );
    });

describe('fuzzing every route', () => {
  it('when any route gets inputs generated from its schema mixed with hostile values, then it never answers 5xx', async () => {
    const routes = (server.app.locals.routeRegistry as RegisteredRoute[]).filter((r) => !SKIP.has(`${r.method} ${r.path}`));
    expect(routes.length).toBeGreaterThan(40);
    const failures: string[] = [];
    let sent = 0;
    for (const [index, r] of routes.entries()) {
      // A fresh admin per route: a route that changes the account (or a rate limit) cannot starve the others.
      const { client }: { client: TestClient } = await signedInClient(server.url, 'admin');
      const arbitrary = fc.record({ path: pathFor(r), query: queryFor(r), body: r.method === 'get' ? fc.constant(undefined) : bodyFor(r) });
      const result = await fc.check(
        fc.asyncProperty(arbitrary, async (input) => {
          const qs = new URLSearchParams(input.query).toString();
          const res = await client.request(r.method.toUpperCase(), `/api${input.path}${qs ? `?${qs}` : ''}`, input.body);
          sent++;
          return res.status < 500;
        }),
        { seed: SEED + index, numRuns: RUNS_PER_ROUTE, endOnFailure: false, maxSkipsPerRun: 0 },
      );
      if (result.failed) failures.push(`${r.method} ${r.path}: ${fc.stringify(result.counterexample)}`);
    }
    expect(failures).toEqual([]);
    expect(sent).toBeGreaterThanOrEqual(routes.length * RUNS_PER_ROUTE);
  }, 180_000);
});
