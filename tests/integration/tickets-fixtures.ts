import sharp from 'sharp';
import type { Sequelize } from 'sequelize';
import { StateInterval, type Tool, type ToolModule } from '../../server/modules/facility/facility.model';
import { makeTool } from './facility-fixtures';
import type { Criticality } from '../../shared/priority';
import type { TestClient } from '../support/client';

// Helpers for the ticket tests: tools made directly with the models (the facility API is
// another module's), real JPEG bytes from sharp, and a tiny EXIF reader to prove what a
// file carries.

export interface ToolFixture {
  tool: Tool;
  modules: ToolModule[];
}

/** A tool in a new area of its own, up since an hour ago (its tickets come later). */
export async function createTool(
  sequelize: Sequelize,
  opts: {
    criticality?: Criticality;
    primaryEngineerId?: number | null;
    backupEngineerId?: number | null;
    modules?: string[];
    name?: string;
  } = {},
): Promise<ToolFixture> {
  const { tool, modules } = await makeTool(sequelize, { ...opts, since: new Date(Date.now() - 60 * 60_000) });
  return { tool, modules };
}

export async function openState(toolId: number, moduleId: number | null = null) {
  return StateInterval.findOne({ where: { toolId, moduleId, endedAt: null } });
}

/** A real JPEG (a gradient, so re-encoding has something to do). */
export async function jpegBytes(width = 320, height = 200, opts: { gps?: boolean; orientation?: number } = {}) {
  const raw = Buffer.alloc(width * height * 3);
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++) raw.set([(x * 255) / width, (y * 255) / height, 128], (y * width + x) * 3);
  let img = sharp(raw, { raw: { width, height, channels: 3 } });
  if (opts.gps) {
    img = img.withExif({
      IFD0: { Make: 'Invented Camera Co', Model: 'Test phone 1' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '48/1 8/1 3000/100', GPSLongitudeRef: 'E', GPSLongitude: '11/1 34/1 0/1' },
    });
  }
  if (opts.orientation) img = img.withMetadata({ orientation: opts.orientation });
  return img.jpeg({ quality: 90 }).toBuffer();
}

/**
 * The tags of the EXIF block in a JPEG: IFD0 tag numbers and, when present, the GPS IFD's.
 * Enough of TIFF to answer "does this file say where it was taken?".
 */
export function exifTags(jpeg: Buffer): { ifd0: number[]; gps: number[] } | null {
  let offset = 2;
  while (offset + 4 < jpeg.length && jpeg[offset] === 0xff) {
    const marker = jpeg[offset + 1];
    const length = jpeg.readUInt16BE(offset + 2);
    if (marker === 0xe1 && jpeg.toString('latin1', offset + 4, offset + 10) === 'Exif\0\0') {
      const tiff = jpeg.subarray(offset + 10, offset + 2 + length);
      const le = tiff.toString('latin1', 0, 2) === 'II';
      const u16 = (o: number) => (le ? tiff.readUInt16LE(o) : tiff.readUInt16BE(o));
      const u32 = (o: number) => (le ? tiff.readUInt32LE(o) : tiff.readUInt32BE(o));
      const readIfd = (start: number) => {
        const count = u16(start);
        return Array.from({ length: count }, (_, i) => ({ tag: u16(start + 2 + i * 12), value: u32(start + 2 + i * 12 + 8) }));
      };
      const ifd0 = readIfd(u32(4));
      const gpsPointer = ifd0.find((e) => e.tag === 0x8825);
      return { ifd0: ifd0.map((e) => e.tag), gps: gpsPointer ? readIfd(gpsPointer.value).map((e) => e.tag) : [] };
    }
    if (marker === 0xda) break;
    offset += 2 + length;
  }
  return null;
}

export const GPS_LATITUDE_TAG = 0x0002;

export function reportBody(toolId: number, extra: Record<string, unknown> = {}) {
  return {
    toolId,
    category: 'alarm_interlock',
    description: 'Chamber pressure alarm and the process stopped mid-run',
    alarmText: 'ALM 2041 CHAMBER PRESSURE HIGH',
    impact: 'still_usable',
    hazards: [],
    wafersCount: 0,
    ...extra,
  };
}

export function multipartReport(body: unknown, photos: { bytes: Buffer; name: string; type?: string }[]) {
  const form = new FormData();
  form.append('report', JSON.stringify(body));
  for (const p of photos) form.append('photos', new Blob([new Uint8Array(p.bytes)], { type: p.type ?? 'image/jpeg' }), p.name);
  return form;
}

export async function fileReport(client: TestClient, toolId: number, extra: Record<string, unknown> = {}) {
  const r = await client.post('/api/tickets', reportBody(toolId, extra));
  if (r.status !== 201) throw new Error(`report failed: ${r.status} ${r.text}`);
  return r.body as { id: number; version: number; priority: string };
}

/**
 * Sends what is still queued before the server stops, so no test file leaves pending mail in
 * the shared outbox for the next file's worker to trip over.
 */
export async function drainOutbox(server: { worker: { runOnce: () => Promise<number>; stop: () => Promise<void> } }) {
  // Stop the background pass first, so only this loop claims rows while the server shuts down.
  await server.worker.stop();
  for (let i = 0; i < 50 && (await server.worker.runOnce()) > 0; i++);
}
