import crypto from 'node:crypto';
import type { Readable } from 'node:stream';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { AppError } from '../errors';
import type { Config } from '../../config';
import type { PhotoStore } from './photo-store';
import { PHOTO_NAME } from './local-store';

export interface S3Settings {
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  forcePathStyle: boolean;
  prefix: string;
}

export function s3SettingsFrom(config: Config): S3Settings {
  if (!config.S3_BUCKET) throw new Error('S3_BUCKET is not set');
  return {
    endpoint: config.S3_ENDPOINT,
    bucket: config.S3_BUCKET,
    region: config.S3_REGION,
    accessKeyId: config.S3_ACCESS_KEY_ID,
    secretAccessKey: config.S3_SECRET_ACCESS_KEY,
    forcePathStyle: config.S3_FORCE_PATH_STYLE,
    prefix: config.S3_PREFIX,
  };
}

/** The store could not be reached or refused us: the request fails clearly, nothing is saved. */
export class PhotoStorageUnavailable extends AppError {
  constructor(cause: unknown) {
    super(
      503,
      'photo_storage_unavailable',
      'The photo storage is not reachable right now. Nothing was saved; please try again in a moment.',
    );
    this.cause = cause;
  }
}

const isMissing = (error: unknown) =>
  error instanceof S3ServiceException &&
  (error.name === 'NoSuchKey' || error.name === 'NotFound' || error.$metadata.httpStatusCode === 404);

/** An MD5 as S3 reports it for an object written in one PUT (quoted hex), to compare with a local file's. */
export const md5Hex = (data: Buffer) => crypto.createHash('md5').update(data).digest('hex');

/**
 * Photos as objects `<prefix><name>` in one bucket. A photo is written under its final key
 * before the transaction: `link` has nothing to do, so the transaction holds its locks no
 * longer than with local files. What a crash leaves is an object no row names, which `sweep`
 * finds by listing the prefix (the same rule as the local folder's).
 */
export class S3PhotoStore implements PhotoStore {
  readonly kind = 's3';
  readonly client: S3Client;

  constructor(readonly settings: S3Settings) {
    this.client = new S3Client({
      endpoint: settings.endpoint,
      region: settings.region,
      forcePathStyle: settings.forcePathStyle,
      credentials:
        settings.accessKeyId && settings.secretAccessKey
          ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey }
          : undefined,
      // Checksums only where the API demands them: several S3-compatible stores refuse (or
      // store verbatim) the chunked trailing checksums newer SDKs send by default. Integrity of
      // each PUT is still checked, by Content-MD5.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      // A store that does not answer fails the request in seconds instead of holding an upload slot.
      requestHandler: { connectionTimeout: 5_000, requestTimeout: 30_000 },
    });
  }

  key(name: string) {
    return `${this.settings.prefix}${name}`;
  }

  private async call<T>(work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      if (error instanceof AppError) throw error;
      throw new PhotoStorageUnavailable(error);
    }
  }

  async save(name: string, data: Buffer) {
    await this.put(name, data);
  }

  /** One PUT; the store checks the bytes against Content-MD5 and refuses a damaged body. */
  async put(name: string, data: Buffer) {
    await this.call(() =>
      this.client.send(
        new PutObjectCommand({
          Bucket: this.settings.bucket,
          Key: this.key(name),
          Body: data,
          ContentLength: data.length,
          ContentType: 'image/jpeg',
          ContentMD5: crypto.createHash('md5').update(data).digest('base64'),
        }),
      ),
    );
  }

  async link() {
    // Written under the final key already; the photo row that now names it is what makes it served.
  }

  async remove(names: readonly string[]) {
    await this.call(() =>
      Promise.all(names.map((name) => this.client.send(new DeleteObjectCommand({ Bucket: this.settings.bucket, Key: this.key(name) })))),
    );
  }

  async open(name: string) {
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.settings.bucket, Key: this.key(name) }));
      return { body: out.Body as Readable, size: Number(out.ContentLength ?? 0) };
    } catch (error) {
      if (isMissing(error)) return null;
      throw new PhotoStorageUnavailable(error);
    }
  }

  /** Size and ETag (unquoted) of a stored photo, or null when there is none. */
  async stat(name: string): Promise<{ size: number; etag: string } | null> {
    try {
      const out = await this.client.send(new HeadObjectCommand({ Bucket: this.settings.bucket, Key: this.key(name) }));
      return { size: Number(out.ContentLength ?? -1), etag: (out.ETag ?? '').replace(/"/g, '') };
    } catch (error) {
      if (isMissing(error)) return null;
      throw new PhotoStorageUnavailable(error);
    }
  }

  /** The whole object, read back (to verify a copy where the ETag is not an MD5). */
  async read(name: string): Promise<Buffer | null> {
    const opened = await this.open(name);
    if (!opened) return null;
    const chunks: Buffer[] = [];
    for await (const chunk of opened.body) chunks.push(chunk as Buffer);
    return Buffer.concat(chunks);
  }

  async sweep(isLinked: (names: string[]) => Promise<Set<string>>, now: number, minAgeMs: number) {
    const removed: string[] = [];
    let token: string | undefined;
    do {
      const page = await this.call(() =>
        this.client.send(
          new ListObjectsV2Command({ Bucket: this.settings.bucket, Prefix: this.settings.prefix, ContinuationToken: token, MaxKeys: 1000 }),
        ),
      );
      const candidates = (page.Contents ?? [])
        .filter((o) => o.Key && o.LastModified && now - o.LastModified.getTime() >= minAgeMs)
        .map((o) => o.Key!.slice(this.settings.prefix.length))
        .filter((name) => PHOTO_NAME.test(name));
      if (candidates.length) {
        const linked = await isLinked(candidates);
        const orphans = candidates.filter((name) => !linked.has(name));
        await this.remove(orphans);
        removed.push(...orphans.map((name) => this.key(name)));
      }
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
    return removed;
  }

  close() {
    this.client.destroy();
  }
}
