import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient, unique } from '../support/factories';
import { PHOTO_BACKENDS, photoBackend, type PhotoBackend } from '../support/photo-storage';
import { startScratchDatabase, type ScratchDatabase } from '../support/database';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { createTool, jpegBytes, multipartReport, reportBody } from './tickets-fixtures';

// A report sent while MariaDB is away must fail clearly (503), keep nothing half-written and
// leave no photo behind, so the client can keep its draft and send it again later.

// The outage happens on a throw-away MariaDB of this file's own (tests/support/database.ts),
// shared by both photo stores' runs.
let db: ScratchDatabase;
const TRIGGER = 'test_slow_ticket_event';

beforeAll(async () => {
  db = await startScratchDatabase();
});
afterAll(() => {
  db?.destroy();
});

async function poll(check: () => Promise<boolean>, timeoutMs = 20_000) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await check().catch(() => false)) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return false;
}

describe.each(PHOTO_BACKENDS)('reporting while the database is down (%s storage)', (kind) => {
  let server: TestServer;
  let backend: PhotoBackend;
  const dbBack = () => poll(async () => (await fetch(`${server.url}/api/health`)).status === 200);
  /** Photos in the store: linked ones and those saved for a transaction that has not committed. */
  const filesInDir = () => backend.photos();

  beforeAll(async () => {
    backend = await photoBackend(kind, 'uploads-db-down');
    server = await startTestServer({ ...db.overrides, ...backend.overrides });
  });
  afterAll(async () => {
    await server?.close();
    await backend?.close();
  });

  it('when MariaDB is stopped, then a report with photos gets 503 db_unavailable, no file is kept, and after the restart no ticket exists; sending again works', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const description = unique('report while the database is down');
    const photos = [
      { bytes: await jpegBytes(), name: 'a.jpg' },
      { bytes: await jpegBytes(200, 200), name: 'b.jpg' },
    ];

    db.stop();
    const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id, { description }), photos));
    expect(r.status).toBe(503);
    expect(r.body.error.code).toBe('db_unavailable');
    expect(r.body.error.message).toMatch(/Nothing was saved/);
    expect(await filesInDir()).toEqual([]);

    await db.start();
    expect(await dbBack()).toBe(true);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);
    expect(await TicketEvent.count({ where: { body: description } })).toBe(0);

    // The draft the client kept goes through once the database is back.
    expect(await poll(async () => (await client.get('/api/tickets?limit=1')).status === 200)).toBe(true);
    const again = await client.post('/api/tickets', multipartReport(reportBody(tool.id, { description }), photos));
    expect(again.status).toBe(201);
    expect(await filesInDir()).toHaveLength(4); // two photos, two thumbnails
  });

  it('when MariaDB goes away in the middle of the report transaction, after the photos were written, then 503, the photos are removed, and after the restart nothing of the report exists', async () => {
    const { tool } = await createTool(server.deps.sequelize);
    const { client } = await signedInClient(server.url, 'member');
    const description = unique('report cut off mid-transaction');
    // Hold the transaction open inside the timeline insert for this one report, long enough to stop the database under it.
    await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS ${TRIGGER}`);
    await server.deps.sequelize.query(
      `CREATE TRIGGER ${TRIGGER} BEFORE INSERT ON ticket_events FOR EACH ROW BEGIN IF NEW.body = '${description}' THEN SET @slept = SLEEP(8); END IF; END`,
    );
    const before = await filesInDir();

    const pending = client.post(
      '/api/tickets',
      multipartReport(reportBody(tool.id, { description }), [{ bytes: await jpegBytes(), name: 'a.jpg' }]),
    );
    // The photo and its thumbnail are on disk while the transaction waits.
    expect(await poll(async () => (await filesInDir()).length === before.length + 2, 10_000)).toBe(true);
    db.stop();
    const r = await pending;
    expect(r.status).toBe(503);
    expect((await filesInDir()).sort()).toEqual([...before].sort());

    await db.start();
    expect(await dbBack()).toBe(true);
    await server.deps.sequelize.query(`DROP TRIGGER IF EXISTS ${TRIGGER}`);
    expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);
    expect(await TicketEvent.count({ where: { body: description } })).toBe(0);
  });
});
