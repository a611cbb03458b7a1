import { z } from 'zod';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { ingestAlarmEvents, clearByHand } from './ingest.service';
import { ingestCounterReadings } from './counters.service';
import { createToolKey, listToolKeys, revokeToolKey } from './keys.service';
import {
  getAlarmLoad,
  getTicketAlarm,
  getToolAlarms,
  importDefinitionsCsv,
  listCategoryRules,
  listDefinitions,
  setCategoryRule,
  updateDefinition,
  updateToolSettings,
} from './alarms.service';
import { ingestOpenApi } from './openapi';
import { ingestGate } from './ingest-gate';
import { toolCode } from '../../../shared/schemas/facility';
import {
  alarmCsvImportSchema,
  alarmDefinitionUpdateSchema,
  alarmHistoryQuerySchema,
  alarmIngestSchema,
  alarmLoadQuerySchema,
  alarmToolSettingsSchema,
  categoryParams,
  categoryRuleSchema,
  counterIngestSchema,
  toolKeyCreateSchema,
} from '../../../shared/schemas/alarms';

const codeParams = z.strictObject({ code: toolCode });
const pageQuery = z.strictObject({
  limit: z.coerce.number().int().min(1).max(200).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});

/** The machine-facing API, mounted before sessions and CSRF (a tool key is its only credential). */
export function ingestRoutes(poolMax: number): RouteSpec[] {
  // Ingest may use at most about half of the database connections; people keep the rest.
  const gate = ingestGate({ concurrent: Math.max(1, Math.floor(poolMax / 2)), queue: 200 });
  return [
    route({
      method: 'post',
      path: '/ingest/v1/alarms',
      access: 'tool',
      summary: 'Alarm set/clear events from the tool that owns the key',
      before: [gate],
      body: alarmIngestSchema,
      status: 202,
      handle: async ({ deps, req, body }) => {
        const { accepted, duplicates } = await ingestAlarmEvents(deps, req.toolKey!.toolId, body.events);
        return { accepted, duplicates };
      },
    }),
    route({
      method: 'post',
      path: '/ingest/v1/counters',
      access: 'tool',
      summary: 'Usage counter readings from the tool that owns the key',
      before: [gate],
      body: counterIngestSchema,
      status: 202,
      handle: ({ deps, req, body }) => ingestCounterReadings(deps, req.toolKey!.toolId, body.readings),
    }),
    route({
      method: 'get',
      path: '/ingest/v1/openapi.json',
      access: 'public',
      summary: 'The OpenAPI 3.1 document of the ingest API',
      handle: ({ deps }) => ingestOpenApi(deps.config.publicUrl),
    }),
  ];
}

/** Staff and manager routes: keys, alarm history, definitions, rules, alarm load. */
export function alarmRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/tools/:code/keys',
      access: 'admin',
      summary: 'A tool’s keys (hints only)',
      params: codeParams,
      handle: ({ params }) => listToolKeys(params.code),
    }),
    route({
      method: 'post',
      path: '/tools/:code/keys',
      access: 'admin',
      summary: 'Make a key for a tool; the key is in this answer only',
      params: codeParams,
      body: toolKeyCreateSchema,
      status: 201,
      handle: ({ params, body, user }) => createToolKey(params.code, body.label, user!.id),
    }),
    route({
      method: 'post',
      path: '/tool-keys/:id/revoke',
      access: 'admin',
      summary: 'Revoke a tool key at once',
      params: idParams,
      handle: ({ params }) => revokeToolKey(params.id),
    }),
    route({
      method: 'get',
      path: '/tools/:code/alarms',
      access: 'member',
      summary: 'Active alarms, recent history and the most frequent alarms of a tool',
      params: codeParams,
      query: alarmHistoryQuerySchema,
      handle: ({ deps, params, query }) => getToolAlarms(deps, params.code, query),
    }),
    route({
      method: 'patch',
      path: '/tools/:code/alarm-settings',
      access: 'technician',
      summary: 'A tool’s default alarm rule and chattering thresholds',
      params: codeParams,
      body: alarmToolSettingsSchema,
      handle: ({ deps, params, body }) => updateToolSettings(deps, params.code, body),
    }),
    route({
      method: 'get',
      path: '/tools/:code/alarm-definitions',
      access: 'technician',
      summary: 'A tool’s alarm definitions',
      params: codeParams,
      query: pageQuery,
      handle: ({ params, query }) => listDefinitions(params.code, query),
    }),
    route({
      method: 'post',
      path: '/tools/:code/alarm-definitions/import',
      access: 'technician',
      summary: 'Import alarm definitions from CSV (alarm ID, text, category)',
      params: codeParams,
      body: alarmCsvImportSchema,
      handle: ({ deps, params, body }) => importDefinitionsCsv(deps, params.code, body.csv),
    }),
    route({
      method: 'patch',
      path: '/alarm-definitions/:id',
      access: 'technician',
      summary: 'Edit an alarm’s text, category, rule or module',
      params: idParams,
      body: alarmDefinitionUpdateSchema,
      handle: ({ deps, params, body }) => updateDefinition(deps, params.id, body),
    }),
    route({
      method: 'post',
      path: '/alarm-occurrences/:id/clear',
      access: 'technician',
      summary: 'Clear an alarm by hand (one the tool never clears)',
      params: idParams,
      handle: ({ deps, params, user }) => clearByHand(deps, params.id, user!.id),
    }),
    route({
      method: 'get',
      path: '/alarm-rules',
      access: 'technician',
      summary: 'Facility-wide alarm rules per category',
      handle: () => listCategoryRules(),
    }),
    route({
      method: 'put',
      path: '/alarm-rules/:category',
      access: 'admin',
      summary: 'Set the facility-wide rule of a category',
      params: categoryParams,
      body: categoryRuleSchema,
      handle: ({ params, body }) => setCategoryRule(params.category, body.rule),
    }),
    route({
      method: 'get',
      path: '/tickets/:id/alarm',
      access: 'technician',
      summary: 'The alarm behind a ticket and its recent history',
      params: idParams,
      handle: ({ deps, params }) => getTicketAlarm(deps, params.id),
    }),
    route({
      method: 'get',
      path: '/analytics/alarm-load',
      access: 'manager',
      summary: 'Alarm load per tool and for the facility',
      query: alarmLoadQuerySchema,
      handle: ({ deps, query }) => getAlarmLoad(deps, query),
    }),
  ];
}
