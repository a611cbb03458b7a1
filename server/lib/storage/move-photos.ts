import fs from 'node:fs/promises';
import path from 'node:path';
import { PHOTO_NAME, list } from './local-store';
import { md5Hex, type S3PhotoStore } from './s3-store';

export type MoveOutcome = 'copied' | 'already_there' | 'failed';

export interface MoveSummary {
  copied: number;
  alreadyThere: number;
  failed: number;
  /** Photos still in the folder because the run stopped at its limit. */
  left: number;
}

/**
 * Moves the photos of a local upload folder into the bucket, one at a time, oldest name
 * order. For each photo: if the bucket already holds a verified copy (an earlier run was cut
 * off after copying), nothing is copied again; otherwise it is PUT once and read back. Only a
 * verified copy lets the local file go, so interrupting the run at any point and starting it
 * again continues where it stopped and copies no photo twice. `limit` stops after that many
 * copies (what is already there does not count).
 */
export async function movePhotos(opts: {
  dir: string;
  target: S3PhotoStore;
  limit?: number;
  onPhoto?: (name: string, outcome: MoveOutcome, detail?: string) => void;
}): Promise<MoveSummary> {
  const dir = path.resolve(opts.dir);
  // Only linked photos live in the folder itself; incoming/ and pending/ are the sweep's.
  const names = (await list(dir))
    .filter((e) => e.isFile() && PHOTO_NAME.test(e.name))
    .map((e) => e.name)
    .sort();
  const summary: MoveSummary = { copied: 0, alreadyThere: 0, failed: 0, left: 0 };
  for (const [index, name] of names.entries()) {
    const file = path.join(dir, name);
    let data: Buffer;
    try {
      data = await fs.readFile(file);
    } catch {
      continue; // gone meanwhile (another run, or the sweep)
    }
    try {
      if (await holdsCopy(opts.target, name, data)) {
        await fs.rm(file, { force: true });
        summary.alreadyThere++;
        opts.onPhoto?.(name, 'already_there');
        continue;
      }
      if (opts.limit !== undefined && summary.copied >= opts.limit) {
        summary.left = names.length - index;
        break;
      }
      await opts.target.put(name, data);
      if (!(await holdsCopy(opts.target, name, data))) throw new Error('the copy read back differs from the local file');
      await fs.rm(file, { force: true });
      summary.copied++;
      opts.onPhoto?.(name, 'copied');
    } catch (error) {
      summary.failed++;
      opts.onPhoto?.(name, 'failed', error instanceof Error ? String(error.cause ?? error.message) : String(error));
    }
  }
  return summary;
}

/**
 * Whether the bucket's object is this file: same size, and an ETag equal to the file's MD5
 * (what S3 reports for an object written in one PUT); where the ETag is something else
 * (encrypted buckets, some stores), the object is read back and compared byte for byte.
 */
async function holdsCopy(target: S3PhotoStore, name: string, data: Buffer): Promise<boolean> {
  const stat = await target.stat(name);
  if (!stat || stat.size !== data.length) return false;
  if (stat.etag === md5Hex(data)) return true;
  const back = await target.read(name);
  return back !== null && back.equals(data);
}
