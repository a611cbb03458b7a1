import fsp from 'node:fs/promises';
import path from 'node:path';
import type { PhotoStore } from './photo-store';

/** Photo files in generated names: saved into `<dir>/pending/`, renamed into `<dir>` when linked. */
export const PHOTO_NAME = /^[A-Za-z0-9_-]{20,60}(-t)?\.jpg$/;

export class LocalPhotoStore implements PhotoStore {
  readonly kind = 'local';
  readonly dir: string;
  readonly pendingDir: string;

  constructor(dir: string) {
    this.dir = path.resolve(dir);
    this.pendingDir = path.join(this.dir, 'pending');
  }

  async save(name: string, data: Buffer) {
    await fsp.mkdir(this.pendingDir, { recursive: true });
    await fsp.writeFile(path.join(this.pendingDir, name), data, { flag: 'wx', mode: 0o640 });
  }

  async link(names: readonly string[]) {
    for (const name of names) await fsp.rename(path.join(this.pendingDir, name), path.join(this.dir, name));
  }

  async remove(names: readonly string[]) {
    await Promise.all(names.flatMap((name) => [this.dir, this.pendingDir].map((d) => fsp.rm(path.join(d, name), { force: true }))));
  }

  async open(name: string) {
    const file = path.join(this.dir, name);
    let handle: fsp.FileHandle;
    try {
      handle = await fsp.open(file, 'r');
    } catch {
      return null;
    }
    // Opened first, then measured: the size and the bytes come from the same file.
    const { size } = await handle.stat();
    return { body: handle.createReadStream(), size };
  }

  async sweep(isLinked: (names: string[]) => Promise<Set<string>>, now: number, minAgeMs: number) {
    const removed: string[] = [];
    const old = async (file: string) => {
      try {
        return now - (await fsp.stat(file)).mtimeMs >= minAgeMs;
      } catch {
        return false;
      }
    };
    for (const entry of await list(this.pendingDir)) {
      const file = path.join(this.pendingDir, entry.name);
      if (entry.isFile() && (await old(file))) {
        await fsp.rm(file, { force: true });
        removed.push(file);
      }
    }
    const candidates: string[] = [];
    for (const entry of await list(this.dir)) {
      if (entry.isFile() && PHOTO_NAME.test(entry.name) && (await old(path.join(this.dir, entry.name)))) candidates.push(entry.name);
    }
    for (let i = 0; i < candidates.length; i += 500) {
      const batch = candidates.slice(i, i + 500);
      const linked = await isLinked(batch);
      for (const name of batch) {
        if (linked.has(name)) continue;
        await fsp.rm(path.join(this.dir, name), { force: true });
        removed.push(path.join(this.dir, name));
      }
    }
    return removed;
  }

  close() {}
}

export async function list(dir: string) {
  try {
    return await fsp.readdir(dir, { withFileTypes: true });
  } catch {
    return [];
  }
}
