import { z, type ZodType } from 'zod';
import { alarmIngestSchema, counterIngestSchema, ingestAnswerSchema, INGEST_MAX_EVENTS } from '../../../shared/schemas/alarms';

// The OpenAPI 3.1 document of the ingest API, generated from the same zod schemas the server
// validates with (OpenAPI 3.1 uses JSON Schema 2020-12, which zod emits directly).

const schema = (s: ZodType) => {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, { io: 'input', target: 'draft-2020-12', unrepresentable: 'any' }) as Record<
    string,
    unknown
  >;
  return rest;
};

const errorBody = {
  type: 'object',
  properties: {
    error: {
      type: 'object',
      properties: {
        code: { type: 'string' },
        message: { type: 'string' },
        fields: { type: 'object', additionalProperties: { type: 'array', items: { type: 'string' } } },
      },
      required: ['code', 'message'],
    },
  },
  required: ['error'],
};

function post(summary: string, description: string, body: ZodType) {
  return {
    summary,
    description,
    security: [{ toolKey: [] }],
    requestBody: { required: true, content: { 'application/json': { schema: schema(body) } } },
    responses: {
      '202': {
        description: 'Stored (or recognised as sent before).',
        content: { 'application/json': { schema: schema(ingestAnswerSchema) } },
      },
      '400': { description: 'Bad input: field messages; nothing was stored.', content: { 'application/json': { schema: errorBody } } },
      '401': { description: 'No key, an unknown key or a revoked key.', content: { 'application/json': { schema: errorBody } } },
      '503': {
        description: 'Busy taking in other events; send again after the Retry-After seconds (ids make it safe).',
        content: { 'application/json': { schema: errorBody } },
      },
      '429': {
        description: 'Too many requests from this key; retry after the Retry-After seconds.',
        content: { 'application/json': { schema: errorBody } },
      },
    },
  };
}

export function ingestOpenApi(serverUrl: string) {
  return {
    openapi: '3.1.0',
    info: {
      title: 'Faultline ingest API',
      version: '1',
      description:
        'For the computers of process tools: post alarm set/clear events and usage counters. One key per tool (Authorization: Bearer <key>). Every event carries the sender’s own unique id: retries are safe. Events are ordered by their time `at`, not by arrival.',
    },
    servers: [{ url: `${serverUrl}/api/ingest/v1` }],
    components: {
      securitySchemes: {
        toolKey: {
          type: 'http',
          scheme: 'bearer',
          description: 'A tool key made by an admin on the tool’s page; it reaches only this API.',
        },
      },
    },
    paths: {
      '/alarms': {
        post: post(
          'Alarm set and clear events',
          `1 to ${INGEST_MAX_EVENTS} events a request. Give either \`alcd\` (SEMI E5 alarm code byte: bit 8 set/clear, bits 1–7 category) or \`set\` with an optional \`category\`. An unknown module code is refused by name.`,
          alarmIngestSchema,
        ),
      },
      '/counters': {
        post: post(
          'Usage counter readings',
          `1 to ${INGEST_MAX_EVENTS} cumulative readings a request. A value lower than the previous one (by time) is recorded as a counter reset.`,
          counterIngestSchema,
        ),
      },
    },
  };
}
