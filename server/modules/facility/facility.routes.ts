import { z } from 'zod';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { AppError, badRequest } from '../../lib/errors';
import { rateLimit } from '../../lib/throttle';
import type { Logger } from '../../lib/logger';
import {
  adminListQuery,
  areaCreateSchema,
  areaUpdateSchema,
  boardQuery,
  displayLinkCreateSchema,
  displayLinkListQuery,
  engineerListQuery,
  historyQuery,
  labelsQuery,
  moduleCreateSchema,
  moduleUpdateSchema,
  stateChangeSchema,
  toolCodeParams,
  toolCreateSchema,
  toolUpdateSchema,
  unfollowTokenSchema,
} from '../../../shared/schemas/facility';
import { getBoard } from './board.service';
import {
  createArea,
  createModule,
  createTool,
  getToolDetail,
  getToolForEdit,
  getToolHistory,
  listAreas,
  listEngineers,
  listToolsAdmin,
  setToolState,
  updateArea,
  updateModule,
  updateTool,
} from './tools.service';
import { followTool, listFollowedTools, unfollowByToken, unfollowTool } from './follow.service';
import { createDisplayLink, describeDisplay, listDisplayLinks, revokeDisplayLink, verifyDisplayKey } from './display-links.service';
import { getLabels } from './labels.service';

const areaListQuery = z.strictObject({
  includeRetired: z
    .enum(['true', 'false', '1', '0'])
    .transform((v) => v === 'true' || v === '1')
    .optional(),
  limit: z.coerce.number().int().min(1).max(200).default(200),
  offset: z.coerce.number().int().min(0).default(0),
});

export function facilityRoutes(opts: { log: Logger }): RouteSpec[] {
  return [
    // ---- Everyone signed in (and lobby displays, for the board) ----
    route({
      method: 'get',
      path: '/board',
      access: 'display',
      summary: 'The status board: every active tool by area, rolled up, with open-ticket counts',
      query: boardQuery,
      // A display's "last seen" is kept by /display-link, which the screen re-checks every few
      // minutes; the board itself stays two queries.
      handle: ({ deps, query, res }) => {
        // The same for every viewer and never personal: the browser may keep it, but asks
        // again each time (If-None-Match, answered 304 while nothing changed; Express's ETag).
        res.setHeader('Cache-Control', 'private, no-cache');
        return getBoard(deps.sequelize, query);
      },
    }),
    route({
      method: 'get',
      path: '/display-link',
      access: 'display',
      summary: 'The lobby display checks its own key (even in a browser where someone is signed in)',
      handle: async ({ req }) => {
        const key = req.get('x-display-key');
        if (!key) throw badRequest('Send the display key in the X-Display-Key header.', { 'x-display-key': ['Required.'] });
        const id = await verifyDisplayKey(key);
        const link = id ? await describeDisplay(id) : null;
        if (!link) throw new AppError(401, 'display_revoked', 'This display link is not valid any more.');
        return link;
      },
    }),
    route({
      method: 'get',
      path: '/areas',
      access: 'member',
      summary: 'Areas (bays, rooms) in board order',
      query: areaListQuery.omit({ includeRetired: true }),
      handle: ({ query }) => listAreas({ ...query, includeRetired: false }),
    }),
    route({
      method: 'get',
      path: '/tools/by-code/:code',
      access: 'member',
      summary: 'A tool page: state, modules, engineers, 30-day availability, whether I follow it',
      params: toolCodeParams,
      handle: ({ deps, params, user }) => getToolDetail(deps, params.code, user!),
    }),
    route({
      method: 'get',
      path: '/tools/:id/history',
      access: 'member',
      summary: 'The state log of a tool and its modules, newest first, paginated',
      params: idParams,
      query: historyQuery,
      handle: ({ deps, params, query }) => getToolHistory(deps, params.id, query),
    }),
    route({
      method: 'post',
      path: '/tools/:id/state',
      access: 'technician',
      summary: 'Set the state of a tool or one of its modules',
      params: idParams,
      body: stateChangeSchema,
      status: 201,
      handle: ({ deps, params, body, user }) => setToolState(deps, params.id, body, user!),
    }),
    route({
      method: 'get',
      path: '/me/following',
      access: 'member',
      summary: 'The tools I follow, as board entries',
      handle: ({ deps, user }) => listFollowedTools(deps, user!.id),
    }),
    route({
      method: 'put',
      path: '/tools/:id/follow',
      access: 'member',
      summary: 'Follow a tool: an e-mail and a notice on every state change',
      params: idParams,
      handle: ({ deps, params, user }) => followTool(deps, user!.id, params.id),
    }),
    route({
      method: 'delete',
      path: '/tools/:id/follow',
      access: 'member',
      summary: 'Stop following a tool',
      params: idParams,
      handle: ({ params, user }) => unfollowTool(user!.id, params.id),
    }),
    route({
      method: 'post',
      path: '/unfollow',
      access: 'public',
      summary: 'Stop following with the token from a notification e-mail',
      body: unfollowTokenSchema,
      before: [rateLimit({ name: 'unfollow', limit: 30, windowMs: 15 * 60_000, log: opts.log })],
      handle: ({ body }) => unfollowByToken(body.token),
    }),

    // ---- Staff ----
    route({
      method: 'get',
      path: '/labels',
      access: 'technician',
      summary: 'QR labels for the active tools, each opening its tool page',
      query: labelsQuery,
      handle: ({ deps, query }) => getLabels(deps, query),
    }),

    // ---- Admin: areas, tools, modules, lobby displays ----
    route({
      method: 'get',
      path: '/admin/areas',
      access: 'admin',
      summary: 'Areas, retired ones too on request',
      query: areaListQuery,
      handle: ({ query }) => listAreas(query),
    }),
    route({
      method: 'post',
      path: '/admin/areas',
      access: 'admin',
      summary: 'Create an area',
      body: areaCreateSchema,
      status: 201,
      handle: ({ deps, body }) => createArea(deps, body),
    }),
    route({
      method: 'patch',
      path: '/admin/areas/:id',
      access: 'admin',
      summary: 'Edit or retire an area',
      params: idParams,
      body: areaUpdateSchema,
      handle: ({ deps, params, body }) => updateArea(deps, params.id, body),
    }),
    route({
      method: 'get',
      path: '/admin/engineers',
      access: 'admin',
      summary: 'Active staff who can look after tools',
      query: engineerListQuery,
      handle: ({ query }) => listEngineers(query),
    }),
    route({
      method: 'get',
      path: '/admin/tools',
      access: 'admin',
      summary: 'Tools with area and engineers, paginated',
      query: adminListQuery,
      handle: ({ query }) => listToolsAdmin(query),
    }),
    route({
      method: 'get',
      path: '/admin/tools/:id',
      access: 'admin',
      summary: 'A tool with all its modules, for editing',
      params: idParams,
      handle: ({ params }) => getToolForEdit(params.id),
    }),
    route({
      method: 'post',
      path: '/admin/tools',
      access: 'admin',
      summary: 'Create a tool (and its modules); it starts in standby',
      body: toolCreateSchema,
      status: 201,
      handle: ({ deps, body, user }) => createTool(deps, body, user!.id),
    }),
    route({
      method: 'patch',
      path: '/admin/tools/:id',
      access: 'admin',
      summary: 'Edit or retire a tool (optimistic version check)',
      params: idParams,
      body: toolUpdateSchema,
      handle: ({ deps, params, body, user }) => updateTool(deps, params.id, body, user!.id),
    }),
    route({
      method: 'post',
      path: '/admin/tools/:id/modules',
      access: 'admin',
      summary: 'Add a module to a tool',
      params: idParams,
      body: moduleCreateSchema,
      status: 201,
      handle: ({ deps, params, body, user }) => createModule(deps, params.id, body, user!.id),
    }),
    route({
      method: 'patch',
      path: '/admin/modules/:id',
      access: 'admin',
      summary: 'Edit or retire a module',
      params: idParams,
      body: moduleUpdateSchema,
      handle: ({ deps, params, body }) => updateModule(deps, params.id, body),
    }),
    route({
      method: 'get',
      path: '/admin/display-links',
      access: 'admin',
      summary: 'Lobby display links (never their keys)',
      query: displayLinkListQuery,
      handle: ({ query }) => listDisplayLinks(query),
    }),
    route({
      method: 'post',
      path: '/admin/display-links',
      access: 'admin',
      summary: 'Create a lobby display link; the key is in this answer only',
      body: displayLinkCreateSchema,
      status: 201,
      handle: ({ deps, body, user }) => createDisplayLink(deps, body.name, user!.id),
    }),
    route({
      method: 'delete',
      path: '/admin/display-links/:id',
      access: 'admin',
      summary: 'Revoke a lobby display link and cut off its screens',
      params: idParams,
      handle: ({ params }) => revokeDisplayLink(params.id),
    }),
  ];
}
