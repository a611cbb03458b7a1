import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import zlib from 'node:zlib';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { makeTool } from './facility-fixtures';
import { changeState } from '../../server/modules/facility/state.service';

// Cheap requests: compressed answers, hashed assets cached for good, a board that answers 304
// while nothing changed, and a pool that queues a burst of reads instead of failing them.

let server: TestServer;
let cookie: string;
let distDir: string;
const assetName = 'app-3f9a1c2e.js';
const assetText = `// a built client file\n${'export const line = "the same words again and again";\n'.repeat(200)}`;

beforeAll(async () => {
  // A small stand-in for vite's output: an app shell and one content-hashed asset.
  distDir = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-dist-'));
  fs.mkdirSync(path.join(distDir, 'assets'));
  fs.writeFileSync(
    path.join(distDir, 'index.html'),
    `<!doctype html><html><head><script type="module" src="/assets/${assetName}"></script></head><body></body></html>`,
  );
  fs.writeFileSync(path.join(distDir, 'assets', assetName), assetText);
  server = await startTestServer({}, { serveClient: true, distDir });
  cookie = (await signedInClient(server.url, 'member')).client.cookie!;
});
afterAll(async () => {
  await server.close();
  fs.rmSync(distDir, { recursive: true, force: true });
});

/** A raw GET, so the test sees the bytes and headers as sent (fetch would decompress). */
function get(url: string, headers: Record<string, string>): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode!, headers: res.headers, body: Buffer.concat(chunks) }));
      })
      .on('error', reject);
  });
}

const decode = (encoding: string | undefined, body: Buffer) =>
  (encoding === 'br' ? zlib.brotliDecompressSync(body) : encoding === 'gzip' ? zlib.gunzipSync(body) : body).toString('utf8');

describe('compression', () => {
  for (const encoding of ['gzip', 'br']) {
    it(`when a client accepts ${encoding}, then the board and a built asset come ${encoding}-compressed and decode to the plain answer`, async () => {
      const plainBoard = await get(`${server.url}/api/board`, { cookie, 'accept-encoding': 'identity' });
      const board = await get(`${server.url}/api/board`, { cookie, 'accept-encoding': encoding });
      expect(board.status).toBe(200);
      expect(board.headers['content-encoding']).toBe(encoding);
      expect(board.body.length).toBeLessThan(plainBoard.body.length);
      expect(JSON.parse(decode(encoding, board.body))).toEqual(JSON.parse(plainBoard.body.toString('utf8')));

      const asset = await get(`${server.url}/assets/${assetName}`, { 'accept-encoding': encoding });
      expect(asset.status).toBe(200);
      expect(asset.headers['content-encoding']).toBe(encoding);
      expect(decode(encoding, asset.body)).toBe(assetText);
    });
  }

  it('when a client sends no Accept-Encoding, then the answer is not compressed', async () => {
    const board = await get(`${server.url}/api/board`, { cookie });
    expect(board.headers['content-encoding']).toBeUndefined();
    expect(() => JSON.parse(board.body.toString('utf8'))).not.toThrow();
  });
});

describe('caching', () => {
  it('when a hashed asset is served, then it may be cached for a year as immutable; the app shell is not', async () => {
    const asset = await get(`${server.url}/assets/${assetName}`, {});
    expect(asset.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    const shell = await get(`${server.url}/board`, {});
    expect(shell.status).toBe(200);
    expect(shell.headers['cache-control']).not.toContain('immutable');
  });

  it('when the board is asked again with its ETag, then 304 while nothing changed and 200 with a new ETag after a change', async () => {
    const { tool } = await makeTool(server.deps.sequelize);
    const first = await get(`${server.url}/api/board`, { cookie, 'accept-encoding': 'gzip' });
    const etag = first.headers.etag!;
    expect(etag).toBeTruthy();
    expect(first.headers['cache-control']).toBe('private, no-cache');

    const again = await get(`${server.url}/api/board`, { cookie, 'accept-encoding': 'gzip', 'if-none-match': etag });
    expect(again.status).toBe(304);
    expect(again.body.length).toBe(0);

    await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Qualification', actorId: null });
    const changed = await get(`${server.url}/api/board`, { cookie, 'accept-encoding': 'gzip', 'if-none-match': etag });
    expect(changed.status).toBe(200);
    expect(changed.headers.etag).not.toBe(etag);
    const entry = JSON.parse(decode('gzip', changed.body))
      .areas.flatMap((a: any) => a.tools)
      .find((t: any) => t.id === tool.id);
    expect(entry.state).toBe('engineering');
  });
});

describe('a burst of reads', () => {
  it('when 120 boards are asked at once of a server with one database connection, then every one is answered 200, none 503', async () => {
    const narrow = await startTestServer({ DB_POOL_MAX: '1' });
    try {
      const statuses = await Promise.all(
        Array.from({ length: 120 }, () => get(`${narrow.url}/api/board`, { cookie, 'accept-encoding': 'gzip' }).then((r) => r.status)),
      );
      expect(statuses.filter((s) => s !== 200)).toEqual([]);
    } finally {
      await narrow.close();
    }
  });
});
