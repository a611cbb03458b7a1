import crypto from 'node:crypto';
import type { RequestHandler } from 'express';
import { Op } from 'sequelize';
import { ToolKey } from './alarms.model';
import { findToolIdByCode } from '../facility/tools.service';
import { AppError, notFound } from '../../lib/errors';
import { hit, retryAfterSeconds, tooManyRequests } from '../../lib/throttle';
import { securityLog, type Logger } from '../../lib/logger';
import type { ToolKeyView } from '../../../shared/schemas/alarms';

// Per-tool API keys for the ingest API. A key is 32 random bytes, shown once; only its SHA-256
// is stored (the key is long and random, so a fast hash is enough — no password stretching
// needed). Every request looks the hash up again, so a revoked key fails on its next use.

const PREFIX = 'flt_';
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** The window of the per-key limit (INGEST_REQUESTS_PER_KEY_PER_MINUTE requests in it). */
const KEY_RATE_WINDOW_MS = 60_000;

function present(k: ToolKey): ToolKeyView {
  return {
    id: k.id,
    toolId: k.toolId,
    label: k.label,
    hint: k.keyHint,
    createdAt: k.createdAt.toISOString(),
    lastUsedAt: k.lastUsedAt?.toISOString() ?? null,
    revokedAt: k.revokedAt?.toISOString() ?? null,
  };
}

export async function createToolKey(toolCode: string, label: string, actorId: number | null) {
  const toolId = await findToolIdByCode(toolCode);
  const key = PREFIX + crypto.randomBytes(32).toString('base64url');
  const row = await ToolKey.create({
    toolId,
    label,
    keyHash: sha256(key),
    keyHint: key.slice(0, 10),
    createdById: actorId,
    lastUsedAt: null,
    revokedAt: null,
  });
  return { key, ...present(row) };
}

export async function listToolKeys(toolCode: string) {
  const toolId = await findToolIdByCode(toolCode);
  const rows = await ToolKey.findAll({ where: { toolId }, order: [['createdAt', 'DESC']], limit: 100 });
  return { items: rows.map(present) };
}

export async function revokeToolKey(id: number) {
  const row = await ToolKey.findByPk(id);
  if (!row) throw notFound('Key');
  if (!row.revokedAt) await row.update({ revokedAt: new Date() });
  return present(row);
}

/** The key's id and tool, or null for an unknown or revoked key. */
export async function verifyToolKey(key: string): Promise<{ id: number; toolId: number } | null> {
  if (!key.startsWith(PREFIX) || key.length > 100) return null;
  const row = await ToolKey.findOne({ where: { keyHash: sha256(key), revokedAt: null }, attributes: ['id', 'toolId', 'lastUsedAt'] });
  if (!row) return null;
  // "Last used" to the minute is enough, and saves a write on every request.
  const now = new Date();
  if (!row.lastUsedAt || now.getTime() - row.lastUsedAt.getTime() > 60_000) {
    await ToolKey.update(
      { lastUsedAt: now },
      { where: { id: row.id, [Op.or]: [{ lastUsedAt: null }, { lastUsedAt: { [Op.lt]: new Date(now.getTime() - 60_000) } }] } },
    );
  }
  return { id: row.id, toolId: row.toolId };
}

/**
 * Reads `Authorization: Bearer <key>` on the ingest routes and sets req.toolKey; the route's
 * access rule 'tool' then admits the request. Each key has its own rate limit.
 */
export function toolKeyAuth(log: Logger, requestsPerMinute: number): RequestHandler {
  return async (req, res, next) => {
    try {
      const header = req.get('authorization') ?? '';
      const match = /^Bearer\s+(\S+)$/i.exec(header);
      if (!match) return next();
      const key = await verifyToolKey(match[1]);
      if (!key) {
        securityLog(log, req, 'unauthenticated', { credential: 'tool_key' });
        return next(new AppError(401, 'unauthenticated', 'This tool key is unknown or has been revoked.'));
      }
      const bucket = `rl:ingest:key:${key.id}`;
      if ((await hit(bucket, KEY_RATE_WINDOW_MS)) > requestsPerMinute) {
        const seconds = await retryAfterSeconds(bucket, KEY_RATE_WINDOW_MS);
        res.setHeader('Retry-After', String(seconds));
        securityLog(log, req, 'rate_limited', { limit: 'ingest-key' });
        return next(tooManyRequests(seconds, 'requests from this tool key'));
      }
      req.toolKey = key;
      next();
    } catch (error) {
      next(error);
    }
  };
}
