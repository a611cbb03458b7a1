import crypto from 'node:crypto';
import { Op } from 'sequelize';
import { DisplayLink } from './facility.model';
import { peopleByIds } from '../users/user-directory';
import { notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { disconnectDisplay } from '../../lib/realtime';
import type { DisplayLinkItem } from '../../../shared/schemas/facility';

export const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** A lobby display key resolves to its link id while the link is not revoked. */
export async function verifyDisplayKey(key: string): Promise<number | null> {
  if (!/^[A-Za-z0-9_-]{32,128}$/.test(key)) return null;
  const link = await DisplayLink.findOne({ where: { keyHash: sha256(key), revokedAt: null } });
  return link ? link.id : null;
}

/** 32 random bytes as base64url (43 characters). Only the SHA-256 is kept; the key is shown once. */
export const newDisplayKey = () => crypto.randomBytes(32).toString('base64url');

function present(link: DisplayLink, createdBy: string | null): DisplayLinkItem {
  return {
    id: link.id,
    name: link.name,
    createdAt: link.createdAt.toISOString(),
    revokedAt: link.revokedAt?.toISOString() ?? null,
    lastSeenAt: link.lastSeenAt?.toISOString() ?? null,
    createdBy,
  };
}

export async function createDisplayLink(deps: AppDeps, name: string, actorId: number) {
  const key = newDisplayKey();
  const link = await DisplayLink.create({ name, keyHash: sha256(key), createdById: actorId, revokedAt: null, lastSeenAt: null });
  const actor = (await peopleByIds([actorId])).get(actorId);
  return { ...present(link, actor?.name ?? null), key, url: `${deps.config.publicUrl}/display/${key}` };
}

export async function listDisplayLinks(query: { includeRevoked?: boolean; limit: number; offset: number }) {
  const where = query.includeRevoked ? {} : { revokedAt: null };
  const { rows, count } = await DisplayLink.findAndCountAll({
    where,
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: query.limit,
    offset: query.offset,
  });
  const creators = await peopleByIds(rows.map((r) => r.createdById));
  return {
    items: rows.map((r) => present(r, r.createdById ? (creators.get(r.createdById)?.name ?? null) : null)),
    total: count,
    limit: query.limit,
    offset: query.offset,
  };
}

/** Revoking is final: the key stops working for the API at once and open screens are cut off. */
export async function revokeDisplayLink(id: number) {
  const link = await DisplayLink.findByPk(id);
  if (!link) throw notFound('Display link');
  if (!link.revokedAt) await link.update({ revokedAt: new Date() });
  disconnectDisplay(link.id);
  const creator = link.createdById ? (await peopleByIds([link.createdById])).get(link.createdById) : null;
  return present(link, creator?.name ?? null);
}

/** The display's name for its own screen, and a "last seen" for the admin list (at most once a minute). */
export async function describeDisplay(id: number) {
  const link = await DisplayLink.findByPk(id);
  if (!link || link.revokedAt) return null;
  const now = new Date();
  if (!link.lastSeenAt || now.getTime() - link.lastSeenAt.getTime() > 60_000) {
    await DisplayLink.update(
      { lastSeenAt: now },
      { where: { id, [Op.or]: [{ lastSeenAt: null }, { lastSeenAt: { [Op.lt]: new Date(now.getTime() - 60_000) } }] } },
    );
  }
  return { id: link.id, name: link.name };
}
