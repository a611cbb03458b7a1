import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import type http from 'node:http';
import https from 'node:https';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { decrypt } from 'http_ece';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import { makeTool } from './facility-fixtures';
import { drainOutbox, fileReport } from './tickets-fixtures';
import { PushOutbox, PushSubscription } from '../../server/modules/push/push.model';
import type { TestClient } from '../support/client';

// A local push endpoint standing in for a browser's push service: it records what arrives and
// answers with the status a test asks for. Each "browser" has its own key pair and auth secret,
// as a real one does, so the test can decrypt the payload (RFC 8291, aes128gcm).

interface Delivery {
  path: string;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
}
let endpoint: https.Server;
let certDir: string;
let endpointUrl: string;
const deliveries: Delivery[] = [];
const answer = new Map<string, number>();

let server: TestServer;

beforeAll(async () => {
  // Push services speak https only: the fake gets a throw-away certificate that the server is told to trust.
  certDir = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-push-'));
  execFileSync(
    'openssl',
    [
      'req',
      '-x509',
      '-newkey',
      'ec',
      '-pkeyopt',
      'ec_paramgen_curve:prime256v1',
      '-nodes',
      '-days',
      '1',
      '-subj',
      '/CN=127.0.0.1',
      '-addext',
      'subjectAltName=IP:127.0.0.1',
      '-keyout',
      path.join(certDir, 'key.pem'),
      '-out',
      path.join(certDir, 'cert.pem'),
    ],
    { stdio: 'ignore' },
  );
  const tlsOptions = { key: fs.readFileSync(path.join(certDir, 'key.pem')), cert: fs.readFileSync(path.join(certDir, 'cert.pem')) };
  endpoint = https.createServer(tlsOptions, (req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      deliveries.push({ path: req.url ?? '', headers: req.headers, body: Buffer.concat(chunks) });
      res.writeHead(answer.get(req.url ?? '') ?? 201).end();
    });
  });
  await new Promise<void>((resolve) => endpoint.listen(0, '127.0.0.1', () => resolve()));
  endpointUrl = `https://127.0.0.1:${(endpoint.address() as AddressInfo).port}`;
  server = await startTestServer({ PUSH_CA_FILE: path.join(certDir, 'cert.pem') }, { outboxWorker: false });
});
afterAll(async () => {
  await drainOutbox(server);
  await server.close();
  endpoint.closeAllConnections();
  await new Promise<void>((resolve) => endpoint.close(() => resolve()));
  fs.rmSync(certDir, { recursive: true, force: true });
});

function fakeBrowser() {
  const ecdh = crypto.createECDH('prime256v1');
  ecdh.generateKeys();
  const authSecret = crypto.randomBytes(16);
  const path = `/push/${unique('sub')}`;
  return {
    path,
    subscription: {
      endpoint: `${endpointUrl}${path}`,
      expirationTime: null,
      keys: { p256dh: ecdh.getPublicKey('base64url'), auth: authSecret.toString('base64url') },
    },
    read: (d: Delivery) =>
      JSON.parse(decrypt(d.body, { version: 'aes128gcm', privateKey: ecdh, authSecret }).toString('utf8')) as {
        title: string;
        body: string;
        link: string;
      },
  };
}

const deliveredTo = (path: string) => deliveries.filter((d) => d.path === path);

async function subscribe(client: TestClient, browser: ReturnType<typeof fakeBrowser>) {
  const r = await client.post('/api/push/subscriptions', browser.subscription);
  expect(r.status).toBe(200);
  return r.body as { publicKey: string; subscriptions: number };
}

describe('web push', () => {
  it('when a subscribed follower’s tool goes Down and comes back, then only "back" arrives as a push, signed with our key, and it decrypts to the tool’s message', async () => {
    const member = await signedInClient(server.url, 'member');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize, { name: 'Push test aligner' });
    const browser = fakeBrowser();
    const status = await subscribe(member.client, browser);
    expect(status.subscriptions).toBe(1);
    expect((await member.client.put(`/api/tools/${tool.id}/follow`)).status).toBe(200);

    const down = await tech.client.post(`/api/tools/${tool.id}/state`, {
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Lamp house fault',
    });
    expect(down.status).toBe(201);
    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(0);

    const back = await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'standby', reason: 'none' });
    expect(back.status).toBe(201);
    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(1);
    const [delivery] = deliveredTo(browser.path);
    expect(delivery.headers['content-encoding']).toBe('aes128gcm');
    expect(delivery.headers.authorization).toContain(`k=${status.publicKey}`);
    const message = browser.read(delivery);
    expect(message.title).toBe(`Push test aligner (${tool.code}) is now Running`);
    expect(message.link).toBe(`/tools/${tool.code}`);
    // Sent once: a second pass sends it no more.
    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(1);
  });

  it('when a reporter’s ticket is marked fixed, then their subscribed phone gets "fixed" as a push', async () => {
    const reporter = await signedInClient(server.url, 'member');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const browser = fakeBrowser();
    await subscribe(reporter.client, browser);
    const ticket = await fileReport(reporter.client, tool.id);
    const act = async (body: Record<string, unknown>) => {
      const current = await tech.client.get(`/api/tickets/${ticket.id}`);
      return tech.client.post(`/api/tickets/${ticket.id}/actions`, { version: current.body.version, ...body });
    };
    expect((await act({ action: 'acknowledge' })).status).toBe(200);
    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(0);
    expect((await act({ action: 'fix', fixKind: 'assist', workDone: 'Freed the wafer' })).status).toBe(200);
    await server.pushWorker.runOnce();
    const pushes = deliveredTo(browser.path).map(browser.read);
    expect(pushes).toHaveLength(1);
    expect(pushes[0].title).toContain(`[#${ticket.id}] Fixed`);
    expect(pushes[0].link).toBe(`/tickets/${ticket.id}`);
  });

  it('when the push service answers 410 Gone, then the subscription and its pending pushes are removed', async () => {
    const member = await signedInClient(server.url, 'member');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const browser = fakeBrowser();
    answer.set(browser.path, 410);
    await subscribe(member.client, browser);
    await member.client.put(`/api/tools/${tool.id}/follow`);
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', reason: 'repair', note: 'Gone test' });
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'productive', reason: 'none' });
    const sub = await PushSubscription.findOne({ where: { userId: member.user.id } });
    expect(await PushOutbox.count({ where: { subscriptionId: sub!.id } })).toBe(1);

    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(1);
    expect(await PushSubscription.count({ where: { userId: member.user.id } })).toBe(0);
    expect(await PushOutbox.count({ where: { subscriptionId: sub!.id } })).toBe(0);
    expect((await member.client.get('/api/push')).body.subscriptions).toBe(0);
  });

  it('when the push service is unreachable, then the push waits and goes out once it answers again', async () => {
    const member = await signedInClient(server.url, 'member');
    const tech = await signedInClient(server.url, 'technician');
    const { tool } = await makeTool(server.deps.sequelize);
    const browser = fakeBrowser();
    answer.set(browser.path, 503);
    await subscribe(member.client, browser);
    await member.client.put(`/api/tools/${tool.id}/follow`);
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'unscheduled_downtime', reason: 'repair', note: 'Retry test' });
    await tech.client.post(`/api/tools/${tool.id}/state`, { state: 'productive', reason: 'none' });
    await server.pushWorker.runOnce();
    const sub = await PushSubscription.findOne({ where: { userId: member.user.id } });
    const row = await PushOutbox.findOne({ where: { subscriptionId: sub!.id } });
    expect(row!.status).toBe('pending');
    expect(row!.attempts).toBe(1);

    answer.delete(browser.path);
    await row!.update({ nextAttemptAt: new Date(Date.now() - 1000) }); // the back-off has passed
    await server.pushWorker.runOnce();
    expect(deliveredTo(browser.path)).toHaveLength(2);
    expect(browser.read(deliveredTo(browser.path)[1]).title).toContain('is now Running');
  });

  it('when a subscription has a plain-http address or bad keys, then 400 with field messages and nothing is stored', async () => {
    const member = await signedInClient(server.url, 'member');
    const browser = fakeBrowser();
    const r = await member.client.post('/api/push/subscriptions', {
      ...browser.subscription,
      endpoint: browser.subscription.endpoint.replace('https:', 'http:'),
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.endpoint).toBeDefined();
    const bad = await member.client.post('/api/push/subscriptions', { ...browser.subscription, keys: { p256dh: 'short', auth: '!!' } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['keys.auth', 'keys.p256dh']);
    expect(await PushSubscription.count({ where: { userId: member.user.id } })).toBe(0);
  });

  it('when the same browser subscribes again or for another person, then there is still one subscription, now theirs; removing it stops pushes', async () => {
    const a = await signedInClient(server.url, 'member');
    const b = await signedInClient(server.url, 'member');
    const browser = fakeBrowser();
    await subscribe(a.client, browser);
    await subscribe(a.client, browser);
    expect((await b.client.post('/api/push/subscriptions', browser.subscription)).body.subscriptions).toBe(1);
    expect(await PushSubscription.count({ where: { userId: a.user.id } })).toBe(0);
    const removed = await b.client.post('/api/push/subscriptions/remove', { endpoint: browser.subscription.endpoint });
    expect(removed.body.subscriptions).toBe(0);
  });
});
