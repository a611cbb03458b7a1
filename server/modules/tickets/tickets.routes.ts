import { z } from 'zod';
import { plainText } from '../../../shared/schemas/text';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { rateLimit } from '../../lib/throttle';
import { pipeline } from 'node:stream/promises';
import { photoUploadMiddleware, openPhoto, UploadSlots, type IncomingFile } from '../../lib/uploads';
import type { Config } from '../../config';
import type { Logger } from '../../lib/logger';
import { addComment, addReport, createReport } from './report.service';
import { performAction, StaleTicketError } from './workflow.service';
import { findVisiblePhoto, getTicketDetail, listServiceTargets, listStaff, listToolChoices } from './ticket-query.service';
import { listTickets } from './ticket-list.service';
import { TIMELINE_PAGE, getTicketEvents } from './ticket-timeline.service';
import { updateServiceTarget } from './service-targets.service';
import { assertMayReadTicket, limitedToOwnReports } from './ticket-visibility';
import {
  addReportInputSchema,
  commentInputSchema,
  priorityParams,
  reportInputSchema,
  serviceTargetInputSchema,
  ticketActionSchema,
  ticketListQuerySchema,
  unwrapReportField,
} from '../../../shared/schemas/tickets';

const files = (req: { files?: unknown }): IncomingFile[] => (Array.isArray(req.files) ? (req.files as IncomingFile[]) : []);

const photoParams = z.strictObject({ id: z.coerce.number().int().positive() });

const toolChoicesQuery = z.strictObject({
  q: plainText().trim().max(80).optional(),
  code: plainText().trim().max(32).optional(),
  id: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(50).default(20),
});

const eventsQuery = z.strictObject({
  before: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(TIMELINE_PAGE),
});

const staffQuery = z.strictObject({ q: plainText().trim().max(80).optional(), limit: z.coerce.number().int().min(1).max(100).default(50) });

/**
 * Tickets API. Every change to an existing ticket goes through POST /tickets/:id/actions with
 * a body discriminated by `action` (see shared/schemas/tickets.ts); appends (added reports,
 * replies, notes) have their own routes because they never overwrite anything.
 */
export function ticketRoutes(log: Logger, config: Config): RouteSpec[] {
  // A person files a handful of reports an hour at most; these stop scripts and floods.
  const reportLimit = rateLimit({ name: 'report-create', limit: 20, windowMs: 10 * 60_000, log });
  const uploadLimit = rateLimit({ name: 'photo-upload', limit: 40, windowMs: 10 * 60_000, log });
  const commentLimit = rateLimit({ name: 'ticket-comment', limit: 60, windowMs: 10 * 60_000, log });
  // Photos stream to disk; the slots bound how many uploads are received at once.
  const slots = new UploadSlots({ perAccount: config.UPLOADS_PER_ACCOUNT, overall: config.UPLOADS_AT_ONCE }).middleware();
  const upload = photoUploadMiddleware(config, log);

  return [
    route({
      method: 'get',
      path: '/tickets',
      access: 'member',
      summary: 'Tickets, filtered and paginated in SQL (the queue, my reports, a tool’s tickets)',
      query: ticketListQuerySchema,
      handle: async ({ deps, user, query }) =>
        listTickets(deps, user!, (await limitedToOwnReports(deps, user!)) ? { ...query, reportedByMe: true } : query),
    }),
    route({
      method: 'post',
      path: '/tickets',
      access: 'member',
      summary: 'File a fault report (JSON, or multipart with a `report` JSON field and up to 6 `photos`)',
      before: [reportLimit, uploadLimit, slots, upload],
      body: z.preprocess(unwrapReportField, reportInputSchema),
      status: 201,
      handle: ({ deps, user, body, req }) => createReport(deps, user!, body, files(req)),
    }),
    route({
      method: 'get',
      path: '/tickets/:id',
      access: 'member',
      summary: 'One ticket with its timeline (internal notes only for staff)',
      params: idParams,
      handle: async ({ deps, user, params }) => {
        await assertMayReadTicket(deps, user!, params.id);
        return getTicketDetail(deps, user!, params.id);
      },
    }),
    route({
      method: 'get',
      path: '/tickets/:id/events',
      access: 'member',
      summary: 'Older events of a long timeline, a page at a time (before an event id)',
      params: idParams,
      query: eventsQuery,
      handle: ({ deps, user, params, query }) => getTicketEvents(deps, user!, params.id, query),
    }),
    route({
      method: 'post',
      path: '/tickets/:id/reports',
      access: 'member',
      summary: '“I see it too”: add a report (text, facts, photos) to an open ticket',
      params: idParams,
      before: [uploadLimit, slots, upload],
      body: z.preprocess(unwrapReportField, addReportInputSchema),
      status: 201,
      handle: async ({ deps, user, params, body, req }) => {
        await assertMayReadTicket(deps, user!, params.id);
        return addReport(deps, user!, params.id, body, files(req));
      },
    }),
    route({
      method: 'post',
      path: '/tickets/:id/comments',
      access: 'member',
      summary: 'A public reply (anyone) or an internal note (staff only)',
      params: idParams,
      before: [commentLimit],
      body: commentInputSchema,
      status: 201,
      handle: async ({ deps, user, params, body }) => {
        await assertMayReadTicket(deps, user!, params.id);
        return addComment(deps, user!, params.id, body);
      },
    }),
    route({
      method: 'post',
      path: '/tickets/:id/actions',
      access: 'member',
      summary: 'Change a ticket: one action per request, each with the version the client read',
      params: idParams,
      body: ticketActionSchema,
      handle: async ({ deps, user, params, body, res }) => {
        await assertMayReadTicket(deps, user!, params.id);
        try {
          return await performAction(deps, user!, params.id, body);
        } catch (error) {
          if (!(error instanceof StaleTicketError)) throw error;
          // The current ticket travels with the refusal, so the page can show what changed.
          const current = await getTicketDetail(deps, user!, params.id);
          res.status(409).json({ error: { code: error.code, message: error.message }, current });
          return undefined;
        }
      },
    }),
    route({
      method: 'get',
      path: '/photos/:id',
      access: 'member',
      summary: 'A ticket photo (re-encoded JPEG) for signed-in users',
      params: photoParams,
      handle: async ({ deps, user, params, res }) => {
        const photo = await findVisiblePhoto(user!, params.id);
        await assertMayReadTicket(deps, user!, photo.ticketId);
        await sendPhoto(res, await openPhoto(deps.photos, photo.storedName), photo.id);
        return undefined;
      },
    }),
    route({
      method: 'get',
      path: '/photos/:id/thumb',
      access: 'member',
      summary: 'A ticket photo’s thumbnail',
      params: photoParams,
      handle: async ({ deps, user, params, res }) => {
        const photo = await findVisiblePhoto(user!, params.id);
        await assertMayReadTicket(deps, user!, photo.ticketId);
        await sendPhoto(res, await openPhoto(deps.photos, photo.thumbName), photo.id);
        return undefined;
      },
    }),
    route({
      method: 'get',
      path: '/service-targets',
      access: 'member',
      summary: 'Time-to-acknowledge and time-to-restore targets per priority',
      handle: () => listServiceTargets(),
    }),
    route({
      method: 'put',
      path: '/service-targets/:priority',
      access: 'manager',
      summary: 'Change the targets of one priority',
      params: priorityParams,
      body: serviceTargetInputSchema,
      handle: ({ deps, user, params, body }) => updateServiceTarget(deps, user!, params.priority, body),
    }),
    route({
      method: 'get',
      path: '/assignees',
      access: 'technician',
      summary: 'Staff a ticket can be assigned to',
      query: staffQuery,
      handle: ({ query }) => listStaff({ search: query.q, limit: query.limit }),
    }),
    route({
      method: 'get',
      path: '/report-tools',
      access: 'member',
      summary: 'Tools (with their modules) to pick on the report form, by search text, code or id',
      query: toolChoicesQuery,
      handle: ({ query }) => listToolChoices(query),
    }),
  ];
}

/**
 * Streams a photo from the store through this route, after the caller's access check: the
 * browser never learns where photos are kept (docs/decisions/0009-photo-storage.md).
 */
async function sendPhoto(res: import('express').Response, photo: { body: import('node:stream').Readable; size: number }, id: number) {
  res.status(200);
  res.setHeader('Content-Length', String(photo.size));
  res.setHeader('Content-Type', 'image/jpeg');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  res.setHeader('Content-Disposition', `inline; filename="photo-${id}.jpg"`);
  // Even if someone opens it directly, the response can run nothing.
  res.setHeader('Content-Security-Policy', "default-src 'none'; img-src 'self'; sandbox");
  res.setHeader('Cache-Control', 'private, no-store');
  // A client that goes away, or a store that breaks off, ends both streams; the headers are
  // sent by then, so the error middleware leaves the response alone.
  await pipeline(photo.body, res).catch(() => undefined);
}
