import sharp from 'sharp';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import { PHOTO_BACKENDS, photoBackend, type PhotoBackend } from '../support/photo-storage';
import { Ticket, TicketEvent, Photo } from '../../server/modules/tickets/ticket.model';
import { createTool, exifTags, GPS_LATITUDE_TAG, jpegBytes, multipartReport, reportBody, drainOutbox } from './tickets-fixtures';

// Upload rules (OWASP File Upload cheat sheet; ASVS 5.0 §5.2–5.4): type by content, size and
// count limits, re-encoding that drops EXIF (including GPS), random names, and no orphan file
// or half-written ticket after any refusal. Every test runs against both photo stores: the
// local folder and an S3-compatible bucket (a fake S3 server).

describe.each(PHOTO_BACKENDS)('photo uploads (%s storage)', (kind) => {
  let server: TestServer;
  let backend: PhotoBackend;
  const startedAt = new Date();

  beforeAll(async () => {
    backend = await photoBackend(kind, 'uploads');
    server = await startTestServer(backend.overrides);
  });
  afterAll(async () => {
    await drainOutbox(server);
    await server.close();
    await backend.close();
  });

  /** Every part file and stored photo (linked or not). */
  const filesInDir = () => backend.everything();

  /** Nothing added to the store, no ticket on the tool, no timeline entry with the report's text. */
  async function nothingWritten(toolId: number, description: string, before: string[]) {
    // Part files go when the answer has gone, a moment after the client has read it.
    for (let i = 0; i < 50 && (await filesInDir()).join() !== before.join(); i++) await new Promise((r) => setTimeout(r, 40));
    expect(await filesInDir()).toEqual(before);
    expect(await Ticket.count({ where: { toolId } })).toBe(0);
    expect(await TicketEvent.count({ where: { body: description, createdAt: { [Op.gte]: startedAt } } })).toBe(0);
  }

  it('when a phone photo carries GPS position in its EXIF, then the stored photo and thumbnail carry no EXIF at all, under a random name', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const original = await jpegBytes(400, 300, { gps: true });
    // The input really says where it was taken: a GPS IFD with a latitude.
    expect(exifTags(original)?.gps).toContain(GPS_LATITUDE_TAG);

    const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: original, name: 'IMG_0001.jpg' }]));
    expect(r.status).toBe(201);
    const [photo] = await Photo.findAll({ where: { ticketId: r.body.id } });
    expect(photo.storedName).toMatch(/^[A-Za-z0-9_-]{24}\.jpg$/);
    expect(photo.storedName).not.toContain('IMG_0001');
    expect(photo).toMatchObject({ mime: 'image/jpeg', width: 400, height: 300 });
    // The photo is where this store keeps it, and nowhere else (no copy in the local folder with S3).
    expect((await backend.photos()).filter((f) => f.includes(photo.storedName))).toEqual([
      kind === 's3' ? `s3:${backend.prefix}${photo.storedName}` : photo.storedName,
    ]);

    for (const name of [photo.storedName, photo.thumbName]) {
      const stored = await backend.read(name);
      expect(exifTags(stored)).toBeNull();
      expect(stored.includes(Buffer.from('Exif\0\0', 'latin1'))).toBe(false);
      expect((await sharp(stored).metadata()).exif).toBeUndefined();
    }

    const served = await client.get(`/api/photos/${photo.id}`);
    expect(served.status).toBe(200);
    expect(served.headers.get('content-type')).toBe('image/jpeg');
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(served.headers.get('content-disposition')).toBe(`inline; filename="photo-${photo.id}.jpg"`);
    // What is served is exactly what was stored, streamed from the store.
    const bytes = await fetch(`${server.url}/api/photos/${photo.id}`, { headers: { cookie: client.cookie ?? '' } });
    expect(bytes.headers.get('content-length')).toBe(String(photo.bytes));
    expect(Buffer.from(await bytes.arrayBuffer()).equals(await backend.read(photo.storedName))).toBe(true);
  });

  it('when a photo was taken sideways (EXIF orientation 6), then the stored image is turned upright', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const sideways = await jpegBytes(300, 120, { orientation: 6 });
    const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: sideways, name: 'side.jpg' }]));
    expect(r.status).toBe(201);
    const [photo] = await Photo.findAll({ where: { ticketId: r.body.id } });
    expect({ width: photo.width, height: photo.height }).toEqual({ width: 120, height: 300 });
    const meta = await sharp(await backend.read(photo.storedName)).metadata();
    expect({ width: meta.width, height: meta.height, orientation: meta.orientation }).toEqual({
      width: 120,
      height: 300,
      orientation: undefined,
    });
  });

  it('when an HTML file is renamed .jpg and sent as image/jpeg, then it is refused with 415 and no file, ticket or event is left', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const before = await filesInDir();
    const description = unique('rejected upload');
    const html = Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>');
    const good = await jpegBytes();
    const r = await client.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id, { description }), [
        { bytes: good, name: 'ok.jpg' },
        { bytes: html, name: 'photo.jpg' },
      ]),
    );
    expect(r.status).toBe(415);
    expect(r.body.error.code).toBe('unsupported_media_type');
    await nothingWritten(tool.id, description, before);
  });

  it('when an SVG (an image type sharp could read, but one that can carry script) is sent, then it is refused with 415', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const svg = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><rect width="10" height="10"/></svg>');
    const r = await client.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id), [{ bytes: svg, name: 'x.jpg', type: 'image/svg+xml' }]),
    );
    expect(r.status).toBe(415);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);
  });

  it('when a file is larger than 10 MB, then it is refused with 413 and nothing is left', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const before = await filesInDir();
    const description = unique('rejected upload');
    const big = Buffer.alloc(10 * 1024 * 1024 + 10, 0x41);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const r = await client.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id, { description }), [
        { bytes: await jpegBytes(), name: 'a.jpg' },
        { bytes: big, name: 'huge.jpg' },
      ]),
    );
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe('upload_too_large');
    await nothingWritten(tool.id, description, before);
  });

  it('when seven photos are sent, then the request is refused (at most six) and nothing is left', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const before = await filesInDir();
    const description = unique('rejected upload');
    const photo = await jpegBytes(40, 40);
    const r = await client.post(
      '/api/tickets',
      multipartReport(
        reportBody(tool.id, { description }),
        Array.from({ length: 7 }, (_, i) => ({ bytes: photo, name: `p${i}.jpg` })),
      ),
    );
    expect([400, 413]).toContain(r.status);
    await nothingWritten(tool.id, description, before);
  });

  it('when a small PNG declares 64 megapixels (a pixel flood), then it is refused with 413 before decoding and nothing is left', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const before = await filesInDir();
    const description = unique('rejected upload');
    const flood = await sharp({ create: { width: 8000, height: 8000, channels: 3, background: '#000' } })
      .png({ compressionLevel: 9 })
      .toBuffer();
    expect(flood.length).toBeLessThan(10 * 1024 * 1024);
    const r = await client.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id, { description }), [{ bytes: flood, name: 'flood.png', type: 'image/png' }]),
    );
    expect(r.status).toBe(413);
    await nothingWritten(tool.id, description, before);
  });

  it('when the database transaction fails after the photos were written, then the files are removed and no row remains', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const marker = unique('fail-in-transaction');
    const before = await filesInDir();
    // A trigger makes the timeline insert fail for this one report only, after the files exist.
    await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS test_fail_ticket_event`);
    await server.deps.sequelize.query(
      `CREATE TRIGGER test_fail_ticket_event BEFORE INSERT ON ticket_events FOR EACH ROW
       BEGIN IF NEW.body = '${marker}' THEN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'forced failure'; END IF; END`,
    );
    try {
      const r = await client.post(
        '/api/tickets',
        multipartReport(reportBody(tool.id, { description: marker }), [
          { bytes: await jpegBytes(), name: 'a.jpg' },
          { bytes: await jpegBytes(), name: 'b.jpg' },
        ]),
      );
      expect(r.status).toBe(500);
      await nothingWritten(tool.id, marker, before);
    } finally {
      await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS test_fail_ticket_event`);
    }
  });

  it('when a photo is fetched signed out, then 401; by a member, then the JPEG', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: await jpegBytes(), name: 'a.jpg' }]));
    const [photo] = await Photo.findAll({ where: { ticketId: r.body.id } });
    const anonymous = await fetch(`${server.url}/api/photos/${photo.id}`);
    expect(anonymous.status).toBe(401);
    expect(anonymous.headers.get('content-type')).toMatch(/application\/json/);
    const { client: other } = await signedInClient(server.url, 'member');
    const thumb = await other.get(`/api/photos/${photo.id}/thumb`);
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get('content-type')).toBe('image/jpeg');
  });

  it('when the facility lets members see only their own reports, then another member gets no photo or thumbnail (404, like a ticket that does not exist) and the reporter still gets both', async () => {
    const { client: admin } = await signedInClient(server.url, 'admin');
    const before = (await admin.get('/api/facility-settings')).body;
    const { tool } = await createTool(server.deps.sequelize);
    const { client: owner } = await signedInClient(server.url, 'member');
    const { client: other } = await signedInClient(server.url, 'member');
    const r = await owner.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: await jpegBytes(), name: 'a.jpg' }]));
    expect(r.status).toBe(201);
    const [photo] = await Photo.findAll({ where: { ticketId: r.body.id } });
    try {
      expect((await admin.put('/api/admin/facility-settings', { ...before, memberTicketVisibility: 'own' })).status).toBe(200);
      for (const url of [`/api/photos/${photo.id}`, `/api/photos/${photo.id}/thumb`]) {
        const refused = await other.get(url);
        expect(refused.status, url).toBe(404);
        expect(refused.headers.get('content-type'), url).toMatch(/application\/json/);
        const served = await owner.get(url);
        expect(served.status, url).toBe(200);
        expect(served.headers.get('content-type'), url).toBe('image/jpeg');
      }
    } finally {
      await admin.put('/api/admin/facility-settings', before);
    }
  });

  it('when a photo row names a file the store no longer has, then 404 with a JSON message, not a 500', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: await jpegBytes(), name: 'a.jpg' }]));
    const [photo] = await Photo.findAll({ where: { ticketId: r.body.id } });
    await server.deps.photos.remove([photo.storedName]);
    const gone = await client.get(`/api/photos/${photo.id}`);
    expect(gone.status).toBe(404);
    expect(gone.body.error.code).toBe('not_found');
    expect((await client.get(`/api/photos/${photo.id}/thumb`)).status).toBe(200);
  });
});
