import { fork } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import { projectRoot } from '../support/env';
import { PHOTO_BACKENDS, photoBackend, startFakeS3, type FakeS3, type PhotoBackend } from '../support/photo-storage';
import { concretePath } from '../support/schema-walk';
import { TestClient } from '../support/client';
import { createUser, TEST_PASSWORD } from '../support/factories';
import type { RegisteredRoute } from '../../server/lib/http';
import { Photo, Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { createTool, drainOutbox, jpegBytes, multipartReport, reportBody } from './tickets-fixtures';

// Hostile or broken multipart bodies, uploads cut off half-way, too many uploads at once, and
// files a crash left behind. OWASP File Upload cheat sheet: limit what is received and where
// it is kept; an upload is stored only once it is complete and checked. Everything runs
// against both photo stores: the local folder and an S3-compatible bucket (a fake S3 server).

describe.each(PHOTO_BACKENDS)('upload hardening (%s storage)', (kind) => {
  let server: TestServer;
  let dir: string;
  let backend: PhotoBackend;
  let fake: FakeS3 | undefined;
  const lines: Record<string, any>[] = [];

  beforeAll(async () => {
    fake = kind === 's3' ? await startFakeS3() : undefined;
    backend = await photoBackend(kind, 'upload-hardening', fake);
    dir = backend.dir;
    const destination = { write: (chunk: string) => void lines.push(JSON.parse(chunk)) };
    server = await startTestServer(
      { ...backend.overrides, LOG_LEVEL: 'info', UPLOADS_PER_ACCOUNT: '1', UPLOADS_AT_ONCE: '2' },
      { logDestination: destination },
    );
  });
  afterAll(async () => {
    await drainOutbox(server);
    await server.close();
    await backend.close();
    await fake?.close();
  });

  // What a browser on the public address sends: the CSRF check accepts PUBLIC_URL's origin only.
  const publicOrigin = () => new URL(server.config.publicUrl).origin;
  const unhandled = () => lines.filter((l) => l.msg === 'unhandled error');
  const filesUnder = (sub: string) => (fs.existsSync(path.join(dir, sub)) ? fs.readdirSync(path.join(dir, sub)) : []);

  async function eventually(check: () => boolean, what: string) {
    for (let i = 0; i < 50 && !check(); i++) await new Promise((r) => setTimeout(r, 40));
    expect(check(), what).toBe(true);
  }

  /** Sends raw bytes with the client's session cookie and CSRF token; resolves with status and body. */
  async function raw(client: TestClient, method: string, urlPath: string, contentType: string | null, body: Buffer | string) {
    if (!client.csrfToken) await client.refreshCsrf();
    const headers: Record<string, string> = { cookie: client.cookie ?? '', 'x-csrf-token': client.csrfToken ?? '', origin: publicOrigin() };
    if (contentType) headers['content-type'] = contentType;
    const res = await fetch(server.url + urlPath, { method, headers, body: typeof body === 'string' ? body : new Uint8Array(body) });
    const text = await res.text();
    let json: any = null;
    try {
      json = JSON.parse(text);
    } catch {
      json = null;
    }
    return { status: res.status, body: json };
  }

  const B = 'faultlineBoundary7xq';
  const part = (name: string, value: string, extra = '') =>
    `--${B}\r\nContent-Disposition: form-data; name="${name}"${extra}\r\n\r\n${value}\r\n`;
  const MALFORMED: { what: string; type: string; body: (report: string) => string | Buffer }[] = [
    {
      what: 'a body cut off before its closing boundary (Unexpected end of form)',
      type: `multipart/form-data; boundary=${B}`,
      body: (r) => `${part('report', r)}--${B}\r\nContent-Disposition: form-data; name="photos"; filename="a.jpg"\r\n\r\n\xff\xd8\xff`,
    },
    {
      what: 'a part header without a colon',
      type: `multipart/form-data; boundary=${B}`,
      body: (r) => `--${B}\r\nContent-Disposition form-data name report\r\n\r\n${r}\r\n--${B}--\r\n`,
    },
    {
      what: 'a part header longer than any limit',
      type: `multipart/form-data; boundary=${B}`,
      body: (r) =>
        `--${B}\r\nX-Filler: ${'a'.repeat(100_000)}\r\nContent-Disposition: form-data; name="report"\r\n\r\n${r}\r\n--${B}--\r\n`,
    },
    { what: 'no boundary at all', type: 'multipart/form-data', body: (r) => `${part('report', r)}--${B}--\r\n` },
    {
      what: 'multipart/mixed instead of form-data',
      type: `multipart/mixed; boundary=${B}`,
      body: (r) => `${part('report', r)}--${B}--\r\n`,
    },
    { what: 'a boundary that never appears', type: 'multipart/form-data; boundary=other', body: (r) => `${part('report', r)}--${B}--\r\n` },
    {
      what: 'field names an object inherits',
      type: `multipart/form-data; boundary=${B}`,
      body: () => `${part('constructor', '1')}${part('toString', 'x')}${part('__proto__', '{}')}--${B}--\r\n`,
    },
    {
      what: 'bracketed field names',
      type: `multipart/form-data; boundary=${B}`,
      body: (r) => `${part('report[constructor]', r)}${part('__proto__[polluted]', '1')}--${B}--\r\n`,
    },
    {
      what: 'a photo field sent as text and a text field sent as a file',
      type: `multipart/form-data; boundary=${B}`,
      body: (r) => `${part('photos', 'not a file')}${part('report', r, '; filename="report.json"')}--${B}--\r\n`,
    },
  ];

  describe('malformed multipart', () => {
    it('when the report routes get any malformed multipart body, then 400 with a message, no unhandled error in the log, and nothing is written', async () => {
      const { tool } = await createTool(server.deps.sequelize);
      const { client } = await signedInClient(server.url, 'member');
      const filed = await client.post('/api/tickets', reportBody(tool.id));
      expect(filed.status).toBe(201);
      const ticketsBefore = await Ticket.count({ where: { toolId: tool.id } });
      for (const target of ['/api/tickets', `/api/tickets/${filed.body.id}/reports`]) {
        for (const m of MALFORMED) {
          const res = await raw(
            client,
            'POST',
            target,
            m.type,
            m.body(JSON.stringify(reportBody(tool.id, { description: unique('malformed') }))),
          );
          expect(res.status, `${target}: ${m.what}`).toBe(400);
          expect(res.body?.error?.message, `${target}: ${m.what}`).toBeTruthy();
        }
      }
      expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(ticketsBefore);
      expect(await Photo.count({ where: { ticketId: filed.body.id } })).toBe(0);
      expect(unhandled()).toEqual([]);
      await eventually(() => filesUnder('incoming').length === 0, 'no part file left');
    });

    it('when any other route with a body gets a malformed multipart body, then a 4xx and never a 5xx', async () => {
      const { client } = await signedInClient(server.url, 'admin');
      const routes = (server.app.locals.routeRegistry as RegisteredRoute[]).filter(
        (r) => r.hasBody && !/^\/tickets(\/:id\/reports)?$/.test(r.path),
      );
      for (const r of routes) {
        for (const m of MALFORMED.slice(0, 5)) {
          const res = await raw(client, r.method.toUpperCase(), `/api${concretePath(r.path)}`, m.type, m.body('{}'));
          expect(res.status, `${r.method} ${r.path}: ${m.what}`).toBeGreaterThanOrEqual(400);
          expect(res.status, `${r.method} ${r.path}: ${m.what}`).toBeLessThan(500);
        }
      }
      expect(unhandled()).toEqual([]);
    });

    it('when the client gives up half-way through an upload, then the server logs an aborted upload (not an unhandled error) and keeps no part file', async () => {
      const { tool } = await createTool(server.deps.sequelize);
      const { client } = await signedInClient(server.url, 'member');
      await client.refreshCsrf();
      const photo = await jpegBytes(800, 600);
      const { req, sent } = openUpload(client, '/api/tickets', reportBody(tool.id), photo, 4 * 1024 * 1024);
      await sent;
      await eventually(() => filesUnder('incoming').length > 0, 'the part file is being written');
      req.destroy();
      await eventually(() => lines.some((l) => l.msg === 'upload aborted by the client'), 'the abort is logged');
      await eventually(() => filesUnder('incoming').length === 0, 'the part file is removed');
      expect(unhandled()).toEqual([]);
    });
  });

  /**
   * Starts a multipart upload and sends all but the end of it, so the server holds it open.
   * `sent` resolves once the first bytes were written; `finish()` sends the rest.
   */
  function openUpload(client: TestClient, urlPath: string, report: unknown, photo: Buffer, padding = 0) {
    const head = Buffer.from(
      `${part('report', JSON.stringify(report))}--${B}\r\nContent-Disposition: form-data; name="photos"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`,
    );
    const tail = Buffer.from(`\r\n--${B}--\r\n`);
    // Bytes after a JPEG's end marker are ignored by decoders; they let the test hold a big part open.
    const body = Buffer.concat([head, photo, Buffer.alloc(padding)]);
    const url = new URL(server.url + urlPath);
    const req = http.request({
      host: url.hostname,
      port: url.port,
      path: url.pathname,
      method: 'POST',
      headers: {
        cookie: client.cookie ?? '',
        'x-csrf-token': client.csrfToken ?? '',
        origin: publicOrigin(),
        'content-type': `multipart/form-data; boundary=${B}`,
        'content-length': body.length + tail.length,
      },
    });
    req.on('error', () => undefined);
    const answer = new Promise<{ status: number; body: any }>((resolve) => {
      req.on('response', (res) => {
        let text = '';
        res.on('data', (c) => (text += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body: text ? JSON.parse(text) : null }));
      });
    });
    const sent = new Promise<void>((resolve) => req.write(body, () => resolve()));
    return { req, sent, answer, finish: () => req.end(tail) };
  }

  describe('uploads at once', () => {
    it('when one account already has an upload under way, then its next one gets 429; when the server holds its maximum, then others get 503; once they finish, uploads go through', async () => {
      const { tool } = await createTool(server.deps.sequelize);
      const a = (await signedInClient(server.url, 'member')).client;
      const b = (await signedInClient(server.url, 'member')).client;
      const c = (await signedInClient(server.url, 'member')).client;
      for (const x of [a, b, c]) await x.refreshCsrf();
      const photo = await jpegBytes(64, 48);

      const first = openUpload(a, '/api/tickets', reportBody(tool.id, { description: unique('held A') }), photo);
      await first.sent;
      await eventually(() => filesUnder('incoming').length >= 1, 'A is being received');
      const second = await a.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: photo, name: 'p.jpg' }]));
      expect(second.status).toBe(429);
      expect(second.body.error.code).toBe('uploads_in_progress');
      expect(second.headers.get('retry-after')).toBeTruthy();
      // A report without photos needs no upload slot.
      expect((await a.post('/api/tickets', reportBody(tool.id))).status).toBe(201);

      const other = openUpload(b, '/api/tickets', reportBody(tool.id, { description: unique('held B') }), photo);
      await other.sent;
      await eventually(() => filesUnder('incoming').length >= 2, 'B is being received');
      const third = await c.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: photo, name: 'p.jpg' }]));
      expect(third.status).toBe(503);
      expect(third.body.error.code).toBe('uploads_busy');
      expect(third.body.error.message).toMatch(/again/);

      first.finish();
      other.finish();
      expect((await first.answer).status).toBe(201);
      expect((await other.answer).status).toBe(201);
      const later = await c.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: photo, name: 'p.jpg' }]));
      expect(later.status).toBe(201);
    });
  });

  describe('files left by a crash', () => {
    it('when part files, pending photos and unlinked photo files are over an hour old at start, then the sweep removes them and leaves linked and recent ones', async () => {
      const { tool } = await createTool(server.deps.sequelize);
      const { client } = await signedInClient(server.url, 'member');
      const filed = await client.post(
        '/api/tickets',
        multipartReport(reportBody(tool.id), [{ bytes: await jpegBytes(), name: 'kept.jpg' }]),
      );
      expect(filed.status).toBe(201);
      const [linked] = await Photo.findAll({ where: { ticketId: filed.body.id } });

      const twoHoursAgo = new Date(Date.now() - 2 * 60 * 60_000);
      // Part files always arrive in the local folder, whichever store keeps the photos.
      const part = path.join(dir, 'incoming', 'Zm9yZ290dGVuLXBhcnQtZmlsZQ.part');
      fs.mkdirSync(path.dirname(part), { recursive: true });
      fs.writeFileSync(part, 'left by a killed upload');
      fs.utimesSync(part, twoHoursAgo, twoHoursAgo);
      const gone = [
        'cGVuZGluZy1waG90by1uZXZlci1saW5rZWQ.jpg',
        'dW5saW5rZWQtYWZ0ZXItcmVuYW1lLWNyYXNo.jpg',
        'dW5saW5rZWQtYWZ0ZXItcmVuYW1lLWNyYXNo-t.jpg',
      ];
      await backend.plant(gone[0], twoHoursAgo, 'pending');
      await backend.plant(gone[1], twoHoursAgo, 'linked');
      await backend.plant(gone[2], twoHoursAgo, 'linked');
      const young = 'c3RpbGwtYmVpbmctdXBsb2FkZWQtbm93LW9r.jpg';
      await backend.plant(young, null, 'pending');
      // Not a photo name: not the sweep's to remove.
      await backend.plant('README.txt', twoHoursAgo, 'linked');
      await backend.age(twoHoursAgo, [linked.storedName, linked.thumbName]);

      // A second server on the same store: its start-up sweep runs before it listens.
      const restarted = await startTestServer(backend.overrides);
      try {
        expect(fs.existsSync(part), part).toBe(false);
        for (const name of gone) expect(await backend.holds(name), name).toBe(false);
        for (const name of [young, 'README.txt', linked.storedName, linked.thumbName]) expect(await backend.holds(name), name).toBe(true);
        // The photo is still served.
        expect((await client.get(`/api/photos/${linked.id}`)).status).toBe(200);
      } finally {
        await drainOutbox(restarted);
        await restarted.close();
      }
    });

    it('when the server is killed (SIGKILL) in the middle of a report with photos, then after the restart and an hour no photo file is left without a row, and nothing of the report exists', async () => {
      const crash = await photoBackend(kind, 'killed-upload', fake);
      const { tool } = await createTool(server.deps.sequelize);
      const member = await createUser('member');
      const marker = unique('killed mid-upload');
      const trigger = 'test_hold_killed_report';
      // Hold the report's transaction inside its timeline insert: the photos are written by then.
      await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS ${trigger}`);
      await server.deps.sequelize.query(
        `CREATE TRIGGER ${trigger} BEFORE INSERT ON ticket_events FOR EACH ROW BEGIN IF NEW.body = '${marker}' THEN SET @held = SLEEP(4); END IF; END`,
      );
      const child = fork(path.join(projectRoot, 'tests/support/child-server.ts'), [JSON.stringify(crash.overrides)], {
        execArgv: ['--import', 'tsx'],
        stdio: 'ignore',
      });
      try {
        const url = await new Promise<string>((resolve, reject) => {
          child.once('message', (m) => resolve((m as { url: string }).url));
          child.once('exit', (code) => reject(new Error(`child server exited (${code})`)));
        });
        const client = new TestClient(url);
        expect((await client.signIn(member.email, TEST_PASSWORD)).status).toBe(200);
        const photos = [
          { bytes: await jpegBytes(640, 480), name: 'a.jpg' },
          { bytes: await jpegBytes(480, 640), name: 'b.jpg' },
        ];
        const sent = client.post('/api/tickets', multipartReport(reportBody(tool.id, { description: marker }), photos)).catch(() => null);
        for (let i = 0; i < 200 && (await crash.photos()).length < 4; i++) await new Promise((r) => setTimeout(r, 25));
        expect(await crash.photos()).toHaveLength(4);
        child.kill('SIGKILL');
        expect(await sent).toBeNull();
      } finally {
        if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
      }
      // MariaDB rolls the killed connection's transaction back once the held statement ends.
      for (let i = 0; i < 100 && (await TicketEvent.count({ where: { body: marker } })) > 0; i++)
        await new Promise((r) => setTimeout(r, 100));
      await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS ${trigger}`);
      expect((await crash.everything()).length).toBeGreaterThanOrEqual(4);

      // An hour later (the sweep leaves younger files alone: their upload may still be running).
      const hourAgo = new Date(Date.now() - 61 * 60_000);
      await crash.age(hourAgo);
      const restarted = await startTestServer(crash.overrides);
      try {
        expect(await crash.everything()).toEqual([]);
        expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);
        expect(await TicketEvent.count({ where: { body: marker } })).toBe(0);
      } finally {
        await restarted.close();
        await crash.close();
      }
    });
  });
});
