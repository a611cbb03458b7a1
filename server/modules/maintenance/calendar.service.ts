import crypto from 'node:crypto';
import { QueryTypes } from 'sequelize';
import ical, { ICalEventStatus } from 'ical-generator';
import { CalendarFeed } from './maintenance.model';
import { AppError, badRequest, notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';

// iCalendar (RFC 5545) feeds of booked maintenance windows. Calendar programs cannot sign
// in, so a feed lives at a secret URL that its owner created and may revoke; only the
// token's SHA-256 is stored. Each window keeps one UID and a growing SEQUENCE, so a moved
// window updates the event; a cancelled one is sent with STATUS:CANCELLED.

const hash = (token: string) => crypto.createHash('sha256').update(token).digest('hex');

function presentFeed(deps: AppDeps, f: CalendarFeed, token?: string) {
  return {
    id: f.id,
    scope: f.scope,
    scopeId: f.scopeId,
    label: f.label,
    createdAt: f.createdAt.toISOString(),
    revokedAt: f.revokedAt?.toISOString() ?? null,
    // The URL is shown once, when the feed is made; afterwards only its label.
    url: token ? `${deps.config.publicUrl}/api/calendar/${token}.ics` : null,
  };
}

export async function createFeed(
  deps: AppDeps,
  userId: number,
  input: { scope: 'facility' | 'area' | 'tool'; scopeId: number | null; label: string | null },
) {
  let label = input.label;
  if (input.scope !== 'facility') {
    const table = input.scope === 'area' ? 'areas' : 'tools';
    const [row] = await deps.sequelize.query<{ name: string }>(`SELECT name FROM ${table} WHERE id = :id`, {
      type: QueryTypes.SELECT,
      replacements: { id: input.scopeId },
    });
    if (!row) throw badRequest(`Unknown ${input.scope}.`, { scopeId: [`There is no such ${input.scope}.`] });
    label ??= `Maintenance: ${row.name}`;
  }
  const token = crypto.randomBytes(32).toString('base64url');
  const feed = await CalendarFeed.create({
    userId,
    scope: input.scope,
    scopeId: input.scopeId,
    label: label ?? 'Maintenance: whole facility',
    tokenHash: hash(token),
    revokedAt: null,
  });
  return presentFeed(deps, feed, token);
}

export async function listFeeds(deps: AppDeps, userId: number) {
  const feeds = await CalendarFeed.findAll({ where: { userId, revokedAt: null }, order: [['createdAt', 'DESC']] });
  return { items: feeds.map((f) => presentFeed(deps, f)) };
}

export async function revokeFeed(userId: number, id: number) {
  const feed = await CalendarFeed.findOne({ where: { id, userId } });
  if (!feed) throw notFound('That feed');
  if (!feed.revokedAt) await feed.update({ revokedAt: new Date() });
}

interface WindowRow {
  uid: string;
  startsAt: Date;
  endsAt: Date;
  status: 'booked' | 'cancelled';
  sequence: number;
  updatedAt: Date;
  workOrderId: number;
  title: string;
  toolCode: string;
  toolName: string;
  areaName: string;
}

/** The feed's text; an unknown or revoked token is a 404, as if it never existed. */
export async function renderFeed(deps: AppDeps, token: string) {
  const feed = await CalendarFeed.findOne({ where: { tokenHash: hash(token) } });
  if (!feed || feed.revokedAt) throw new AppError(404, 'not_found', 'No such calendar feed.');
  const scopeSql = feed.scope === 'tool' ? 'AND t.id = :scopeId' : feed.scope === 'area' ? 'AND t.area_id = :scopeId' : '';
  // A year back and everything ahead: calendars keep what they already have.
  const rows = await deps.sequelize.query<WindowRow>(
    `SELECT mw.uid, mw.starts_at AS startsAt, mw.ends_at AS endsAt, mw.status, mw.sequence, mw.updated_at AS updatedAt,
            w.id AS workOrderId, w.title, t.code AS toolCode, t.name AS toolName, a.name AS areaName
       FROM maintenance_windows mw
       JOIN work_orders w ON w.id = mw.work_order_id
       JOIN tools t ON t.id = mw.tool_id JOIN areas a ON a.id = t.area_id
      WHERE mw.ends_at > :since ${scopeSql}
      ORDER BY mw.starts_at LIMIT 5000`,
    { type: QueryTypes.SELECT, replacements: { scopeId: feed.scopeId, since: new Date(Date.now() - 365 * 86400_000) } },
  );
  const cal = ical({ name: feed.label, prodId: { company: 'Faultline', product: 'Maintenance windows', language: 'EN' } });
  for (const r of rows) {
    cal.createEvent({
      id: r.uid,
      sequence: r.sequence,
      stamp: new Date(r.updatedAt),
      start: new Date(r.startsAt),
      end: new Date(r.endsAt),
      summary: `${r.toolName} (${r.toolCode}) — scheduled downtime: ${r.title}`,
      description: `Preventive maintenance on ${r.toolName} in ${r.areaName}. The tool is not available during this window.`,
      location: r.areaName,
      url: `${deps.config.publicUrl}/maintenance/work-orders/${r.workOrderId}`,
      status: r.status === 'cancelled' ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
    });
  }
  return cal.toString();
}
