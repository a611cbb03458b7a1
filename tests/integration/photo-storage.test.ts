import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import readline from 'node:readline';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { projectRoot, testConfig } from '../support/env';
import { photoBackend, startFakeS3, type FakeS3 } from '../support/photo-storage';
import type { TestClient } from '../support/client';
import { Photo, Ticket } from '../../server/modules/tickets/ticket.model';
import { S3PhotoStore, s3SettingsFrom } from '../../server/lib/storage/s3-store';
import { movePhotos, type MoveOutcome } from '../../server/lib/storage/move-photos';
import { createTool, drainOutbox, jpegBytes, multipartReport, reportBody } from './tickets-fixtures';

// Issue 14, point 4: photos in an S3-compatible bucket (a fake S3 server here), so that every
// server process shows every photo; and the command that moves an existing folder of photos
// into the bucket, resumable and verified.

let fake: FakeS3;
beforeAll(async () => {
  fake = await startFakeS3();
});
afterAll(async () => {
  await fake.close();
});

/** A photo's bytes as the route serves them. */
async function served(server: TestServer, client: TestClient, url: string) {
  const res = await fetch(`${server.url}${url}`, { headers: { cookie: client.cookie ?? '' } });
  return { status: res.status, type: res.headers.get('content-type'), bytes: Buffer.from(await res.arrayBuffer()) };
}

/** Files a report with photos through `server`; the photo rows it made. */
async function reportWithPhotos(server: TestServer, client: TestClient, count: number) {
  const { tool } = await createTool(server.deps.sequelize);
  const photos = await Promise.all(Array.from({ length: count }, (_, i) => jpegBytes(200 + i * 20, 150)));
  const r = await client.post(
    '/api/tickets',
    multipartReport(
      reportBody(tool.id),
      photos.map((bytes, i) => ({ bytes, name: `p${i}.jpg` })),
    ),
  );
  expect(r.status).toBe(201);
  return Photo.findAll({ where: { ticketId: r.body.id }, order: [['id', 'ASC']] });
}

describe('two server processes', () => {
  it('when both keep photos in the same bucket, then a photo uploaded through the first is shown by the second; with separate local folders it is not', async () => {
    const shared = await photoBackend('s3', 'two-servers', fake);
    // Each process has its own local folder (for part files): only the bucket is shared.
    const other = await photoBackend('s3', 'two-servers-b', fake);
    const first = await startTestServer(shared.overrides);
    const second = await startTestServer({ ...other.overrides, S3_PREFIX: shared.prefix });
    const localA = await photoBackend('local', 'two-local-a');
    const localB = await photoBackend('local', 'two-local-b');
    const firstLocal = await startTestServer(localA.overrides);
    const secondLocal = await startTestServer(localB.overrides);
    try {
      const { client, user } = await signedInClient(first.url, 'member');
      const [photo] = await reportWithPhotos(first, client, 1);
      const viaFirst = await served(first, client, `/api/photos/${photo.id}`);
      expect(viaFirst.status).toBe(200);

      // The same person, signed in on the other process (sessions are in MariaDB).
      const onSecond = await signedInClient(second.url, 'member');
      const viaSecond = await served(second, onSecond.client, `/api/photos/${photo.id}`);
      expect(viaSecond.status).toBe(200);
      expect(viaSecond.type).toBe('image/jpeg');
      expect(viaSecond.bytes.equals(viaFirst.bytes)).toBe(true);
      expect((await served(second, onSecond.client, `/api/photos/${photo.id}/thumb`)).status).toBe(200);
      expect(user.id).toBeGreaterThan(0);

      // What the issue is about: on local disks the second process cannot show it.
      const local = await signedInClient(firstLocal.url, 'member');
      const [localPhoto] = await reportWithPhotos(firstLocal, local.client, 1);
      expect((await served(firstLocal, local.client, `/api/photos/${localPhoto.id}`)).status).toBe(200);
      const elsewhere = await signedInClient(secondLocal.url, 'member');
      expect((await served(secondLocal, elsewhere.client, `/api/photos/${localPhoto.id}`)).status).toBe(404);
    } finally {
      for (const s of [first, second, firstLocal, secondLocal]) {
        await drainOutbox(s);
        await s.close();
      }
      for (const b of [shared, other, localA, localB]) await b.close();
    }
  });
});

describe('when the bucket cannot be reached', () => {
  it('when the photo store is down, then a report with photos gets 503 and leaves no ticket, a photo answers 503, a report without photos still goes in, and the sweep only logs', async () => {
    const ownFake = await startFakeS3();
    const backend = await photoBackend('s3', 'store-down', ownFake);
    const server = await startTestServer(backend.overrides);
    try {
      const { client } = await signedInClient(server.url, 'member');
      const [photo] = await reportWithPhotos(server, client, 1);
      await ownFake.close();

      const { tool } = await createTool(server.deps.sequelize);
      const r = await client.post('/api/tickets', multipartReport(reportBody(tool.id), [{ bytes: await jpegBytes(), name: 'a.jpg' }]));
      expect(r.status).toBe(503);
      expect(r.body.error.code).toBe('photo_storage_unavailable');
      expect(r.body.error.message).toMatch(/Nothing was saved/);
      expect(await Ticket.count({ where: { toolId: tool.id } })).toBe(0);

      const gone = await client.get(`/api/photos/${photo.id}`);
      expect(gone.status).toBe(503);
      expect(gone.body.error.code).toBe('photo_storage_unavailable');

      expect((await client.post('/api/tickets', reportBody(tool.id))).status).toBe(201);
      expect(await server.sweeper.runOnce()).toEqual([]);
    } finally {
      await drainOutbox(server);
      await server.close();
      await backend.close();
    }
  });
});

describe('npm run photos:move', () => {
  /** Local photo files of a folder, by name, with their bytes. */
  const folderPhotos = (dir: string) =>
    new Map(
      fs
        .readdirSync(dir)
        .filter((f) => f.endsWith('.jpg'))
        .map((f) => [f, fs.readFileSync(path.join(dir, f))] as const),
    );
  const createdKeys = (prefix: string) =>
    fake.events.filter((e) => e.kind.startsWith('ObjectCreated') && e.key.startsWith(prefix)).map((e) => e.key);

  it('when run with a limit, then again after a crash between copy and delete, then to the end, then every photo is copied once, verified, removed from the folder, and served from the bucket', async () => {
    const local = await photoBackend('local', 'move-source');
    const source = await startTestServer(local.overrides);
    const { client } = await signedInClient(source.url, 'member');
    const photos = [...(await reportWithPhotos(source, client, 3)), ...(await reportWithPhotos(source, client, 2))];
    await drainOutbox(source);
    await source.close();
    const before = folderPhotos(local.dir);
    expect(before.size).toBe(10); // five photos, five thumbnails

    const prefix = `move-${crypto.randomBytes(4).toString('hex')}/`;
    const settings = { ...local.overrides, ...fake.settings(prefix) };
    const target = new S3PhotoStore(s3SettingsFrom(testConfig(settings)));
    const outcomes: [string, MoveOutcome][] = [];
    const onPhoto = (name: string, outcome: MoveOutcome) => void outcomes.push([name, outcome]);
    try {
      // Interrupted after four copies.
      const first = await movePhotos({ dir: local.dir, target, limit: 4, onPhoto });
      expect(first).toEqual({ copied: 4, alreadyThere: 0, failed: 0, left: 6 });
      expect(folderPhotos(local.dir).size).toBe(6);

      // A run killed after its PUT but before deleting the local file leaves both; another
      // run finds the copy verified and copies nothing.
      const [survivor] = [...folderPhotos(local.dir).keys()];
      await target.put(survivor, before.get(survivor)!);
      // And a damaged object under a photo's name (a cut-off upload by hand) is not taken for a copy.
      const [, damaged] = [...folderPhotos(local.dir).keys()];
      await fake.put(`${prefix}${damaged}`, before.get(damaged)!.subarray(0, 100));
      const putsBefore = createdKeys(prefix).length;

      const second = await movePhotos({ dir: local.dir, target, onPhoto });
      expect(second).toEqual({ copied: 5, alreadyThere: 1, failed: 0, left: 0 });
      expect(outcomes.filter(([n]) => n === survivor).map(([, o]) => o)).toEqual(['already_there']);
      expect(folderPhotos(local.dir).size).toBe(0);
      // Six photos left after the limit: the survivor was not PUT again, the other five were PUT once each.
      expect(createdKeys(prefix).length - putsBefore).toBe(5);

      // Every photo copied by the command exactly once (the survivor's PUT was the "killed" run's).
      const byKey = new Map<string, number>();
      for (const k of createdKeys(prefix)) byKey.set(k, (byKey.get(k) ?? 0) + 1);
      for (const name of before.keys()) expect(byKey.get(`${prefix}${name}`), name).toBe(name === damaged ? 2 : 1);
      // Each object holds exactly the bytes of the file it replaced.
      for (const [name, bytes] of before) expect((await target.read(name))?.equals(bytes), name).toBe(true);

      // A third run has nothing to do.
      expect(await movePhotos({ dir: local.dir, target })).toEqual({ copied: 0, alreadyThere: 0, failed: 0, left: 0 });

      // A server on the bucket shows every moved photo.
      const moved = await startTestServer(settings);
      try {
        for (const photo of photos) {
          const got = await served(moved, client, `/api/photos/${photo.id}`);
          expect(got.status).toBe(200);
          expect(got.bytes.equals(before.get(photo.storedName)!)).toBe(true);
        }
      } finally {
        await moved.close();
      }
    } finally {
      target.close();
      await local.close();
    }
  });

  it('when the command is killed (SIGKILL) part-way and started again, then it goes on where it stopped: every photo is in the bucket once, verified, and none is left in the folder', async () => {
    const dir = path.join(projectRoot, 'test-results', `move-killed-${crypto.randomBytes(4).toString('hex')}`);
    fs.mkdirSync(dir, { recursive: true });
    // Forty photo files (the command needs no rows): enough that the kill lands part-way.
    const files = new Map<string, Buffer>();
    const picture = await jpegBytes(64, 48);
    for (let i = 0; i < 40; i++) {
      const name = `${crypto.randomBytes(18).toString('base64url')}.jpg`;
      const bytes = Buffer.concat([picture, crypto.randomBytes(2000)]);
      fs.writeFileSync(path.join(dir, name), bytes);
      files.set(name, bytes);
    }
    const prefix = `move-killed-${crypto.randomBytes(4).toString('hex')}/`;
    const env = { ...process.env, UPLOAD_DIR: dir, ...fake.settings(prefix) };
    const run = (killAfter: number | null) =>
      new Promise<{ lines: { photo?: string; outcome?: string; summary?: unknown }[]; code: number | null; signal: string | null }>(
        (resolve) => {
          const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/move-photos.ts'], {
            cwd: projectRoot,
            env,
            stdio: ['ignore', 'pipe', 'ignore'],
          });
          const lines: { photo?: string; outcome?: string; summary?: unknown }[] = [];
          readline.createInterface({ input: child.stdout }).on('line', (line) => {
            lines.push(JSON.parse(line));
            if (killAfter !== null && lines.filter((l) => l.outcome === 'copied').length === killAfter) child.kill('SIGKILL');
          });
          child.on('exit', (code, signal) => resolve({ lines, code, signal }));
        },
      );
    try {
      const killed = await run(3);
      expect(killed.signal).toBe('SIGKILL');
      const leftAfterKill = fs.readdirSync(dir).filter((f) => f.endsWith('.jpg')).length;
      expect(leftAfterKill).toBeGreaterThan(0);
      expect(leftAfterKill).toBeLessThan(40);

      const resumed = await run(null);
      expect(resumed.code).toBe(0);
      expect(resumed.lines.at(-1)?.summary).toMatchObject({ failed: 0, left: 0 });
      expect(fs.readdirSync(dir).filter((f) => f.endsWith('.jpg'))).toEqual([]);

      // Each photo was PUT once across both runs, and the bucket holds its exact bytes.
      const created = fake.events.filter((e) => e.kind.startsWith('ObjectCreated') && e.key.startsWith(prefix)).map((e) => e.key);
      expect(created.sort()).toEqual([...files.keys()].map((n) => `${prefix}${n}`).sort());
      const target = new S3PhotoStore(s3SettingsFrom(testConfig(fake.settings(prefix))));
      try {
        for (const [name, bytes] of files) expect((await target.read(name))?.equals(bytes), name).toBe(true);
      } finally {
        target.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
