import { z } from 'zod';
import { isoInstant, plainText } from './text';

// Inputs and answers of the alarm API: the machine-facing ingest API (/api/ingest/v1, used by
// tool computers and the forwarder; its OpenAPI document is generated from these schemas) and
// the staff pages (tool keys, alarm definitions, rules, alarm history).

// ---- Rules -----------------------------------------------------------------------------------

export const ALARM_RULES = ['record', 'notify', 'ticket', 'ticket_down'] as const;
export type AlarmRule = (typeof ALARM_RULES)[number];

export const ALARM_RULE_LABELS: Record<AlarmRule, string> = {
  record: 'Record only',
  notify: 'Tell the tool’s engineers',
  ticket: 'Open a ticket',
  ticket_down: 'Open a ticket and put the tool (or the named module) Down',
};

/**
 * Facility-wide defaults per SEMI E5 category (0: the tool gave none). Safety categories open
 * a ticket (P1, on-call list told); errors tell the engineers; warnings and flags are recorded.
 */
export const DEFAULT_CATEGORY_RULES: Record<number, AlarmRule> = {
  0: 'record',
  1: 'ticket',
  2: 'ticket',
  3: 'record',
  4: 'notify',
  5: 'notify',
  6: 'record',
  7: 'record',
  8: 'record',
};

// ---- Ingest (machine-facing) -----------------------------------------------------------------

export const INGEST_MAX_EVENTS = 500;
export const ALARM_TEXT_MAX = 500;
/** Tool clocks drift; an event more than this far in the future is refused as a clock fault. */
export const INGEST_FUTURE_SLACK_MS = 10 * 60_000;

const senderId = z
  .string()
  .trim()
  .min(1, 'Give the sender’s unique id for this event.')
  .max(100, 'Use at most 100 characters.')
  .describe('The sender’s own unique id for this event. Sending the same id again from the same tool is counted once.');

const at = isoInstant('Use an ISO-8601 time with a zone, for example 2026-03-01T09:12:00Z.')
  .refine((v) => Date.parse(v) <= Date.now() + INGEST_FUTURE_SLACK_MS, 'This time is in the future; check the tool’s clock.')
  .describe('When it happened on the tool (ISO-8601 with a zone). Events are ordered by this time, not by arrival.');

export const alarmIdSchema = z
  .union([
    z.number().int('Use a whole number.').min(0, 'Use 0 or more.').max(4_294_967_295, 'Use at most 4294967295.'),
    plainText().trim().min(1, 'Give the alarm ID.').max(64, 'Use at most 64 characters.'),
  ])
  .describe('The alarm ID on that tool (SEMI E5 ALID): an integer or a short string.');

export const alarmEventSchema = z
  .strictObject({
    id: senderId,
    alarmId: alarmIdSchema,
    alcd: z
      .number()
      .int('Use a whole number.')
      .min(0, 'Use 0–255.')
      .max(255, 'Use 0–255.')
      .optional()
      .describe('SEMI E5 alarm code byte: bit 8 set = alarm set; bits 1–7 the category.'),
    set: z.boolean().optional().describe('Instead of alcd: true when the alarm sets, false when it clears.'),
    category: z
      .number()
      .int('Use a whole number.')
      .min(1, 'Use 1–8.')
      .max(8, 'Use 1–8.')
      .optional()
      .describe('With set: the SEMI E5 category 1–8.'),
    text: z
      .string()
      .trim()
      .max(ALARM_TEXT_MAX, `Use at most ${ALARM_TEXT_MAX} characters.`)
      .optional()
      .describe('The alarm text (SEMI E5 ALTX).'),
    at,
    module: z
      .string()
      .trim()
      .toUpperCase()
      .min(1, 'Give the module code.')
      .max(32, 'Use at most 32 characters.')
      .optional()
      .describe('Code of the module (chamber, station) the alarm belongs to.'),
  })
  .superRefine((e, ctx) => {
    if (e.alcd === undefined && e.set === undefined)
      ctx.addIssue({ code: 'custom', path: ['set'], message: 'Give alcd, or set: true/false.' });
    if (e.alcd !== undefined && e.set !== undefined)
      ctx.addIssue({ code: 'custom', path: ['set'], message: 'Give either alcd or set, not both.' });
    if (e.alcd !== undefined && e.category !== undefined)
      ctx.addIssue({ code: 'custom', path: ['category'], message: 'The category is inside alcd; leave this out.' });
  });
export type AlarmEventInput = z.infer<typeof alarmEventSchema>;

export const alarmIngestSchema = z.strictObject({
  events: z
    .array(alarmEventSchema)
    .min(1, 'Send at least one event.')
    .max(INGEST_MAX_EVENTS, `Send at most ${INGEST_MAX_EVENTS} events a request.`),
});

/** Counter names: the two known ones or a custom name in lower case. */
export const COUNTER_NAME_PATTERN = /^[a-z][a-z0-9_]{0,39}$/;

export const counterReadingSchema = z.strictObject({
  id: senderId,
  counter: z
    .string()
    .trim()
    .regex(COUNTER_NAME_PATTERN, 'Use "wafers", "run_hours" or a lower-case name (letters, digits, _).')
    .describe('"wafers", "run_hours" or a custom name.'),
  value: z
    .number('Give a number.')
    .min(0, 'Counters are 0 or more.')
    .max(1e15, 'That is too large.')
    .describe('The cumulative value; a value lower than the last one is recorded as a reset.'),
  at,
});
export const counterIngestSchema = z.strictObject({
  readings: z
    .array(counterReadingSchema)
    .min(1, 'Send at least one reading.')
    .max(INGEST_MAX_EVENTS, `Send at most ${INGEST_MAX_EVENTS} readings a request.`),
});

export const ingestAnswerSchema = z.object({
  accepted: z.number().int().describe('Events stored by this request.'),
  duplicates: z.number().int().describe('Events whose id this tool had sent before (not stored again).'),
});
export type IngestAnswer = z.infer<typeof ingestAnswerSchema>;

// ---- Staff inputs ----------------------------------------------------------------------------

export const toolKeyCreateSchema = z.strictObject({
  label: plainText().trim().min(1, 'Give the key a name (for example "host PC").').max(80, 'Use at most 80 characters.'),
});

export const alarmDefinitionUpdateSchema = z.strictObject({
  text: plainText().trim().min(1, 'Give the alarm text.').max(ALARM_TEXT_MAX).optional(),
  category: z.number().int().min(0).max(8).nullable().optional(),
  rule: z.enum(ALARM_RULES).nullable().optional(),
  moduleId: z.number().int().positive().nullable().optional(),
});

export const alarmToolSettingsSchema = z.strictObject({
  defaultRule: z.enum(ALARM_RULES).nullable().optional(),
  chatterCount: z.number().int().min(2, 'Use 2 or more.').max(50).optional(),
  chatterWindowSeconds: z.number().int().min(5, 'Use 5 s or more.').max(3600).optional(),
});

export const categoryRuleSchema = z.strictObject({ rule: z.enum(ALARM_RULES) });
export const categoryParams = z.strictObject({ category: z.coerce.number().int().min(0).max(8) });

export const alarmCsvImportSchema = z.strictObject({
  csv: plainText().min(1, 'Paste or upload the CSV.').max(500_000, 'The file is too large (500 kB at most).'),
});

export const alarmHistoryQuerySchema = z.strictObject({
  days: z.coerce.number().int().min(1).max(365).default(30),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const alarmLoadQuerySchema = z.strictObject({
  from: isoInstant().optional(),
  to: isoInstant().optional(),
  toolId: z.coerce.number().int().positive().optional(),
});

// ---- Answers ---------------------------------------------------------------------------------

export interface ToolKeyView {
  id: number;
  toolId: number;
  label: string;
  hint: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

export interface AlarmOccurrenceView {
  id: number;
  definitionId: number;
  alarmId: string;
  text: string;
  category: number | null;
  moduleId: number | null;
  setAt: string;
  clearedAt: string | null;
  clearedBy: 'tool' | 'person' | null;
  ticketId: number | null;
  chattering: boolean;
  stale: boolean;
}

export interface AlarmDefinitionView {
  id: number;
  alarmId: string;
  text: string;
  category: number | null;
  rule: AlarmRule | null;
  effectiveRule: AlarmRule;
  moduleId: number | null;
  chattering: boolean;
}

export interface ToolAlarmsView {
  toolId: number;
  active: AlarmOccurrenceView[];
  history: AlarmOccurrenceView[];
  historyTotal: number;
  frequent: { alarmId: string; text: string; count: number }[];
  flood: { since: string } | null;
  settings: { defaultRule: AlarmRule | null; chatterCount: number; chatterWindowSeconds: number };
}

export interface TicketAlarmView {
  alarmId: string;
  text: string;
  category: number | null;
  definitionId: number;
  toolId: number;
  /** Sets of this alarm folded into this ticket. */
  count: number;
  firstSetAt: string;
  lastSetAt: string;
  active: boolean;
  chattering: boolean;
  setsIn90Days: number;
  earlierTickets: number[];
  occurrences: { id: number; setAt: string; clearedAt: string | null; ticketId: number | null }[];
}

export interface BoardAlarm {
  text: string;
  alarmId: string;
  since: string;
  count: number;
}
