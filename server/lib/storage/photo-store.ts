import type { Readable } from 'node:stream';
import type { Config } from '../../config';
import { LocalPhotoStore } from './local-store';
import { S3PhotoStore, s3SettingsFrom } from './s3-store';

/**
 * Where re-encoded photos are kept (docs/decisions/0009-photo-storage.md). Names are the
 * server's random names, checked by the caller; nothing here ever sees a path from a request.
 *
 * The life of a photo: `save` before the ticket's transaction (not yet served), `link` inside
 * it after the photo rows are inserted, `remove` if the transaction fails. A crash anywhere
 * leaves only objects that no row names; `sweep` removes those once they are old enough that
 * no upload can still be under way.
 */
export interface PhotoStore {
  readonly kind: 'local' | 's3';
  /** Writes a new photo under its generated name. */
  save(name: string, data: Buffer): Promise<void>;
  /** Makes saved photos servable (call inside the transaction that inserts their rows). */
  link(names: readonly string[]): Promise<void>;
  /** Removes photos wherever they are, saved or linked; a missing one is no error. */
  remove(names: readonly string[]): Promise<void>;
  /** A linked photo's bytes as a stream, or null when there is no such photo. */
  open(name: string): Promise<{ body: Readable; size: number } | null>;
  /**
   * Removes saved-but-never-linked photos and linked ones no row names (`isLinked` answers,
   * for a batch of names, those a row names), when they were written at least `minAgeMs`
   * before `now`. Returns what it removed.
   */
  sweep(isLinked: (names: string[]) => Promise<Set<string>>, now: number, minAgeMs: number): Promise<string[]>;
  close(): void;
}

export function createPhotoStore(config: Config): PhotoStore {
  if (config.PHOTO_STORAGE === 's3') return new S3PhotoStore(s3SettingsFrom(config));
  return new LocalPhotoStore(config.UPLOAD_DIR);
}
