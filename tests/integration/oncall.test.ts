import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { SmsFake } from '../../server/lib/sms-fake';
import { runEscalationPass } from '../../server/modules/oncall/escalation.service';
import { OncallCover, OncallEscalation, OncallPolicy, SmsInbound, SmsOutbox } from '../../server/modules/oncall/oncall.model';
import { TicketEvent, Ticket } from '../../server/modules/tickets/ticket.model';
import { createTool, fileReport } from './tickets-fixtures';
import { localMinutes } from '../../shared/oncall';
import type { User } from '../../server/modules/users/user.model';

// Acceptance for issue 14 points 1–2: pages by SMS through the provider's SDK to the local fake,
// escalation driven by runEscalationPass with a clock (no sleeping), replies through the fake's
// signed webhook, and the text outbox surviving a provider outage.

let server: TestServer;
let fake: SmsFake;
let admin: TestClient;
const coverIds: number[] = [];

const phone = () => `+1555${String(crypto.randomInt(1_000_000, 9_999_999))}`;
const MINUTE = 60_000;
const hhmm = (m: number) =>
  `${String(Math.floor((((m % 1440) + 1440) % 1440) / 60)).padStart(2, '0')}:${String(((m % 60) + 60) % 60).padStart(2, '0')}`;

beforeAll(async () => {
  fake = new SmsFake(0);
  await fake.start();
  server = await startTestServer({}, { smsFake: fake });
  ({ client: admin } = await signedInClient(server.url, 'admin'));
});

afterAll(async () => {
  // The test database outlives this run: leave no cover or policy that would page later runs' people.
  await OncallCover.destroy({ where: { id: coverIds } });
  await OncallPolicy.destroy({ where: {} });
  await server.smsWorker?.stop();
  for (let i = 0; i < 20 && ((await server.smsWorker?.runOnce()) ?? 0) > 0; i++);
  await server.worker.stop();
  for (let i = 0; i < 50 && (await server.worker.runOnce()) > 0; i++);
  await server.close();
  await fake.stop();
});

/** A rota for now: an on-call person, a backup and a manager, each with a pager number. */
async function rotaNow(stepMinutes = 1) {
  const people: Record<'onCall' | 'backup' | 'manager', User & { phone: string }> = {} as never;
  for (const [key, role] of [
    ['onCall', 'technician'],
    ['backup', 'technician'],
    ['manager', 'manager'],
  ] as const) {
    const u = (await createUser(role, { name: `Oncall ${key} ${crypto.randomBytes(2).toString('hex')}` })) as User & { phone: string };
    u.phone = phone();
    expect((await admin.put(`/api/oncall/contacts/${u.id}`, { phone: u.phone })).status).toBe(204);
    people[key] = u;
  }
  // Covers win over the rota (the newest one): these hold for the next hours whatever else is in the table.
  const from = new Date(Date.now() - 60 * MINUTE).toISOString();
  const to = new Date(Date.now() + 4 * 60 * MINUTE).toISOString();
  for (const [duty, u] of [
    ['on_call', people.onCall],
    ['backup', people.backup],
  ] as const) {
    const r = await admin.post('/api/oncall/covers', { userId: u.id, duty, startsAt: from, endsAt: to, note: 'test cover' });
    expect(r.status).toBe(201);
    coverIds.push(r.body.id);
  }
  expect((await admin.put('/api/oncall/policies/hazard', { stepMinutes, managerId: people.manager.id })).status).toBe(200);
  return people;
}

/** Sets the P1 night window around (or away from) the current facility time. */
async function nightWindow(around: boolean, managerId: number | null = null) {
  const tz = (await admin.get('/api/oncall/rota')).body.timeZone as string;
  const m = localMinutes(new Date(), tz);
  const [a, b] = around ? [m - 60, m + 60] : [m + 120, m + 180];
  const r = await admin.put('/api/oncall/policies/p1', { stepMinutes: 1, managerId, nightStarts: hhmm(a), nightEnds: hhmm(b) });
  expect(r.status).toBe(200);
}

const textsTo = (number: string) => fake.texts.filter((t) => t.to === number && !t.repeat);

async function hazardReport() {
  const { tool } = await createTool(server.deps.sequelize);
  const { client: member } = await signedInClient(server.url, 'member');
  return fileReport(member, tool.id, { category: 'leak_smell', hazards: ['smell'], description: 'Sharp smell at the wet bench exhaust' });
}

describe('pages by SMS and escalation', () => {
  it('when a hazard is reported inside the night window, then the person on call is paged through the fake; with no answer the backup is paged after the delay; an SMS reply acknowledges, stops the escalation and the ticket says so', async () => {
    const people = await rotaNow(1);
    await nightWindow(true);
    const t = await hazardReport();

    await server.smsWorker!.runOnce();
    const first = await fake.waitFor((x) => x.to === people.onCall.phone && x.text.includes(`#${t.id}`));
    expect(first.idempotencyKey).toMatch(/^page-\d+$/);
    expect(first.text).toMatch(/Follow the facility's procedures/);
    expect(first.text).toMatch(/does not replace alarms or emergency response/);
    expect(first.text).toMatch(/\/page\/[A-Za-z0-9_-]{20,}/);
    expect(textsTo(people.backup.phone)).toHaveLength(0);
    // The page also goes by mail (second channel).
    await server.worker.runOnce();
    await server.catcher.waitFor(
      (m) => m.to.includes(people.onCall.email) && m.subject.startsWith('Page:') && m.subject.includes(`#${t.id}`),
    );

    // Inside the minute nothing moves; past it, the backup is paged.
    const now = Date.now();
    await runEscalationPass(server.deps, new Date(now + 30_000));
    await server.smsWorker!.runOnce();
    expect(textsTo(people.backup.phone)).toHaveLength(0);
    expect(await runEscalationPass(server.deps, new Date(now + 61_000))).toBeGreaterThanOrEqual(1);
    await server.smsWorker!.runOnce();
    const second = await fake.waitFor((x) => x.to === people.backup.phone && x.text.includes(`#${t.id}`));
    expect(second.text).toMatch(/Nobody answered the earlier page/);

    // The backup texts back through the fake, signed as the provider signs.
    const code = /reply (\d{4})/.exec(second.text)![1];
    expect(await fake.reply(second.id, `OK ${code} on my way`)).toBe(200);
    const esc = await OncallEscalation.findOne({ where: { ticketId: t.id } });
    expect(esc).toMatchObject({ status: 'acknowledged', acknowledgedBy: people.backup.id, acknowledgedVia: 'sms', openTicketId: null });
    const ticket = await Ticket.findByPk(t.id);
    expect(ticket!.status).toBe('acknowledged');
    const events = await TicketEvent.findAll({ where: { ticketId: t.id }, order: [['id', 'ASC']] });
    expect(events.find((e) => e.kind === 'page_acknowledged')).toMatchObject({ actorId: people.backup.id });

    // Stopped: no manager page however long we wait.
    await runEscalationPass(server.deps, new Date(now + 30 * MINUTE));
    await server.smsWorker!.runOnce();
    expect(textsTo(people.manager.phone).filter((x) => x.text.includes(`#${t.id}`))).toHaveLength(0);

    // The ticket's pages, for staff: both pages, who answered, how.
    const { client: tech } = await signedInClient(server.url, 'technician');
    const pages = await tech.get(`/api/tickets/${t.id}/pages`);
    expect(pages.status).toBe(200);
    expect(pages.body.escalations[0]).toMatchObject({
      severity: 'hazard',
      status: 'acknowledged',
      acknowledgedBy: { id: people.backup.id },
      acknowledgedVia: 'sms',
    });
    expect(pages.body.escalations[0].pages.map((p: { step: string }) => p.step)).toEqual(['on_call', 'backup']);
    // Members never see who was paged.
    const { client: member } = await signedInClient(server.url, 'member');
    expect((await member.get(`/api/tickets/${t.id}/pages`)).status).toBe(403);
  });

  it('when nobody answers the backup either, then the manager is paged, and after that the escalation is marked unanswered', async () => {
    const people = await rotaNow(2);
    const t = await hazardReport();
    const now = Date.now();
    await runEscalationPass(server.deps, new Date(now + 2 * MINUTE + 1000));
    await runEscalationPass(server.deps, new Date(now + 4 * MINUTE + 2000));
    await server.smsWorker!.runOnce();
    expect(textsTo(people.manager.phone).filter((x) => x.text.includes(`#${t.id}`))).toHaveLength(1);
    await runEscalationPass(server.deps, new Date(now + 6 * MINUTE + 3000));
    expect((await OncallEscalation.findOne({ where: { ticketId: t.id } }))!.status).toBe('unanswered');
  });

  it('when the webhook is unsigned, signed with another key, altered, or stale, then 401 and nothing changes', async () => {
    const people = await rotaNow(1);
    const t = await hazardReport();
    await server.smsWorker!.runOnce();
    const page = await fake.waitFor((x) => x.to === people.onCall.phone && x.text.includes(`#${t.id}`));
    const url = `${server.url}/api/oncall/sms/inbound`;
    const body = fake.inboundEvent(page.to, page.from, 'OK');
    const other = crypto.generateKeyPairSync('ed25519').privateKey;
    const inboundBefore = await SmsInbound.count();
    const eventsBefore = await TicketEvent.count({ where: { ticketId: t.id } });
    const attempts: Array<[string, Record<string, string>, string]> = [
      ['unsigned', {}, body],
      ['another key', fake.signedHeaders(body, other), body],
      ['altered body', fake.signedHeaders(body), body.replace('"OK"', '"OK!"')],
      ['stale', fake.signedHeaders(body, undefined, new Date(Date.now() - 10 * MINUTE)), body],
      ['garbage signature', { 'telnyx-signature-ed25519': 'not-base64', 'telnyx-timestamp': String(Math.floor(Date.now() / 1000)) }, body],
    ];
    for (const [what, headers, sent] of attempts) {
      const res = await fetch(url, { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body: sent });
      expect(res.status, what).toBe(401);
    }
    expect(await SmsInbound.count()).toBe(inboundBefore);
    expect(await TicketEvent.count({ where: { ticketId: t.id } })).toBe(eventsBefore);
    expect((await OncallEscalation.findOne({ where: { ticketId: t.id } }))!.status).toBe('open');

    // Signed but malformed: 400 with field messages, still nothing written.
    for (const bad of [
      '{"data":{}}',
      '"just a string"',
      '{"data":{"id":"x","event_type":"message.received","payload":{"from":{"phone_number":42}}}}',
    ]) {
      const res = await fetch(url, {
        method: 'POST',
        headers: { 'content-type': 'application/json', ...fake.signedHeaders(bad) },
        body: bad,
      });
      expect(res.status, bad).toBe(400);
    }
    expect(await SmsInbound.count()).toBe(inboundBefore);

    // The same event delivered twice (providers resend) counts once.
    const good = fake.inboundEvent(page.to, page.from, 'OK');
    for (let i = 0; i < 2; i++) {
      const res = await fetch(url, {
        method: 'POST',
        headers: { 'content-type': 'application/json', ...fake.signedHeaders(good) },
        body: good,
      });
      expect(res.status).toBe(200);
    }
    expect(await SmsInbound.count()).toBe(inboundBefore + 1);
    expect((await OncallEscalation.findOne({ where: { ticketId: t.id } }))!.status).toBe('acknowledged');
  });

  it('when the link in a page is opened, then it acknowledges once, signed out, and a second use is refused', async () => {
    const people = await rotaNow(1);
    const t = await hazardReport();
    await server.smsWorker!.runOnce();
    const page = await fake.waitFor((x) => x.to === people.onCall.phone && x.text.includes(`#${t.id}`));
    const token = /\/page\/([A-Za-z0-9_-]+)/.exec(page.text)![1];
    const anonymous = new TestClient(server.url);
    const first = await anonymous.post('/api/oncall/pages/acknowledge', { token });
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ ticketId: t.id, acknowledged: true });
    expect((await anonymous.post('/api/oncall/pages/acknowledge', { token })).status).toBe(410);
    const esc = await OncallEscalation.findOne({ where: { ticketId: t.id } });
    expect(esc).toMatchObject({ status: 'acknowledged', acknowledgedBy: people.onCall.id, acknowledgedVia: 'link' });
    expect(await TicketEvent.count({ where: { ticketId: t.id, kind: 'page_acknowledged' } })).toBe(1);
  });

  it('when the provider (the fake) is down, then pages wait in the outbox and go out once when it returns', async () => {
    const people = await rotaNow(1);
    await fake.stop();
    try {
      const t = await hazardReport();
      expect(await server.smsWorker!.runOnce()).toBe(0);
      const row = await SmsOutbox.findOne({ where: { toNumber: people.onCall.phone } });
      expect(row).toMatchObject({ status: 'pending' });
      expect(row!.attempts).toBeGreaterThanOrEqual(1);
      expect(row!.lastError).toBeTruthy();
      await fake.start();
      // The back-off would wait a few seconds; move the row's time instead of sleeping.
      await SmsOutbox.update({ nextAttemptAt: new Date() }, { where: { id: row!.id } });
      expect(await server.smsWorker!.runOnce()).toBeGreaterThanOrEqual(1);
      expect(await server.smsWorker!.runOnce()).toBe(0);
      expect(textsTo(people.onCall.phone).filter((x) => x.text.includes(`#${t.id}`))).toHaveLength(1);
      const sent = await SmsOutbox.findByPk(row!.id);
      expect(sent).toMatchObject({ status: 'sent' });
      expect(sent!.providerId).toBeTruthy();

      // A crash between sending and recording sends again: the same idempotency key, so the
      // provider folds it (the fake marks it a repeat and answers with the same message id).
      await SmsOutbox.update({ status: 'pending', nextAttemptAt: new Date() }, { where: { id: row!.id } });
      await server.smsWorker!.runOnce();
      const receipts = fake.texts.filter((x) => x.idempotencyKey === row!.idempotencyKey);
      expect(receipts).toHaveLength(2);
      expect(receipts.filter((x) => !x.repeat)).toHaveLength(1);
      expect(receipts[1].id).toBe(receipts[0].id);
    } finally {
      if (!fake.running) await fake.start();
    }
  });

  it('when a technician raises a ticket to P1, then the on-call person is paged inside the night window only', async () => {
    const people = await rotaNow(1);
    const { tool } = await createTool(server.deps.sequelize);
    const { client: member } = await signedInClient(server.url, 'member');
    const tech = new TestClient(server.url);
    await tech.signIn(people.backup.email, TEST_PASSWORD);

    await nightWindow(false);
    const day = await fileReport(member, tool.id, { description: 'Spin chuck vacuum fault during coat' });
    const v1 = (await tech.get(`/api/tickets/${day.id}`)).body.version;
    expect(
      (await tech.post(`/api/tickets/${day.id}/actions`, { action: 'set_priority', priority: 'P1', reason: 'Only coater', version: v1 }))
        .status,
    ).toBe(200);
    expect(await OncallEscalation.count({ where: { ticketId: day.id } })).toBe(0);

    await nightWindow(true);
    const night = await fileReport(member, tool.id, { description: 'Spin chuck vacuum fault again' });
    const v2 = (await tech.get(`/api/tickets/${night.id}`)).body.version;
    expect(
      (await tech.post(`/api/tickets/${night.id}/actions`, { action: 'set_priority', priority: 'P1', reason: 'Only coater', version: v2 }))
        .status,
    ).toBe(200);
    expect(await OncallEscalation.count({ where: { ticketId: night.id, severity: 'p1' } })).toBe(1);
    await server.smsWorker!.runOnce();
    await fake.waitFor((x) => x.to === people.onCall.phone && x.text.includes(`#${night.id}`));
  });

  it('when a shift repeats weekly and a cover is added, then the rota view shows the cover in its stretch and the shift the week after', async () => {
    const tech = await createUser('technician', { name: 'Weekly Rota Person' });
    const coverer = await createUser('technician', { name: 'Cover Rota Person' });
    // Far in the future so no other test's covers overlap.
    const start = new Date('2031-03-03T08:00:00Z');
    const s = await admin.post('/api/oncall/shifts', {
      userId: tech.id,
      duty: 'on_call',
      startsAt: start.toISOString(),
      endsAt: new Date(start.getTime() + 24 * 60 * MINUTE).toISOString(),
      weekly: true,
    });
    expect(s.status).toBe(201);
    const c = await admin.post('/api/oncall/covers', {
      userId: coverer.id,
      duty: 'on_call',
      startsAt: new Date(start.getTime() + 2 * 60 * MINUTE).toISOString(),
      endsAt: new Date(start.getTime() + 4 * 60 * MINUTE).toISOString(),
      note: 'swap',
    });
    coverIds.push(c.body.id);
    try {
      const view = await admin.get(`/api/oncall/rota?from=${encodeURIComponent(start.toISOString())}&days=8`);
      expect(view.status).toBe(200);
      const who = view.body.upcoming.map((x: { onCall: { name: string } | null }) => x.onCall?.name ?? null);
      expect(who.slice(0, 4)).toEqual(['Weekly Rota Person', 'Cover Rota Person', 'Weekly Rota Person', null]);
      expect(who[4]).toBe('Weekly Rota Person'); // the next week's turn
      // Bad input: an end before the start, a weekly shift longer than a week, a member.
      const bad = await admin.post('/api/oncall/shifts', {
        userId: tech.id,
        duty: 'backup',
        startsAt: start.toISOString(),
        endsAt: start.toISOString(),
      });
      expect(bad.status).toBe(400);
      expect(bad.body.error.fields.endsAt).toBeDefined();
      const member = await createUser('member');
      const m = await admin.post('/api/oncall/shifts', {
        userId: member.id,
        duty: 'backup',
        startsAt: start.toISOString(),
        endsAt: new Date(start.getTime() + MINUTE).toISOString(),
      });
      expect(m.status).toBe(400);
      expect(m.body.error.fields.userId).toBeDefined();
    } finally {
      await admin.delete(`/api/oncall/shifts/${s.body.id}`);
    }
  });
});
