import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import multer from 'multer';
import sharp from 'sharp';
import type { RequestHandler } from 'express';
import { AppError } from './errors';
import type { Config } from '../config';
import { MAX_PHOTOS, MAX_PHOTO_BYTES, PHOTO_FIELD } from '../../shared/schemas/tickets';

/**
 * Photo uploads. multer keeps the parts in memory with hard limits (its own defaults are
 * Infinity); nothing touches the disk until the content has been checked and re-encoded.
 * Files get random names in UPLOAD_DIR, which no static route serves.
 */
export const PHOTO_LIMITS = {
  fileSize: MAX_PHOTO_BYTES,
  files: MAX_PHOTOS,
  // The report JSON is one text field; a couple more leave room without inviting floods.
  fields: 4,
  fieldSize: 64 * 1024,
  parts: MAX_PHOTOS + 4,
  headerPairs: 200,
};

/** A 12-megapixel phone photo is ~12 MP; anything beyond this is refused before decoding. */
export const MAX_INPUT_PIXELS = 50_000_000;
const MAX_EDGE = 2560;
const THUMB_EDGE = 480;

export function photoUploadMiddleware(): RequestHandler {
  return multer({ storage: multer.memoryStorage(), limits: PHOTO_LIMITS }).array(PHOTO_FIELD, MAX_PHOTOS);
}

export function uploadDir(config: Pick<Config, 'UPLOAD_DIR'>): string {
  return path.resolve(config.UPLOAD_DIR);
}

type Sniffed = 'jpeg' | 'png' | 'webp' | 'heif';

/** The type by its first bytes, whatever the name or declared type says. */
export function sniffImageType(buffer: Buffer): Sniffed | null {
  if (buffer.length >= 3 && buffer[0] === 0xff && buffer[1] === 0xd8 && buffer[2] === 0xff) return 'jpeg';
  if (buffer.length >= 8 && buffer.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return 'png';
  if (buffer.length >= 12 && buffer.toString('latin1', 0, 4) === 'RIFF' && buffer.toString('latin1', 8, 12) === 'WEBP') return 'webp';
  if (buffer.length >= 12 && buffer.toString('latin1', 4, 8) === 'ftyp') {
    const brand = buffer.toString('latin1', 8, 12);
    if (['heic', 'heix', 'hevc', 'heim', 'heis', 'mif1', 'msf1', 'avif', 'avis'].includes(brand)) return 'heif';
  }
  return null;
}

export interface StoredPhoto {
  storedName: string;
  thumbName: string;
  mime: 'image/jpeg';
  width: number;
  height: number;
  bytes: number;
}

export interface IncomingFile {
  buffer: Buffer;
  originalname?: string;
}

const unsupported = (index: number) =>
  new AppError(415, 'unsupported_media_type', `Photo ${index + 1} is not a picture Faultline can read. Send JPEG, PNG or WebP photos.`, {
    photos: ['Only JPEG, PNG, WebP (and HEIF/AVIF where supported) pictures are accepted.'],
  });

async function reencode(file: IncomingFile, index: number): Promise<{ full: Buffer; thumb: Buffer; width: number; height: number }> {
  const kind = sniffImageType(file.buffer);
  if (!kind) throw unsupported(index);
  // limitInputPixels stops a tiny file that claims gigantic dimensions (pixel flood) before decoding.
  const input = () => sharp(file.buffer, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error', sequentialRead: true });
  let format: string | undefined;
  try {
    format = (await input().metadata()).format;
  } catch (error) {
    throw refusal(error, index);
  }
  const expected = kind === 'heif' ? 'heif' : kind;
  if (format !== expected) throw unsupported(index);
  try {
    // rotate() with no angle applies the EXIF orientation; the JPEG encoder then writes no
    // metadata at all (sharp drops it unless asked), so camera position and serials are gone.
    const { data: full, info } = await input()
      .rotate()
      .resize({ width: MAX_EDGE, height: MAX_EDGE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 82, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    const thumb = await sharp(full)
      .resize({ width: THUMB_EDGE, height: THUMB_EDGE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 72 })
      .toBuffer();
    return { full, thumb, width: info.width, height: info.height };
  } catch (error) {
    throw refusal(error, index);
  }
}

function refusal(error: unknown, index: number): AppError {
  const message = error instanceof Error ? error.message : '';
  if (/pixel limit/i.test(message)) {
    return new AppError(413, 'upload_too_large', `Photo ${index + 1} has too many pixels.`, {
      photos: ['The picture is too large in pixels.'],
    });
  }
  return unsupported(index);
}

const randomName = (suffix: string) => `${crypto.randomBytes(18).toString('base64url')}${suffix}.jpg`;

/**
 * Checks, re-encodes and writes the photos. Either every photo is written, or none is left
 * behind: on any failure the files already written are removed before the error goes on.
 */
export async function storePhotos(config: Pick<Config, 'UPLOAD_DIR'>, files: readonly IncomingFile[]): Promise<StoredPhoto[]> {
  if (files.length === 0) return [];
  const dir = uploadDir(config);
  const stored: StoredPhoto[] = [];
  try {
    // Decode everything first: a bad last photo fails the request before the disk is touched.
    const encoded = [];
    for (const [index, file] of files.entries()) encoded.push(await reencode(file, index));
    await fs.mkdir(dir, { recursive: true });
    for (const photo of encoded) {
      const storedName = randomName('');
      const thumbName = randomName('-t');
      // Registered before writing, so a failure half-way still cleans up both names.
      stored.push({ storedName, thumbName, mime: 'image/jpeg', width: photo.width, height: photo.height, bytes: photo.full.length });
      await fs.writeFile(path.join(dir, storedName), photo.full, { flag: 'wx', mode: 0o640 });
      await fs.writeFile(path.join(dir, thumbName), photo.thumb, { flag: 'wx', mode: 0o640 });
    }
    return stored;
  } catch (error) {
    await removePhotos(config, stored);
    throw error;
  }
}

export async function removePhotos(config: Pick<Config, 'UPLOAD_DIR'>, photos: readonly Pick<StoredPhoto, 'storedName' | 'thumbName'>[]) {
  const dir = uploadDir(config);
  await Promise.all(photos.flatMap((p) => [p.storedName, p.thumbName]).map((name) => fs.rm(path.join(dir, name), { force: true })));
}

const SAFE_NAME = /^[A-Za-z0-9_-]{20,60}(-t)?\.jpg$/;

/** Reads a stored photo by its generated name (never a path from the request). */
export async function readPhoto(config: Pick<Config, 'UPLOAD_DIR'>, name: string): Promise<Buffer> {
  if (!SAFE_NAME.test(name)) throw new AppError(404, 'not_found', 'That photo was not found.');
  try {
    return await fs.readFile(path.join(uploadDir(config), name));
  } catch {
    throw new AppError(404, 'not_found', 'That photo file is missing.');
  }
}
