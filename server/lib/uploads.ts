import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import multer from 'multer';
import sharp from 'sharp';
import type { RequestHandler } from 'express';
import { AppError } from './errors';
import type { Logger } from './logger';
import type { Config } from '../config';
import type { PhotoStore } from './storage/photo-store';
import { PHOTO_NAME } from './storage/local-store';
import { MAX_PHOTOS, MAX_PHOTO_BYTES, PHOTO_FIELD } from '../../shared/schemas/tickets';

/**
 * Photo uploads. multer streams each part to a file in UPLOAD_DIR/incoming (never into memory),
 * with hard limits (its own defaults are Infinity); the content is checked and re-encoded from
 * there and saved in the photo store (the local folder or a bucket: server/lib/storage), and
 * the ticket's transaction links the results. Nothing is served but through the photo route;
 * every name is random. Whatever a crash leaves in incoming/, or in the store without a photo
 * row, is removed by the sweep (sweepUploads) once it is an hour old.
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

// Photos are read once from their part files, which are deleted right after: libvips must not
// keep them open in its cache (the disk space would stay in use until the handle closed).
sharp.cache({ files: 0 });

/** A 12-megapixel phone photo is ~12 MP; anything beyond this is refused before decoding. */
export const MAX_INPUT_PIXELS = 50_000_000;
/** The longest edge kept: enough to read a display or a label, a quarter of a phone's pixels. */
export const MAX_EDGE = 2560;
const THUMB_EDGE = 480;
/**
 * libjpeg-turbo at quality 82 (not mozjpeg): mozjpeg's trellis search made a six-photo report
 * take ~10 s of server time for 15 % smaller files (docs/decisions/0006-photo-processing.md).
 */
const JPEG_OPTIONS = { quality: 82, mozjpeg: false } as const;

export function uploadDir(config: Pick<Config, 'UPLOAD_DIR'>): string {
  return path.resolve(config.UPLOAD_DIR);
}
/** Parts as they arrive (multer writes here, whichever photo store is in use). */
export const incomingDir = (config: Pick<Config, 'UPLOAD_DIR'>) => path.join(uploadDir(config), 'incoming');

/** Busboy's own refusals of a body it cannot parse; anything else (a disk error) is ours. */
function isClientMultipartError(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  const code = (error as NodeJS.ErrnoException).code;
  if (typeof code === 'string' && code !== 'ECONNRESET' && code !== 'ECONNABORTED') return false;
  return true;
}

const ABORTED = /^Request (aborted|closed)$/;

/**
 * multer, writing to disk, with its parse failures turned into 400s: a truncated body
 * ("Unexpected end of form"), a malformed part header, a missing boundary or a multipart type
 * other than form-data are the client's mistakes, and an upload the client gave up on is
 * logged as such, not as a server error. The temporary part files go when the answer has gone.
 */
export function photoUploadMiddleware(config: Pick<Config, 'UPLOAD_DIR'>, log: Logger): RequestHandler {
  const dir = incomingDir(config);
  const storage = multer.diskStorage({
    destination: (_req, _file, cb) => {
      fs.mkdir(dir, { recursive: true }).then(
        () => cb(null, dir),
        (error: Error) => cb(error, dir),
      );
    },
    filename: (_req, _file, cb) => cb(null, `${crypto.randomBytes(18).toString('base64url')}.part`),
  });
  const handler = multer({ storage, limits: PHOTO_LIMITS }).array(PHOTO_FIELD, MAX_PHOTOS);
  return (req, res, next) => {
    res.once('close', () => void removeIncoming(req.files));
    handler(req, res, (error?: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError || error instanceof AppError) return next(error);
      if (!isClientMultipartError(error)) return next(error);
      const message = (error as Error).message;
      if (ABORTED.test(message) || req.destroyed) {
        log.info({ route: `${req.method} ${req.originalUrl}`, userId: req.user?.id }, 'upload aborted by the client');
        return next(
          new AppError(
            400,
            'upload_aborted',
            'The upload was interrupted before it was complete. Nothing was saved; please send it again.',
          ),
        );
      }
      next(
        new AppError(
          400,
          'upload_malformed',
          'The upload could not be read. Send the report as multipart/form-data with a `report` field and up to six `photos`.',
          {
            body: [`Not a readable multipart/form-data body (${message.slice(0, 80)}).`],
          },
        ),
      );
    });
  };
}

async function removeIncoming(files: unknown) {
  if (!Array.isArray(files)) return;
  await Promise.all(files.map((f: { path?: string }) => (f.path ? fs.rm(f.path, { force: true }) : undefined)));
}

/**
 * At most `perAccount` uploads of one account and `overall` uploads in all are received at
 * once by this process; beyond that the request is refused before a byte of it is read
 * (429 for one account's excess, 503 when the whole server is busy), so memory and disk in
 * use stay bounded whatever the clients do. JSON reports without photos are not counted.
 */
export class UploadSlots {
  private perUser = new Map<string, number>();
  private total = 0;

  constructor(readonly limits: { perAccount: number; overall: number }) {}

  get inUse() {
    return this.total;
  }

  middleware(): RequestHandler {
    return (req, res, next) => {
      if (!req.is('multipart')) return next();
      const who = req.user ? `user:${req.user.id}` : `ip:${req.ip}`;
      const mine = this.perUser.get(who) ?? 0;
      if (mine >= this.limits.perAccount) {
        res.setHeader('Retry-After', '5');
        return next(
          new AppError(
            429,
            'uploads_in_progress',
            `You already have ${mine} uploads in progress. Wait until they have finished, then send this one again.`,
          ),
        );
      }
      if (this.total >= this.limits.overall) {
        res.setHeader('Retry-After', '5');
        return next(
          new AppError(
            503,
            'uploads_busy',
            'The server is receiving many photos right now. Nothing was saved; please send the report again in a few seconds.',
          ),
        );
      }
      this.perUser.set(who, mine + 1);
      this.total++;
      let released = false;
      // 'close' fires once the answer is sent or the client went away, whichever comes first.
      res.once('close', () => {
        if (released) return;
        released = true;
        this.total--;
        const left = (this.perUser.get(who) ?? 1) - 1;
        if (left > 0) this.perUser.set(who, left);
        else this.perUser.delete(who);
      });
      next();
    };
  }
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

/** A part multer wrote to disk (only the path is read; the declared name and type are not trusted). */
export interface IncomingFile {
  path: string;
  originalname?: string;
}

const unsupported = (index: number) =>
  new AppError(415, 'unsupported_media_type', `Photo ${index + 1} is not a picture Faultline can read. Send JPEG, PNG or WebP photos.`, {
    photos: ['Only JPEG, PNG, WebP (and HEIF/AVIF where supported) pictures are accepted.'],
  });

async function firstBytes(file: string, count: number): Promise<Buffer> {
  const handle = await fs.open(file, 'r');
  try {
    const buffer = Buffer.alloc(count);
    const { bytesRead } = await handle.read(buffer, 0, count, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

async function reencode(file: IncomingFile, index: number): Promise<{ full: Buffer; thumb: Buffer; width: number; height: number }> {
  const kind = sniffImageType(await firstBytes(file.path, 16));
  if (!kind) throw unsupported(index);
  // limitInputPixels stops a tiny file that claims gigantic dimensions (pixel flood) before decoding.
  const input = () => sharp(file.path, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error', sequentialRead: true });
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
      .jpeg(JPEG_OPTIONS)
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

/**
 * How many photos this process decodes at once, across all requests. Two keep both cores of
 * a small server busy (libvips threads within each) while bounding the decoded pixels held in
 * memory to two photos' worth, however many reports arrive together.
 */
export const PHOTO_DECODERS = 2;
let decoding = 0;
const waiting: (() => void)[] = [];

async function withDecoder<T>(work: () => Promise<T>): Promise<T> {
  if (decoding >= PHOTO_DECODERS) await new Promise<void>((resolve) => waiting.push(resolve));
  else decoding++;
  try {
    return await work();
  } finally {
    const next = waiting.shift();
    if (next) next();
    else decoding--;
  }
}

const randomName = (suffix: string) => `${crypto.randomBytes(18).toString('base64url')}${suffix}.jpg`;

/**
 * Checks and re-encodes the photos (up to PHOTO_DECODERS at once) and saves the results in the
 * photo store under their final names. Either every photo is saved, or none is left behind.
 * They are served only once linkPhotos has run inside the ticket's transaction.
 */
export async function storePhotos(store: PhotoStore, files: readonly IncomingFile[]): Promise<StoredPhoto[]> {
  if (files.length === 0) return [];
  const stored: StoredPhoto[] = [];
  try {
    // Decode everything first: a bad photo fails the request before the disk is touched.
    const settled = await Promise.allSettled(files.map((file, index) => withDecoder(() => reencode(file, index))));
    const failed = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (failed) throw failed.reason;
    const encoded = settled.map((r) => (r as PromiseFulfilledResult<Awaited<ReturnType<typeof reencode>>>).value);
    for (const photo of encoded) {
      const storedName = randomName('');
      const thumbName = randomName('-t');
      // Registered before writing, so a failure half-way still cleans up both names.
      stored.push({ storedName, thumbName, mime: 'image/jpeg', width: photo.width, height: photo.height, bytes: photo.full.length });
      await store.save(storedName, photo.full);
      await store.save(thumbName, photo.thumb);
    }
    return stored;
  } catch (error) {
    // A store that is down may refuse the clean-up too; the sweep takes what is left.
    await removePhotos(store, stored).catch(() => undefined);
    throw error;
  }
}

/**
 * Makes saved photos servable. Call it inside the transaction that inserts their rows, after
 * the insert: a crash before the commit leaves files the sweep removes, and a rolled-back
 * transaction is followed by removePhotos.
 */
export async function linkPhotos(store: PhotoStore, photos: readonly Pick<StoredPhoto, 'storedName' | 'thumbName'>[]) {
  await store.link(photos.flatMap((p) => [p.storedName, p.thumbName]));
}

/** Removes photos wherever they are (saved or linked). */
export async function removePhotos(store: PhotoStore, photos: readonly Pick<StoredPhoto, 'storedName' | 'thumbName'>[]) {
  await store.remove(photos.flatMap((p) => [p.storedName, p.thumbName]));
}

/** Opens a stored photo by its generated name (never a path from the request). */
export async function openPhoto(store: PhotoStore, name: string) {
  if (!PHOTO_NAME.test(name)) throw new AppError(404, 'not_found', 'That photo was not found.');
  const opened = await store.open(name);
  if (!opened) throw new AppError(404, 'not_found', 'That photo file is missing.');
  return opened;
}

/** Files younger than this are left alone by the sweep: their upload may still be under way. */
export const SWEEP_MIN_AGE_MS = 60 * 60_000;

/**
 * Removes what a crash (or kill -9) left behind, once it is SWEEP_MIN_AGE_MS old: part files
 * in incoming/ (always local), and in the photo store photos saved but never linked or linked
 * by no row. `isLinked` answers, for a list of names, those that a row names.
 */
export async function sweepUploads(
  config: Pick<Config, 'UPLOAD_DIR'>,
  store: PhotoStore,
  isLinked: (names: string[]) => Promise<Set<string>>,
  now = Date.now(),
): Promise<{ removed: string[] }> {
  const removed: string[] = [];
  const dir = incomingDir(config);
  let entries: import('node:fs').Dirent[] = [];
  try {
    entries = await fs.readdir(dir, { withFileTypes: true });
  } catch {
    entries = [];
  }
  for (const entry of entries) {
    const file = path.join(dir, entry.name);
    if (!entry.isFile()) continue;
    const mtime = await fs.stat(file).then(
      (s) => s.mtimeMs,
      () => now,
    );
    if (now - mtime < SWEEP_MIN_AGE_MS) continue;
    await fs.rm(file, { force: true });
    removed.push(file);
  }
  removed.push(...(await store.sweep(isLinked, now, SWEEP_MIN_AGE_MS)));
  return { removed };
}
