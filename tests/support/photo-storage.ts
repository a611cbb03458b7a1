import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { ListObjectsV2Command, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { projectRoot } from './env';
import { unique } from './factories';

/** The two photo stores every photo test runs against (describe.each). */
export const PHOTO_BACKENDS = ['local', 's3'] as const;
export type PhotoBackendKind = (typeof PHOTO_BACKENDS)[number];

/** s3rver's fixed credentials: it checks every request's signature against them. */
const FAKE_KEY = 'S3RVER';
const BUCKET = 'faultline-photos';

/**
 * A fake S3 server (s3rver, an npm package made for tests) on an ephemeral loopback port,
 * keeping its objects in a folder of its own. `events` records every object it created or
 * removed, as the store itself saw it.
 */
export async function startFakeS3() {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-s3-'));
  const fake = new S3rver({
    address: '127.0.0.1',
    port: 0,
    silent: true,
    directory,
    configureBuckets: [{ name: BUCKET, configs: [] }],
  });
  const { port } = await fake.run();
  const events: { kind: string; key: string }[] = [];
  (fake as unknown as NodeJS.EventEmitter).on('event', (e: { Records: { eventName: string; s3: { object: { key: string } } }[] }) => {
    for (const r of e.Records) events.push({ kind: r.eventName, key: r.s3.object.key });
  });
  const endpoint = `http://127.0.0.1:${port}`;
  const client = new S3Client({
    endpoint,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: { accessKeyId: FAKE_KEY, secretAccessKey: FAKE_KEY },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  return {
    endpoint,
    bucket: BUCKET,
    client,
    events,
    /** Server settings that select this bucket, under a prefix of the caller's. */
    settings(prefix: string): Record<string, string> {
      return {
        PHOTO_STORAGE: 's3',
        S3_ENDPOINT: endpoint,
        S3_BUCKET: BUCKET,
        S3_REGION: 'us-east-1',
        S3_ACCESS_KEY_ID: FAKE_KEY,
        S3_SECRET_ACCESS_KEY: FAKE_KEY,
        S3_FORCE_PATH_STYLE: 'true',
        S3_PREFIX: prefix,
      };
    },
    async keys(prefix: string): Promise<string[]> {
      const out: string[] = [];
      let token: string | undefined;
      do {
        const page = await client.send(new ListObjectsV2Command({ Bucket: BUCKET, Prefix: prefix, ContinuationToken: token }));
        out.push(...(page.Contents ?? []).map((o) => o.Key!));
        token = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (token);
      return out.sort();
    },
    async put(key: string, body: Buffer | string) {
      await client.send(new PutObjectCommand({ Bucket: BUCKET, Key: key, Body: body }));
    },
    /** Sets an object's time as the fake reports it (LastModified is its file's mtime). */
    age(key: string, when: Date) {
      const file = path.join(directory, BUCKET, `${key}._S3rver_object`);
      fs.utimesSync(file, when, when);
    },
    async close() {
      client.destroy();
      await fake.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

export type FakeS3 = Awaited<ReturnType<typeof startFakeS3>>;

/**
 * One photo store for a test file: its own upload folder, and (for 's3') its own prefix in
 * the fake bucket. The helpers look at what is stored the way each store keeps it.
 */
export async function photoBackend(kind: PhotoBackendKind, label: string, fake?: FakeS3) {
  const dir = path.join(projectRoot, 'test-results', unique(label));
  const prefix = `${unique(label)}/`;
  const s3 = kind === 's3' ? (fake ?? (await startFakeS3())) : null;
  const ownsFake = kind === 's3' && !fake;
  const localFiles = (sub = '') => {
    const base = path.join(dir, sub);
    return fs.existsSync(base)
      ? (fs.readdirSync(base, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(base, f)).isFile()).sort()
      : [];
  };
  return {
    kind,
    dir,
    prefix,
    fake: s3,
    /** Server settings for this store. */
    overrides: { UPLOAD_DIR: dir, ...(s3 ? s3.settings(prefix) : {}) } as Record<string, string>,
    /** Every stored file or object: part files in incoming/ and every photo, linked or not. */
    async everything(): Promise<string[]> {
      if (!s3) return localFiles();
      return [...localFiles().map((f) => `local:${f}`), ...(await s3.keys(prefix)).map((k) => `s3:${k}`)];
    },
    /** Photo (.jpg) files or objects, linked or not. */
    async photos(): Promise<string[]> {
      return (await this.everything()).filter((f) => f.endsWith('.jpg'));
    },
    /** The stored bytes of a linked photo. */
    async read(name: string): Promise<Buffer> {
      if (!s3) return fs.readFileSync(path.join(dir, name));
      const { GetObjectCommand } = await import('@aws-sdk/client-s3');
      const out = await s3.client.send(new GetObjectCommand({ Bucket: s3.bucket, Key: `${prefix}${name}` }));
      return Buffer.from(await out.Body!.transformToByteArray());
    },
    /** Whether a linked photo (or a planted one) is there. */
    async has(name: string): Promise<boolean> {
      if (!s3) return fs.existsSync(path.join(dir, name));
      return (await s3.keys(`${prefix}${name}`)).includes(`${prefix}${name}`);
    },
    /**
     * Puts a file or object as a crash would leave it, with no row naming it: locally in
     * pending/ (saved, never linked) or in the folder itself (linked, then rolled back).
     */
    async plant(name: string, when: Date | null, where: 'pending' | 'linked' = 'pending') {
      if (!s3) {
        const file = path.join(dir, where === 'pending' ? 'pending' : '', name);
        fs.mkdirSync(path.dirname(file), { recursive: true });
        fs.writeFileSync(file, 'left by a killed upload');
        if (when) fs.utimesSync(file, when, when);
        return;
      }
      await s3.put(`${prefix}${name}`, 'left by a killed upload');
      if (when) s3.age(`${prefix}${name}`, when);
    },
    /** Whether anything of this name is stored (linked or not). */
    async holds(name: string): Promise<boolean> {
      return (await this.everything()).some((f) => f === name || f.endsWith(`/${name}`));
    },
    /** Makes stored photos (all, or those named) look written at `when` (the sweep's age rule). */
    async age(when: Date, names?: string[]) {
      const wanted = (f: string) => !names || names.some((n) => f === n || f.endsWith(`/${n}`));
      for (const f of localFiles()) if (wanted(f)) fs.utimesSync(path.join(dir, f), when, when);
      if (s3) for (const key of await s3.keys(prefix)) if (wanted(key)) s3.age(key, when);
    },
    async close() {
      fs.rmSync(dir, { recursive: true, force: true });
      if (ownsFake) await s3?.close();
    },
  };
}

export type PhotoBackend = Awaited<ReturnType<typeof photoBackend>>;
