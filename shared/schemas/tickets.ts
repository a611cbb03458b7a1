import { z } from 'zod';
import { plainText, isoInstant } from './text';
import {
  TICKET_CATEGORIES,
  IMPACTS,
  HAZARDS,
  WAIT_REASONS,
  FIX_KINDS,
  type Hazard,
  type Impact,
  type TicketCategory,
  type WaitReason,
  type FixKind,
} from '../report-options';
import { PRIORITIES, type Priority, type TargetStatus } from '../priority';
import { TICKET_STATUSES, type TicketAction, type TicketStatus } from '../ticket-workflow';
import type { E10State, StateReason } from '../equipment-state';
import { checkStateChange, stateChangeFields } from './facility';
import type { Role } from '../roles';

// Inputs and outputs of the tickets API, shared by the report form, the queue, the ticket
// page and the server. Every input is a strict object: a field the server does not expect
// (status, priority, assignee from a member's report) is refused, never silently dropped.

export const MAX_PHOTOS = 6;
export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
/** Multipart field names: the report's JSON goes in `report`, the pictures in `photos`. */
export const REPORT_FIELD = 'report';
export const PHOTO_FIELD = 'photos';
/** What the photo picker offers; the server decides by content, not by this list. */
export const PHOTO_ACCEPT = 'image/*';

const text = (max: number) => plainText().trim().max(max, `At most ${max} characters.`);
const optionalText = (max: number) =>
  text(max)
    .nullish()
    .transform((v) => (v ? v : null));

export const WAFER_RECOVERABLE = ['yes', 'no', 'unknown'] as const;
export type WaferRecoverable = (typeof WAFER_RECOVERABLE)[number];
export const WAFER_RECOVERABLE_LABELS: Record<WaferRecoverable, string> = {
  yes: 'Yes, they can be taken out',
  no: 'No, they are lost or stuck',
  unknown: 'Not sure',
};

const hazardList = z
  .array(z.enum(HAZARDS))
  .max(HAZARDS.length)
  .default([])
  .transform((list) => [...new Set(list)]);

/**
 * A random key the client makes once per draft. A resend of the same draft (after an answer
 * was lost on a bad connection) returns the ticket already filed instead of a second one.
 */
const clientKey = z
  .string()
  .regex(/^[A-Za-z0-9_-]{16,64}$/, 'Not a valid draft key.')
  .nullish()
  .transform((v) => v ?? null);

const waferFields = {
  wafersCount: z.number().int().min(0, 'Cannot be negative.').max(1000, 'At most 1000.').default(0),
  wafersOwner: optionalText(120),
  wafersRecoverable: z
    .enum(WAFER_RECOVERABLE)
    .nullish()
    .transform((v) => v ?? null),
};

/** A new fault report from the form (or the JSON API). */
export const reportInputSchema = z.strictObject({
  toolId: z.number({ error: 'Choose the tool.' }).int().positive('Choose the tool.'),
  moduleId: z
    .number()
    .int()
    .positive()
    .nullish()
    .transform((v) => v ?? null),
  category: z.enum(TICKET_CATEGORIES, { error: 'Choose what kind of problem it is.' }),
  description: text(4000).min(3, 'Say in a few words what happened.'),
  alarmText: optionalText(1000),
  impact: z.enum(IMPACTS, { error: 'Say whether the tool still runs.' }),
  hazards: hazardList,
  ...waferFields,
  clientKey,
});
export type ReportInput = z.input<typeof reportInputSchema>;
export type ReportData = z.output<typeof reportInputSchema>;

/** "I see it too": a report added to an open ticket instead of a new one. */
export const addReportInputSchema = z.strictObject({
  description: text(4000).min(3, 'Say in a few words what you saw.'),
  alarmText: optionalText(1000),
  impact: z
    .enum(IMPACTS)
    .nullish()
    .transform((v) => v ?? null),
  hazards: hazardList,
  ...waferFields,
  clientKey,
});
export type AddReportInput = z.input<typeof addReportInputSchema>;
export type AddReportData = z.output<typeof addReportInputSchema>;

/** Multipart bodies carry the JSON in one text field; JSON bodies carry it directly. */
export function unwrapReportField(value: unknown): unknown {
  if (value && typeof value === 'object' && !Array.isArray(value)) {
    const keys = Object.keys(value);
    const field = (value as Record<string, unknown>)[REPORT_FIELD];
    if (keys.length === 1 && typeof field === 'string') {
      try {
        return JSON.parse(field);
      } catch {
        return { [REPORT_FIELD]: 'not JSON' };
      }
    }
  }
  return value;
}

export const commentInputSchema = z.strictObject({
  body: text(4000).min(1, 'Write something first.'),
  /** Internal notes are for staff only; a member asking for one is refused. */
  internal: z.boolean().default(false),
});
export type CommentInput = z.input<typeof commentInputSchema>;

const version = z.number({ error: 'The version you read is required.' }).int().min(0);

/**
 * Every change to a ticket goes through one endpoint with one of these bodies. Each carries
 * the `version` the client read; a stale one is refused with 409 and the current ticket.
 */
export const ticketActionSchema = z.discriminatedUnion('action', [
  z.strictObject({ action: z.literal('acknowledge'), version }),
  z.strictObject({ action: z.literal('start_repair'), version }),
  z.strictObject({ action: z.literal('assign'), version, assigneeId: z.number().int().positive().nullable() }),
  z.strictObject({
    action: z.literal('set_priority'),
    version,
    priority: z.enum(PRIORITIES),
    reason: text(500).min(3, 'Say why the priority changes.'),
  }),
  z.strictObject({ action: z.literal('set_state'), version, ...stateChangeFields }).superRefine(checkStateChange),
  z.strictObject({ action: z.literal('confirm_down'), version }),
  z.strictObject({ action: z.literal('revert_down'), version, note: optionalText(500) }),
  z.strictObject({
    action: z.literal('wait'),
    version,
    waitReason: z.enum(WAIT_REASONS),
    note: optionalText(1000),
    /** When the wait should end (parts due, vendor visit); shown on the board as the expected return. */
    expectedReturnAt: isoInstant()
      .nullish()
      .transform((v) => (v ? new Date(v) : null)),
  }),
  z.strictObject({ action: z.literal('resume'), version }),
  z.strictObject({
    action: z.literal('fix'),
    version,
    fixKind: z.enum(FIX_KINDS),
    failureMode: optionalText(120),
    cause: optionalText(4000),
    workDone: text(4000).min(3, 'Say what was done.'),
    partsUsed: optionalText(2000),
    handsOnMinutes: z
      .number()
      .int()
      .min(0)
      .max(100_000)
      .nullish()
      .transform((v) => v ?? null),
    wafersRecovered: z
      .number()
      .int()
      .min(0)
      .max(1000)
      .nullish()
      .transform((v) => v ?? null),
    wafersReturned: z
      .number()
      .int()
      .min(0)
      .max(1000)
      .nullish()
      .transform((v) => v ?? null),
    /** Put every tool or module this ticket holds down back to standby in the same step. */
    returnToService: z.boolean().default(false),
    /** A manager's reason to return a tool with a requalification template but no passing record. */
    returnOverrideReason: plainText().trim().min(5, 'Say why the tool may return without a passing record.').max(1000).optional(),
  }),
  z.strictObject({ action: z.literal('close'), version }),
  z.strictObject({ action: z.literal('reopen'), version, reason: optionalText(1000) }),
  z.strictObject({ action: z.literal('no_fault_found'), version, note: optionalText(1000) }),
  z.strictObject({ action: z.literal('merge'), version, targetId: z.number().int().positive() }),
]);
export type TicketActionInput = z.input<typeof ticketActionSchema>;
export type TicketActionData = z.output<typeof ticketActionSchema>;
export type TicketActionName = TicketActionData['action'];

/** Actions beyond the status workflow, for staff only. */
export const STAFF_ONLY_ACTIONS = ['assign', 'set_priority', 'set_state', 'confirm_down', 'revert_down'] as const;

const flag = z
  .enum(['true', 'false', '1', '0'])
  .optional()
  .transform((v) => v === 'true' || v === '1');

export const TICKET_LIST_STATUSES = ['open', 'resolved', 'all', ...TICKET_STATUSES] as const;
export type TicketListStatus = (typeof TICKET_LIST_STATUSES)[number];

export const ticketListQuerySchema = z.strictObject({
  status: z.enum(TICKET_LIST_STATUSES).default('open'),
  mine: flag,
  myTools: flag,
  unassigned: flag,
  hazard: flag,
  waiting: flag,
  /** Tickets the caller reported or added a report to. */
  reportedByMe: flag,
  toolId: z.coerce.number().int().positive().optional(),
  areaId: z.coerce.number().int().positive().optional(),
  sort: z.enum(['queue', 'newest']).default('queue'),
  limit: z.coerce.number().int().min(1).max(100).default(25),
  /**
   * Where the page starts. Without a cursor it selects the page; with one (`after`, `before`,
   * `last`) it is only echoed back, so the client can keep showing the page's position.
   */
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
  /** Keyset paging: the page right after (or before) this ticket in the list's order. */
  after: z.coerce.number().int().positive().optional(),
  before: z.coerce.number().int().positive().optional(),
  /** The last page, read from the end of the list. */
  last: flag,
});
/** The list filters as a client sends them (query strings; flags as 'true'). */
export interface TicketListQuery {
  status?: TicketListStatus;
  mine?: 'true';
  myTools?: 'true';
  unassigned?: 'true';
  hazard?: 'true';
  waiting?: 'true';
  reportedByMe?: 'true';
  toolId?: number;
  areaId?: number;
  sort?: 'queue' | 'newest';
  limit?: number;
  offset?: number;
  after?: number;
  before?: number;
  last?: 'true';
}

export const serviceTargetInputSchema = z
  .strictObject({
    acknowledgeMinutes: z
      .number()
      .int()
      .min(1)
      .max(60 * 24 * 60),
    restoreMinutes: z
      .number()
      .int()
      .min(1)
      .max(60 * 24 * 120),
  })
  .refine((v) => v.restoreMinutes >= v.acknowledgeMinutes, {
    path: ['restoreMinutes'],
    message: 'Restoring cannot be due before acknowledging.',
  });
export type ServiceTargetInput = z.input<typeof serviceTargetInputSchema>;

export const priorityParams = z.strictObject({ priority: z.enum(PRIORITIES) });

// ---- What the API sends back --------------------------------------------------------------

export interface PersonRef {
  id: number;
  name: string;
}

export interface ToolRef {
  id: number;
  code: string;
  name: string;
  areaId: number;
  areaName: string | null;
}

export interface TargetClock {
  targetMinutes: number;
  /** When the target falls due (ISO). */
  dueAt: string;
  /** When it was met or the clock stopped (ISO), or null while it runs. */
  doneAt: string | null;
  status: TargetStatus;
}

export interface TicketTargets {
  acknowledge: TargetClock;
  restore: TargetClock;
}

export interface TicketSummary {
  id: number;
  title: string;
  status: TicketStatus;
  priority: Priority;
  category: TicketCategory;
  impact: Impact;
  hazards: Hazard[];
  waitReason: WaitReason | null;
  tool: ToolRef;
  module: { id: number; code: string; name: string } | null;
  reporter: PersonRef | null;
  assignee: PersonRef | null;
  wafersCount: number;
  mergedIntoId: number | null;
  createdAt: string;
  updatedAt: string;
  acknowledgedAt: string | null;
  resolvedAt: string | null;
  targets: TicketTargets;
  version: number;
}

export interface TicketList {
  items: TicketSummary[];
  /** Exact up to the count cap; past it `total` is the cap and `totalCapped` is true ("10,000+"). */
  total: number;
  totalCapped: boolean;
  limit: number;
  offset: number;
  /** Whether the list goes on before the first and after the last item of this page. */
  hasPrevious: boolean;
  hasNext: boolean;
}

export interface PhotoView {
  id: number;
  url: string;
  thumbUrl: string;
  width: number;
  height: number;
  uploader: PersonRef | null;
}

export interface TicketEventView {
  id: number;
  kind: string;
  internal: boolean;
  actor: PersonRef | null;
  body: string | null;
  data: Record<string, unknown> | null;
  createdAt: string;
  photos: PhotoView[];
  /** Set when the event belongs to a ticket that was merged into this one. */
  fromTicketId: number | null;
}

/** A page of a ticket's timeline, oldest first, and how many visible events come before it. */
export interface TicketEventPage {
  events: TicketEventView[];
  olderEvents: number;
}

export interface ToolStateView {
  moduleId: number | null;
  state: E10State;
  reason: StateReason;
  since: string;
  source: string;
  confirmed: boolean;
  /** The ticket that set this state, if any. */
  ticketId: number | null;
  expectedReturnAt: string | null;
}

export interface TicketDetail extends TicketSummary {
  description: string | null;
  alarmText: string | null;
  wafersOwner: string | null;
  wafersRecoverable: WaferRecoverable | null;
  priorityOverridden: boolean;
  fixKind: FixKind | null;
  failureMode: string | null;
  cause: string | null;
  workDone: string | null;
  partsUsed: string | null;
  handsOnMinutes: number | null;
  wafersRecovered: number | null;
  wafersReturned: number | null;
  fixedAt: string | null;
  closedAt: string | null;
  priorityReasons: string[];
  modules: { id: number; code: string; name: string }[];
  /** The open state of the tool and each module, so the page can show "reported by a user". */
  toolStates: ToolStateView[];
  /** The newest events, oldest first; `olderEvents` more load from GET /tickets/:id/events. */
  events: TicketEventView[];
  olderEvents: number;
  mergedFrom: { id: number; title: string }[];
  /** What the viewer may do now (workflow actions plus staff-only actions). */
  allowedActions: (TicketAction | (typeof STAFF_ONLY_ACTIONS)[number] | 'comment' | 'note' | 'add_report')[];
  viewer: { id: number; role: Role; isReporter: boolean };
}

export interface ServiceTargetView {
  priority: Priority;
  acknowledgeMinutes: number;
  restoreMinutes: number;
  updatedAt: string;
}

export interface StaffPerson extends PersonRef {
  role: Role;
}

export interface ToolChoice {
  id: number;
  code: string;
  name: string;
  areaName: string | null;
  modules: { id: number; code: string; name: string }[];
}
