import { Op } from 'sequelize';
import { Photo } from './ticket.model';
import { sweepUploads } from '../../lib/uploads';
import type { AppDeps } from '../../lib/http';

/** How often the running server looks for photo files that no row will ever name. */
export const PHOTO_SWEEP_INTERVAL_MS = 15 * 60_000;

async function linkedNames(names: string[]): Promise<Set<string>> {
  const rows = await Photo.findAll({
    attributes: ['storedName', 'thumbName'],
    where: { [Op.or]: [{ storedName: names }, { thumbName: names }] },
  });
  return new Set(rows.flatMap((r) => [r.storedName, r.thumbName]));
}

/**
 * Removes upload leftovers of a crash (see sweepUploads): once when the server starts, then
 * every PHOTO_SWEEP_INTERVAL_MS. A failed pass is logged and tried again next time.
 */
export function photoSweeper(deps: Pick<AppDeps, 'config' | 'log' | 'photos'>) {
  let timer: NodeJS.Timeout | null = null;
  async function runOnce(now = Date.now()) {
    try {
      const { removed } = await sweepUploads(deps.config, deps.photos, linkedNames, now);
      if (removed.length) deps.log.info({ removed: removed.length }, 'removed photo files left by an interrupted upload');
      return removed;
    } catch (error) {
      deps.log.warn({ err: String(error) }, 'photo sweep failed; will try again');
      return [];
    }
  }
  return {
    runOnce,
    start() {
      timer ??= setInterval(() => void runOnce(), PHOTO_SWEEP_INTERVAL_MS);
      timer.unref();
    },
    stop() {
      if (timer) clearInterval(timer);
      timer = null;
    },
  };
}
