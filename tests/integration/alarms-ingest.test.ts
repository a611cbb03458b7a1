import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestServer, type TestServer } from '../support/server';
import { alarmEvent, ingest, toolWithKey } from './alarms-fixtures';
import { AlarmOccurrence, CounterReading } from '../../server/modules/alarms/alarms.model';
import { counterReadingsSince, latestCounter, usageSince } from '../../server/modules/alarms/counters.service';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer({}, { outboxWorker: false });
});
afterAll(() => server.close());

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000);

async function eventCount(toolId: number, on: TestServer = server) {
  const [row] = await on.deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM alarm_events WHERE tool_id = :toolId`, {
    replacements: { toolId },
    type: QueryTypes.SELECT,
  });
  return Number(row.n);
}

describe('ingest: keys', () => {
  it('when a key is unknown, missing or revoked, then 401 and nothing is stored', async () => {
    const { tool, key, keyId, admin } = await toolWithKey(server);
    const body = { events: [alarmEvent(1, true, minutesAgo(1))] };
    expect((await ingest(server, 'flt_' + 'x'.repeat(43), 'alarms', body)).status).toBe(401);
    expect((await ingest(server, null, 'alarms', body)).status).toBe(401);
    expect((await ingest(server, key, 'alarms', body)).status).toBe(202);
    expect((await admin.post(`/api/tool-keys/${keyId}/revoke`)).status).toBe(200);
    const after = await ingest(server, key, 'alarms', { events: [alarmEvent(2, true, minutesAgo(1))] });
    expect(after.status).toBe(401);
    expect(await eventCount(tool.id)).toBe(1);
  });

  it('when keys are listed, then only hints are shown, never the key or its hash', async () => {
    const { tool, key, admin } = await toolWithKey(server);
    const list = await admin.get(`/api/tools/${tool.code}/keys`);
    expect(list.status).toBe(200);
    expect(list.text).not.toContain(key);
    expect(list.text).not.toMatch(/[0-9a-f]{64}/);
    expect(list.body.items[0].hint).toBe(key.slice(0, 10));
  });

  it('when a key of tool A posts, then the events land on A only, and A’s key reaches no other route', async () => {
    const a = await toolWithKey(server, { modules: ['PM1'] });
    const b = await toolWithKey(server, { modules: ['PM9'] });
    // B's module code is unknown on A: the key decides the tool, the body cannot pick another.
    const wrong = await ingest(server, a.key, 'alarms', { events: [alarmEvent(7, true, minutesAgo(1), { module: 'PM9' })] });
    expect(wrong.status).toBe(400);
    expect((await ingest(server, a.key, 'alarms', { events: [alarmEvent(7, true, minutesAgo(1), { toolId: b.tool.id })] })).status).toBe(
      400,
    );
    expect((await ingest(server, a.key, 'alarms', { events: [alarmEvent(7, true, minutesAgo(1), { module: 'PM1' })] })).status).toBe(202);
    expect(await eventCount(a.tool.id)).toBe(1);
    expect(await eventCount(b.tool.id)).toBe(0);
    for (const [method, path] of [
      ['GET', '/api/board'],
      ['GET', '/api/tickets'],
      ['GET', `/api/tools/${a.tool.code}/keys`],
      ['GET', `/api/tools/${a.tool.code}/alarms`],
      ['POST', '/api/tickets'],
    ]) {
      const res = await fetch(`${server.url}${path}`, {
        method,
        headers: { authorization: `Bearer ${a.key}`, 'content-type': 'application/json' },
        body: method === 'POST' ? '{}' : undefined,
      });
      expect([401, 403], `${method} ${path}`).toContain(res.status);
    }
  });
});

describe('ingest: alarms', () => {
  it('when the same event id is sent twice, then it is counted once', async () => {
    const { tool, key } = await toolWithKey(server);
    const e = alarmEvent(11, true, minutesAgo(2));
    expect((await ingest(server, key, 'alarms', { events: [e] })).body).toEqual({ accepted: 1, duplicates: 0 });
    expect((await ingest(server, key, 'alarms', { events: [e, e] })).body).toEqual({ accepted: 0, duplicates: 2 });
    expect(await eventCount(tool.id)).toBe(1);
    expect(await AlarmOccurrence.count({ where: { toolId: tool.id } })).toBe(1);
  });

  it('when 500 events come in one request, then all are stored; 501 is refused and nothing stored', async () => {
    const { tool, key } = await toolWithKey(server);
    const start = minutesAgo(600).getTime();
    const many = Array.from({ length: 501 }, (_, i) => alarmEvent(100 + (i % 50), i % 2 === 0, new Date(start + i * 1000)));
    const refused = await ingest(server, key, 'alarms', { events: many });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields).toHaveProperty('events');
    expect(await eventCount(tool.id)).toBe(0);
    const ok = await ingest(server, key, 'alarms', { events: many.slice(0, 500) });
    expect(ok.status).toBe(202);
    expect(ok.body).toEqual({ accepted: 500, duplicates: 0 });
    expect(await eventCount(tool.id)).toBe(500);
  });

  it('when events arrive out of order and late, then the set/clear intervals follow the event times', async () => {
    const { tool, key } = await toolWithKey(server);
    const t0 = minutesAgo(120).getTime();
    const at = (s: number) => new Date(t0 + s * 1000);
    // In time: set 0, clear 10, set 20, clear 30, set 40 (still set).
    const ordered = [
      alarmEvent('PUMP-7', true, at(0)),
      alarmEvent('PUMP-7', false, at(10)),
      alarmEvent('PUMP-7', true, at(20)),
      alarmEvent('PUMP-7', false, at(30)),
      alarmEvent('PUMP-7', true, at(40)),
    ];
    // Sent: the later half first, then the rest reversed, in three requests.
    await ingest(server, key, 'alarms', { events: [ordered[3], ordered[4]] });
    await ingest(server, key, 'alarms', { events: [ordered[1]] });
    await ingest(server, key, 'alarms', { events: [ordered[2], ordered[0]] });
    const rows = await AlarmOccurrence.findAll({ where: { toolId: tool.id }, order: [['setAt', 'ASC']] });
    expect(rows.map((r) => [r.setAt.getTime() - t0, r.clearedAt ? r.clearedAt.getTime() - t0 : null])).toEqual([
      [0, 10_000],
      [20_000, 30_000],
      [40_000, null],
    ]);
  });

  it('when alcd is given, then bit 8 sets or clears and bits 1–7 give the category', async () => {
    const { tool, key } = await toolWithKey(server);
    const t = minutesAgo(90).getTime();
    const r = await ingest(server, key, 'alarms', {
      events: [
        { id: 'a1', alarmId: 4001, alcd: 0x86, text: 'Door open', at: new Date(t).toISOString() },
        { id: 'a2', alarmId: 4001, alcd: 0x06, text: 'Door open', at: new Date(t + 5000).toISOString() },
      ],
    });
    expect(r.status).toBe(202);
    const [row] = await AlarmOccurrence.findAll({ where: { toolId: tool.id } });
    expect(row.clearedAt!.getTime() - row.setAt.getTime()).toBe(5000);
    const [def] = await server.deps.sequelize.query<{ category: number }>(`SELECT category FROM alarm_definitions WHERE tool_id = :id`, {
      replacements: { id: tool.id },
      type: QueryTypes.SELECT,
    });
    expect(Number(def.category)).toBe(6);
  });

  it('when any field of an event is bad, then 400 names the field and nothing is stored (walk over the schema)', async () => {
    const { tool, key } = await toolWithKey(server, { modules: ['PM1'] });
    const good = () => alarmEvent(5, true, minutesAgo(1));
    const cases: [string, Record<string, unknown>, string][] = [
      ['id missing', { id: undefined }, 'events.0.id'],
      ['id empty', { id: '' }, 'events.0.id'],
      ['id too long', { id: 'x'.repeat(101) }, 'events.0.id'],
      ['alarmId missing', { alarmId: undefined }, 'events.0.alarmId'],
      ['alarmId negative', { alarmId: -1 }, 'events.0.alarmId'],
      ['alarmId fraction', { alarmId: 1.5 }, 'events.0.alarmId'],
      ['alarmId too long', { alarmId: 'x'.repeat(65) }, 'events.0.alarmId'],
      ['alarmId object', { alarmId: { a: 1 } }, 'events.0.alarmId'],
      ['alcd too big', { set: undefined, alcd: 256 }, 'events.0.alcd'],
      ['alcd text', { set: undefined, alcd: '0x81' }, 'events.0.alcd'],
      ['alcd and set', { alcd: 0x81 }, 'events.0.set'],
      ['neither alcd nor set', { set: undefined }, 'events.0.set'],
      ['set text', { set: 'yes' }, 'events.0.set'],
      ['category 0', { category: 0 }, 'events.0.category'],
      ['category 9', { category: 9 }, 'events.0.category'],
      ['category with alcd', { set: undefined, alcd: 0x81, category: 1 }, 'events.0.category'],
      ['text too long', { text: 'x'.repeat(501) }, 'events.0.text'],
      ['text number', { text: 42 }, 'events.0.text'],
      ['at missing', { at: undefined }, 'events.0.at'],
      ['at no zone', { at: '2026-03-01T09:12:00' }, 'events.0.at'],
      ['at nonsense', { at: 'yesterday' }, 'events.0.at'],
      ['at far future', { at: new Date(Date.now() + 86_400_000).toISOString() }, 'events.0.at'],
      ['module unknown', { module: 'NOPE' }, 'events.0.module'],
      ['module too long', { module: 'X'.repeat(33) }, 'events.0.module'],
      ['unknown field', { colour: 'red' }, 'events.0.colour'],
    ];
    for (const [name, change, field] of cases) {
      const e: Record<string, unknown> = { ...good(), ...change };
      for (const k of Object.keys(change)) if (change[k] === undefined) delete e[k];
      const r = await ingest(server, key, 'alarms', { events: [e] });
      expect(r.status, name).toBe(400);
      expect(Object.keys(r.body.error.fields ?? {}), name).toContain(field);
    }
    for (const [name, body] of [
      ['no events', { events: [] }],
      ['events not a list', { events: 'x' }],
      ['extra top-level field', { events: [good()], toolId: 1 }],
      ['not JSON', 'not json'],
      ['a list', [good()]],
    ] as const) {
      const r = await ingest(server, key, 'alarms', body);
      expect(r.status, name).toBe(400);
    }
    const unknownModule = await ingest(server, key, 'alarms', {
      events: [alarmEvent(5, true, minutesAgo(1), { module: 'PM1' }), alarmEvent(5, true, minutesAgo(1), { module: 'CH-X' })],
    });
    expect(unknownModule.body.error.message).toContain('CH-X');
    expect(await eventCount(tool.id)).toBe(0);
  });

  it('when the OpenAPI document is fetched, then it is 3.1, generated from the schemas, and covers every field the walk checks', async () => {
    const res = await fetch(`${server.url}/api/ingest/v1/openapi.json`);
    expect(res.status).toBe(200);
    const doc = await res.json();
    expect(doc.openapi).toBe('3.1.0');
    const event = doc.paths['/alarms'].post.requestBody.content['application/json'].schema.properties.events.items;
    expect(Object.keys(event.properties).sort()).toEqual(['alarmId', 'alcd', 'at', 'category', 'id', 'module', 'set', 'text']);
    expect(event.properties.text.maxLength).toBe(500);
    expect(doc.paths['/alarms'].post.requestBody.content['application/json'].schema.properties.events.maxItems).toBe(500);
    const reading = doc.paths['/counters'].post.requestBody.content['application/json'].schema.properties.readings.items;
    expect(Object.keys(reading.properties).sort()).toEqual(['at', 'counter', 'id', 'value']);
  });
});

describe('ingest: counters', () => {
  it('when readings come (out of order, with a reset and a repeat), then the reset is marked and the service functions read them', async () => {
    const { tool, key } = await toolWithKey(server);
    const t0 = minutesAgo(300).getTime();
    const at = (m: number) => new Date(t0 + m * 60_000).toISOString();
    const r1 = await ingest(server, key, 'counters', {
      readings: [
        { id: 'c3', counter: 'wafers', value: 5, at: at(30) },
        { id: 'c1', counter: 'wafers', value: 100, at: at(0) },
      ],
    });
    expect(r1.body).toEqual({ accepted: 2, duplicates: 0 });
    const r2 = await ingest(server, key, 'counters', {
      readings: [
        { id: 'c2', counter: 'wafers', value: 140, at: at(10) },
        { id: 'c1', counter: 'wafers', value: 100, at: at(0) },
        { id: 'h1', counter: 'run_hours', value: 12.5, at: at(10) },
      ],
    });
    expect(r2.body).toEqual({ accepted: 2, duplicates: 1 });
    const rows = await CounterReading.findAll({ where: { toolId: tool.id, counter: 'wafers' }, order: [['at', 'ASC']] });
    expect(rows.map((r) => [r.value, r.isReset])).toEqual([
      [100, false],
      [140, false],
      [5, true],
    ]);
    expect(await latestCounter(tool.id, 'wafers')).toMatchObject({ value: 5, isReset: true });
    expect((await counterReadingsSince(tool.id, 'wafers', new Date(t0 + 5 * 60_000))).map((p) => p.value)).toEqual([140, 5]);
    // 100 → 140 is 40 wafers; the reset to 5 adds 5 more (never negative use).
    expect(await usageSince(server.deps, tool.id, 'wafers', new Date(t0))).toBe(45);
  });

  it('when a reading is bad, then 400 names the field and nothing is stored', async () => {
    const { tool, key } = await toolWithKey(server);
    const good = { id: 'r1', counter: 'wafers', value: 1, at: minutesAgo(1).toISOString() };
    for (const [change, field] of [
      [{ counter: 'Wafers Count' }, 'readings.0.counter'],
      [{ value: -1 }, 'readings.0.value'],
      [{ value: '12' }, 'readings.0.value'],
      [{ at: 'noon' }, 'readings.0.at'],
      [{ id: '' }, 'readings.0.id'],
      [{ extra: 1 }, 'readings.0.extra'],
    ] as const) {
      const r = await ingest(server, key, 'counters', { readings: [{ ...good, ...change }] });
      expect(r.status).toBe(400);
      expect(Object.keys(r.body.error.fields)).toContain(field);
    }
    expect(await CounterReading.count({ where: { toolId: tool.id } })).toBe(0);
  });
});

describe('ingest: rate limit per key', () => {
  // A server with a small per-key limit, so the test need not send hundreds of requests.
  const KEY_LIMIT = 30;
  let limited: TestServer;
  beforeAll(async () => {
    limited = await startTestServer({ INGEST_REQUESTS_PER_KEY_PER_MINUTE: String(KEY_LIMIT) }, { outboxWorker: false });
  });
  afterAll(() => limited.close());

  it('when one key sends more than its limit within the window, then that key gets 429 with Retry-After, and another key of the same tool still gets through', async () => {
    const { tool, key, admin } = await toolWithKey(limited);
    const second = await admin.post(`/api/tools/${tool.code}/keys`, { label: 'second host PC' });
    expect(second.status).toBe(201);
    // Empty batches are refused (400) after the key check, so they spend the key's budget
    // without storing anything; sent in parallel batches to stay quick.
    const statuses: number[] = [];
    for (let sent = 0; sent < KEY_LIMIT; sent += 10) {
      const batch = Array.from({ length: Math.min(10, KEY_LIMIT - sent) }, () => ingest(limited, key, 'alarms', { events: [] }));
      statuses.push(...(await Promise.all(batch)).map((r) => r.status));
    }
    expect(statuses.filter((s) => s === 429)).toHaveLength(0);
    const over = await fetch(`${limited.url}/api/ingest/v1/alarms`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
      body: JSON.stringify({ events: [alarmEvent(3, true, minutesAgo(1))] }),
    });
    expect(over.status).toBe(429);
    expect(Number(over.headers.get('retry-after'))).toBeGreaterThan(0);
    expect(await eventCount(tool.id, limited)).toBe(0);
    // The limit is per key: the tool's other key is not held back.
    expect((await ingest(limited, second.body.key, 'alarms', { events: [alarmEvent(3, true, minutesAgo(1))] })).status).toBe(202);
    expect(await eventCount(tool.id, limited)).toBe(1);
  });
});
