import { route, idParams, type RouteSpec } from '../../lib/http';
import { analyticsQuerySchema } from '../../../shared/schemas/analytics';
import { buildReport, scopeOptions, toolReliability } from './analytics.service';
import { csvFileName, monthsCsv, toolsCsv } from './csv';
import type { Response } from 'express';

function sendCsv(res: Response, fileName: string, body: string) {
  res.status(200);
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  res.send(body);
}

/** Downtime and reliability analytics: the full figures for managers, a few for everyone on the tool page. */
export function analyticsRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/analytics',
      access: 'manager',
      summary: 'Downtime and reliability report for a period and a scope (facility, area or tool)',
      query: analyticsQuerySchema,
      handle: ({ deps, query }) => buildReport(deps, query),
    }),
    route({
      method: 'get',
      path: '/analytics/scopes',
      access: 'manager',
      summary: 'Areas and tools to choose a report scope from',
      handle: ({ deps }) => scopeOptions(deps),
    }),
    route({
      method: 'get',
      path: '/analytics/tools.csv',
      access: 'manager',
      summary: 'The report’s tool table as CSV',
      query: analyticsQuerySchema,
      handle: async ({ deps, query, res }) => {
        const report = await buildReport(deps, query);
        sendCsv(res, csvFileName('tools', report), toolsCsv(report));
      },
    }),
    route({
      method: 'get',
      path: '/analytics/months.csv',
      access: 'manager',
      summary: 'The report’s hours per E10 state and month as CSV',
      query: analyticsQuerySchema,
      handle: async ({ deps, query, res }) => {
        const report = await buildReport(deps, query);
        sendCsv(res, csvFileName('months', report), monthsCsv(report));
      },
    }),
    route({
      method: 'get',
      path: '/analytics/tools/:id/reliability',
      access: 'member',
      summary: 'Availability, MTBF and MTTR of one tool over 30 and 365 days (for the tool page)',
      params: idParams,
      handle: ({ deps, params }) => toolReliability(deps, params.id),
    }),
  ];
}
