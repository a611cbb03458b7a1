import crypto from 'node:crypto';
import { DisplayLink } from './facility.model';

export const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** A lobby display key resolves to its link id while the link is not revoked. */
export async function verifyDisplayKey(key: string): Promise<number | null> {
  if (!/^[A-Za-z0-9_-]{32,128}$/.test(key)) return null;
  const link = await DisplayLink.findOne({ where: { keyHash: sha256(key), revokedAt: null } });
  return link ? link.id : null;
}
