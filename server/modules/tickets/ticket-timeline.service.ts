import { QueryTypes, type Sequelize } from 'sequelize';
import { Photo, Ticket } from './ticket.model';
import { notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { isStaff } from '../../../shared/roles';
import type { PhotoView, TicketEventPage, TicketEventView } from '../../../shared/schemas/tickets';

/** A ticket page shows its newest events; older ones load on request, a page at a time. */
export const TIMELINE_PAGE = 200;

interface PersonRow {
  id: number;
  name: string;
}

function photoView(p: Photo & { uploader?: PersonRow | null }): PhotoView {
  const u = p.uploader;
  return {
    id: p.id,
    url: `/api/photos/${p.id}`,
    thumbUrl: `/api/photos/${p.id}/thumb`,
    width: p.width,
    height: p.height,
    uploader: u ? { id: u.id, name: u.name } : null,
  };
}

interface EventRow {
  id: number;
  ticketId: number;
  kind: string;
  internal: number;
  body: string | null;
  data: string | Record<string, unknown> | null;
  createdAt: Date;
  actorId: number | null;
  actorName: string | null;
}

/**
 * A page of a ticket's timeline (with the tickets merged into it), oldest first, ending just
 * before the event `before` (or at the newest). Rows come straight from SQL and are shaped
 * into their JSON once. Members never receive internal notes: they are filtered here, in the
 * query, not on screen.
 */
export async function loadTimeline(
  sequelize: Sequelize,
  opts: { ticketId: number; ticketIds: number[]; staff: boolean; before?: number; limit?: number },
): Promise<TicketEventPage> {
  const limit = opts.limit ?? TIMELINE_PAGE;
  const visible = `e.ticket_id IN (:ticketIds)${opts.staff ? '' : ' AND e.internal = 0'}`;
  const cursor = opts.before ? ' AND (e.created_at, e.id) < (SELECT c.created_at, c.id FROM ticket_events c WHERE c.id = :before)' : '';
  const replacements = { ticketIds: opts.ticketIds, before: opts.before ?? null, limit };
  const [rows, [{ n }]] = await Promise.all([
    sequelize.query<EventRow>(
      `SELECT e.id, e.ticket_id AS ticketId, e.kind, e.internal, e.body, e.data, e.created_at AS createdAt, e.actor_id AS actorId, u.name AS actorName
         FROM ticket_events e LEFT JOIN users u ON u.id = e.actor_id
        WHERE ${visible}${cursor}
        ORDER BY e.created_at DESC, e.id DESC LIMIT :limit`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM ticket_events e WHERE ${visible}${cursor}`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
  ]);
  rows.reverse();
  const photos = rows.length
    ? await Photo.findAll({
        where: { ticketId: opts.ticketIds, eventId: rows.map((e) => Number(e.id)) },
        include: [{ association: 'uploader', attributes: ['id', 'name'] }],
        order: [['id', 'ASC']],
      })
    : [];
  const photosByEvent = new Map<number, PhotoView[]>();
  for (const p of photos) {
    const list = photosByEvent.get(Number(p.eventId)) ?? [];
    list.push(photoView(p as Photo & { uploader?: PersonRow | null }));
    photosByEvent.set(Number(p.eventId), list);
  }
  const events: TicketEventView[] = rows.map((e) => ({
    id: Number(e.id),
    kind: e.kind,
    internal: Boolean(e.internal),
    actor: e.actorId ? { id: e.actorId, name: e.actorName ?? 'Someone' } : null,
    body: e.body,
    // MariaDB's JSON is text on the wire.
    data: typeof e.data === 'string' ? (JSON.parse(e.data) as Record<string, unknown>) : e.data,
    createdAt: e.createdAt.toISOString(),
    photos: photosByEvent.get(Number(e.id)) ?? [],
    fromTicketId: e.ticketId === opts.ticketId ? null : e.ticketId,
  }));
  return { events, olderEvents: Number(n) - rows.length };
}

/** The tickets whose timelines show on a ticket's page: itself and those merged into it. */
export async function timelineTicketIds(ticketId: number) {
  const merged = await Ticket.findAll({ where: { mergedIntoId: ticketId }, attributes: ['id', 'title'], order: [['id', 'ASC']] });
  return { merged, ticketIds: [ticketId, ...merged.map((m) => m.id)] };
}

/** GET /tickets/:id/events?before=…: older events of a long timeline. */
export async function getTicketEvents(
  deps: AppDeps,
  user: AuthUser,
  ticketId: number,
  q: { before?: number; limit: number },
): Promise<TicketEventPage> {
  const ticket = await Ticket.findByPk(ticketId, { attributes: ['id'] });
  if (!ticket) throw notFound('That ticket');
  const { ticketIds } = await timelineTicketIds(ticketId);
  return loadTimeline(deps.sequelize, { ticketId, ticketIds, staff: isStaff(user.role), before: q.before, limit: q.limit });
}
