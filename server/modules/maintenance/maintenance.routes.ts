import { z } from 'zod';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { badRequest } from '../../lib/errors';
import {
  counterReadingSchema,
  feedCreateSchema,
  feedTokenParams,
  figuresQuery,
  partCreateSchema,
  partListQuery,
  partUpdateSchema,
  partUseSchema,
  planCreateSchema,
  planListQuery,
  planUpdateSchema,
  requalRecordSchema,
  requalTemplateSchema,
  requalTemplateUpdateSchema,
  toolIdParams,
  versionOnlySchema,
  windowSchema,
  workOrderCompleteSchema,
  workOrderFromTicketSchema,
  workOrderListQuery,
  workOrderProgressSchema,
  workOrderSkipSchema,
} from '../../../shared/schemas/maintenance';
import { createPlan, getPlan, listPlans, updatePlan } from './plans.service';
import {
  bookWindow,
  cancelWindow,
  completeWorkOrder,
  createFromTicket,
  getWorkOrder,
  listWorkOrders,
  maintenanceOverview,
  recordProgress,
  skipWorkOrder,
  startWorkOrder,
} from './work-orders.service';
import { createRecord, createTemplate, getTemplate, toolRequalification, updateTemplate } from './requal.service';
import { createPart, listParts, partUsesOfTicket, updatePart, usePart } from './parts.service';
import { createFeed, listFeeds, renderFeed, revokeFeed } from './calendar.service';
import { maintenanceFigures } from './figures.service';
import { recordCounterReading } from './counters';
import { toolInfo } from './lookups';
import { runSchedulerPass } from './scheduler';

const overviewQuery = z.strictObject({ toolId: z.coerce.number().int().positive().optional() });

export function maintenanceRoutes(): RouteSpec[] {
  return [
    // ---- Overview and plans ------------------------------------------------------------
    route({
      method: 'get',
      path: '/maintenance',
      access: 'technician',
      summary: 'Open work orders and overdue plans',
      query: overviewQuery,
      handle: ({ deps, query }) => maintenanceOverview(deps, query),
    }),
    route({
      method: 'get',
      path: '/maintenance/figures',
      access: 'technician',
      summary: 'PM compliance, planned vs unplanned downtime, MTTPM, overdue, MCBF',
      query: figuresQuery,
      handle: ({ deps, query }) => maintenanceFigures(deps, query),
    }),
    route({
      method: 'post',
      path: '/maintenance/scheduler/run',
      access: 'manager',
      summary: 'Run a scheduler pass now',
      handle: ({ deps }) => runSchedulerPass(deps),
    }),
    route({
      method: 'get',
      path: '/maintenance/plans',
      access: 'technician',
      query: planListQuery,
      handle: ({ deps, query }) => listPlans(deps, query),
    }),
    route({
      method: 'post',
      path: '/maintenance/plans',
      access: 'technician',
      status: 201,
      body: planCreateSchema,
      handle: ({ deps, body, user }) => createPlan(deps, body, user!.id),
    }),
    route({
      method: 'get',
      path: '/maintenance/plans/:id',
      access: 'technician',
      params: idParams,
      handle: ({ deps, params }) => getPlan(deps, params.id),
    }),
    route({
      method: 'patch',
      path: '/maintenance/plans/:id',
      access: 'technician',
      params: idParams,
      body: planUpdateSchema,
      handle: ({ deps, params, body, user }) => updatePlan(deps, params.id, body, user!.id),
    }),

    // ---- Work orders ---------------------------------------------------------------------
    route({
      method: 'get',
      path: '/work-orders',
      access: 'technician',
      query: workOrderListQuery,
      handle: ({ query }) => listWorkOrders(query),
    }),
    route({
      method: 'get',
      path: '/work-orders/:id',
      access: 'technician',
      params: idParams,
      handle: ({ deps, params }) => getWorkOrder(deps, params.id),
    }),
    route({
      method: 'post',
      path: '/tickets/:id/work-order',
      access: 'technician',
      status: 201,
      summary: 'Make a work order from this ticket',
      params: idParams,
      body: workOrderFromTicketSchema,
      handle: ({ deps, params, body, user }) => createFromTicket(deps, params.id, body, user!),
    }),
    route({
      method: 'put',
      path: '/work-orders/:id/window',
      access: 'technician',
      summary: 'Book or move the downtime window',
      params: idParams,
      body: windowSchema,
      handle: ({ deps, params, body, user }) => bookWindow(deps, params.id, body, user!),
    }),
    route({
      method: 'post',
      path: '/work-orders/:id/window/cancel',
      access: 'technician',
      params: idParams,
      body: versionOnlySchema,
      handle: ({ deps, params, body }) => cancelWindow(deps, params.id, body),
    }),
    route({
      method: 'post',
      path: '/work-orders/:id/start',
      access: 'technician',
      params: idParams,
      body: versionOnlySchema,
      handle: ({ deps, params, body, user }) => startWorkOrder(deps, params.id, body, user!),
    }),
    route({
      method: 'patch',
      path: '/work-orders/:id',
      access: 'technician',
      summary: 'Checklist ticks and values, hands-on time, notes',
      params: idParams,
      body: workOrderProgressSchema,
      handle: ({ deps, params, body, user }) => recordProgress(deps, params.id, body, user!),
    }),
    route({
      method: 'post',
      path: '/work-orders/:id/complete',
      access: 'technician',
      params: idParams,
      body: workOrderCompleteSchema,
      handle: ({ deps, params, body, user }) => completeWorkOrder(deps, params.id, body, user!),
    }),
    route({
      method: 'post',
      path: '/work-orders/:id/skip',
      access: 'technician',
      params: idParams,
      body: workOrderSkipSchema,
      handle: ({ deps, params, body }) => skipWorkOrder(deps, params.id, body),
    }),
    route({
      method: 'post',
      path: '/work-orders/:id/parts',
      access: 'technician',
      status: 201,
      params: idParams,
      body: partUseSchema,
      handle: ({ deps, params, body, user }) => usePart(deps, { workOrderId: params.id }, body, user!),
    }),

    // ---- Requalification -------------------------------------------------------------------
    route({
      method: 'get',
      path: '/tools/:toolId/requalification',
      access: 'member',
      params: toolIdParams,
      handle: ({ params }) => toolRequalification(params.toolId),
    }),
    route({
      method: 'post',
      path: '/tools/:toolId/requal-templates',
      access: 'technician',
      status: 201,
      params: toolIdParams,
      body: requalTemplateSchema,
      handle: ({ deps, params, body }) => createTemplate(deps, params.toolId, body),
    }),
    route({
      method: 'get',
      path: '/requal-templates/:id',
      access: 'technician',
      params: idParams,
      handle: ({ params }) => getTemplate(params.id),
    }),
    route({
      method: 'put',
      path: '/requal-templates/:id',
      access: 'technician',
      params: idParams,
      body: requalTemplateUpdateSchema,
      handle: ({ deps, params, body }) => updateTemplate(deps, params.id, body),
    }),
    route({
      method: 'post',
      path: '/requal-templates/:id/records',
      access: 'technician',
      status: 201,
      params: idParams,
      body: requalRecordSchema,
      handle: ({ deps, params, body, user }) => createRecord(deps, params.id, body, user!),
    }),

    // ---- Usage counters (read by usage plans) ---------------------------------------------------
    route({
      method: 'post',
      path: '/tools/:toolId/counter-readings',
      access: 'technician',
      status: 201,
      params: toolIdParams,
      body: counterReadingSchema,
      handle: async ({ deps, params, body }) => {
        const tool = await toolInfo(deps.sequelize, params.toolId);
        const at = body.at ?? new Date();
        if (at.getTime() > Date.now() + 60_000)
          throw badRequest('A reading cannot be in the future.', { at: ['Use the time the counter was read.'] });
        await recordCounterReading(deps, tool.id, body.counter, body.value, at);
        return { toolId: tool.id, counter: body.counter, value: body.value, at: at.toISOString() };
      },
    }),

    // ---- Parts ---------------------------------------------------------------------------------
    route({
      method: 'get',
      path: '/parts',
      access: 'technician',
      query: partListQuery,
      handle: ({ deps, query }) => listParts(deps, query),
    }),
    route({
      method: 'post',
      path: '/parts',
      access: 'technician',
      status: 201,
      body: partCreateSchema,
      handle: ({ deps, body }) => createPart(deps, body),
    }),
    route({
      method: 'patch',
      path: '/parts/:id',
      access: 'technician',
      params: idParams,
      body: partUpdateSchema,
      handle: ({ deps, params, body }) => updatePart(deps, params.id, body),
    }),
    route({
      method: 'post',
      path: '/tickets/:id/parts',
      access: 'technician',
      status: 201,
      summary: 'A part used on a repair',
      params: idParams,
      body: partUseSchema,
      handle: ({ deps, params, body, user }) => usePart(deps, { ticketId: params.id }, body, user!),
    }),
    route({
      method: 'get',
      path: '/tickets/:id/parts',
      access: 'technician',
      params: idParams,
      handle: ({ deps, params }) => partUsesOfTicket(deps, params.id),
    }),

    // ---- Calendar feeds --------------------------------------------------------------------------
    route({
      method: 'get',
      path: '/calendar-feeds',
      access: 'member',
      summary: 'My calendar feeds',
      handle: ({ deps, user }) => listFeeds(deps, user!.id),
    }),
    route({
      method: 'post',
      path: '/calendar-feeds',
      access: 'member',
      status: 201,
      body: feedCreateSchema,
      handle: ({ deps, body, user }) => createFeed(deps, user!.id, body),
    }),
    route({
      method: 'delete',
      path: '/calendar-feeds/:id',
      access: 'member',
      params: idParams,
      handle: async ({ user, params }) => void (await revokeFeed(user!.id, params.id)),
    }),
    route({
      method: 'get',
      path: '/calendar/:token',
      access: 'public',
      summary: 'An iCalendar feed at its secret URL (calendar programs cannot sign in)',
      params: feedTokenParams,
      handle: async ({ deps, params, res }) => {
        const text = await renderFeed(deps, params.token.slice(0, -'.ics'.length));
        res.status(200).type('text/calendar; charset=utf-8').set('Cache-Control', 'no-store').send(text);
      },
    }),
  ];
}
