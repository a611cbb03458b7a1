import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import jsQR from 'jsqr';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import type { ToolLabel } from '../../shared/schemas/facility';
import { makeArea, makeTool } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  // A public address unlike the test server's own proves the labels use PUBLIC_URL.
  server = await startTestServer({ PUBLIC_URL: 'https://faultline.facility.test', COOKIE_SECURE: 'false' });
});
afterAll(() => server.close());

/** Renders the label's SVG to pixels and reads the QR code back, as a phone camera would. */
async function decode(svg: string): Promise<string | null> {
  const { data, info } = await sharp(Buffer.from(svg), { density: 300 })
    .resize(400, 400)
    .flatten({ background: '#ffffff' })
    .ensureAlpha()
    .raw()
    .toBuffer({ resolveWithObject: true });
  return jsQR(new Uint8ClampedArray(data.buffer, data.byteOffset, data.length), info.width, info.height)?.data ?? null;
}

describe('QR labels', () => {
  it('when a technician asks for an area’s labels, then each active tool has one whose QR code decodes to its page at the public URL', async () => {
    const { client } = await signedInClient(server.url, 'technician');
    const area = await makeArea();
    const a = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Label test aligner' });
    const b = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Label test coater' });
    const retired = await makeTool(server.deps.sequelize, { areaId: area.id, name: 'Label test retired' });
    await retired.tool.update({ retiredAt: new Date() });

    const r = await client.get(`/api/labels?areaId=${area.id}`);
    expect(r.status).toBe(200);
    const labels = r.body.items as ToolLabel[];
    expect(labels.map((l) => l.name)).toEqual(['Label test aligner', 'Label test coater']);
    for (const [label, tool] of [
      [labels[0], a.tool],
      [labels[1], b.tool],
    ] as const) {
      expect(label).toMatchObject({
        toolId: tool.id,
        code: tool.code,
        areaName: area.name,
        url: `https://faultline.facility.test/tools/${tool.code}`,
      });
      expect(label.svg.startsWith('<svg')).toBe(true);
      expect(await decode(label.svg)).toBe(`https://faultline.facility.test/tools/${tool.code}`);
    }
  });

  it('when a member asks for labels, then 403', async () => {
    const { client } = await signedInClient(server.url, 'member');
    expect((await client.get('/api/labels')).status).toBe(403);
  });
});
