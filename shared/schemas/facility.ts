import { z } from 'zod';
import { plainText, isoInstant } from './text';
import {
  BOARD_STATUSES,
  E10_STATES,
  STATE_REASONS,
  isReasonAllowed,
  type BoardStatus,
  type E10State,
  type StateReason,
} from '../equipment-state';

// Inputs and answers of the facility API (areas, tools, modules, states, the board, lobby
// displays, follows, labels), shared by the client forms and the server routes.

// ---- Codes ---------------------------------------------------------------------------------

/** Tool codes appear in URLs and on labels: upper case, start with a letter, no spaces. */
export const TOOL_CODE_PATTERN = /^[A-Z][A-Z0-9-]{1,31}$/;
export const AREA_CODE_PATTERN = /^[A-Z][A-Z0-9-]{0,23}$/;
export const MODULE_CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]{0,31}$/;

const codeMessage = 'Use capital letters, digits and dashes, starting with a letter (for example ETCH-02).';
export const toolCode = plainText().trim().toUpperCase().regex(TOOL_CODE_PATTERN, codeMessage);
const areaCode = plainText().trim().toUpperCase().regex(AREA_CODE_PATTERN, codeMessage);
const moduleCode = plainText().trim().toUpperCase().regex(MODULE_CODE_PATTERN, 'Use capital letters, digits and dashes (for example PM1).');

const name = plainText().trim().min(1, 'Enter a name.').max(120, 'Use at most 120 characters.');
const description = plainText().trim().max(4000, 'Use at most 4000 characters.').nullable().optional();
const sortOrder = z.number().int().min(-1000).max(1000).optional();
const userId = z.number().int().positive().nullable().optional();
const id = z.coerce.number().int().positive();

export const CRITICALITIES = ['high', 'normal', 'low'] as const;
export type ToolCriticality = (typeof CRITICALITIES)[number];

const page = {
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
};

/** Query strings carry booleans as text. */
const flag = z.enum(['true', 'false', '1', '0']).transform((v) => v === 'true' || v === '1');

// ---- Areas, tools, modules (admin) -------------------------------------------------------

export const areaCreateSchema = z.strictObject({ name, code: areaCode, description, sortOrder });
export const areaUpdateSchema = z
  .strictObject({ name: name.optional(), code: areaCode.optional(), description, sortOrder, retired: z.boolean().optional() })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });

export const moduleCreateSchema = z.strictObject({ name, code: moduleCode, sortOrder });
export const moduleUpdateSchema = z
  .strictObject({ name: name.optional(), code: moduleCode.optional(), sortOrder, retired: z.boolean().optional() })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });

const engineersDiffer = (v: { primaryEngineerId?: number | null; backupEngineerId?: number | null }) =>
  v.primaryEngineerId == null || v.backupEngineerId == null || v.primaryEngineerId !== v.backupEngineerId;
const engineersMessage = { message: 'The backup engineer must be someone other than the primary.', path: ['backupEngineerId'] };

export const toolCreateSchema = z
  .strictObject({
    name,
    code: toolCode,
    areaId: z.number().int().positive(),
    description,
    criticality: z.enum(CRITICALITIES).default('normal'),
    primaryEngineerId: userId,
    backupEngineerId: userId,
    modules: z.array(moduleCreateSchema).max(24, 'At most 24 modules per tool.').optional(),
  })
  .refine(engineersDiffer, engineersMessage)
  .refine((v) => !v.modules || new Set(v.modules.map((m) => m.code)).size === v.modules.length, {
    message: 'Each module needs its own code.',
    path: ['modules'],
  });

export const toolUpdateSchema = z
  .strictObject({
    /** The version the editor started from; a newer one on the server means someone else saved first. */
    version: z.number().int().min(0),
    name: name.optional(),
    code: toolCode.optional(),
    areaId: z.number().int().positive().optional(),
    description,
    criticality: z.enum(CRITICALITIES).optional(),
    primaryEngineerId: userId,
    backupEngineerId: userId,
    retired: z.boolean().optional(),
  })
  .refine(engineersDiffer, engineersMessage);

export const adminListQuery = z.strictObject({
  q: plainText().trim().max(120).optional(),
  areaId: id.optional(),
  includeRetired: flag.optional(),
  ...page,
});

export const engineerListQuery = z.strictObject({ q: plainText().trim().max(120).optional(), ...page });

export type AreaCreateInput = z.infer<typeof areaCreateSchema>;
export type AreaUpdateInput = z.infer<typeof areaUpdateSchema>;
export type ToolCreateInput = z.input<typeof toolCreateSchema>;
export type ToolUpdateInput = z.infer<typeof toolUpdateSchema>;
export type ModuleCreateInput = z.infer<typeof moduleCreateSchema>;
export type ModuleUpdateInput = z.infer<typeof moduleUpdateSchema>;

// ---- State changes -----------------------------------------------------------------------

/** A little slack for clocks and for a time picked "now" a few seconds before sending. */
export const RETURN_TIME_SLACK_MS = 60_000;

const RUNNING_STATES: readonly E10State[] = ['productive', 'standby'];

/**
 * The fields of a state change, wherever it is asked for: the tool page and a ticket's "set tool
 * state" both spread these and refine with checkStateChange, so both refuse the same input
 * with the same field messages.
 */
export const stateChangeFields = {
  /** null or absent: the tool itself; otherwise one of its modules. */
  moduleId: z.number().int().positive().nullable().optional(),
  state: z.enum(E10_STATES, { error: 'Choose one of the states.' }),
  reason: z.enum(STATE_REASONS).optional(),
  /** What people at the tool should know: why, and what to do meanwhile. */
  note: plainText().trim().max(500, 'Use at most 500 characters.').nullable().optional(),
  restriction: plainText().trim().max(200, 'Use at most 200 characters.').nullable().optional(),
  expectedReturnAt: isoInstant('Give the time as a date and time.').nullable().optional(),
};

export type StateChangeFields = z.infer<z.ZodObject<typeof stateChangeFields>>;

/** A note is required unless the tool runs; no restriction unless it runs; no return time in the past. */
export function checkStateChange(v: StateChangeFields, ctx: z.RefinementCtx) {
  const running = RUNNING_STATES.includes(v.state);
  if (v.reason && !isReasonAllowed(v.state, v.reason)) {
    ctx.addIssue({ code: 'custom', path: ['reason'], message: 'That reason does not fit that state.' });
  }
  if (!running && !v.note?.trim()) {
    ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say why, so people at the tool know what is going on.' });
  }
  if (v.restriction && !running) {
    ctx.addIssue({ code: 'custom', path: ['restriction'], message: 'A restriction applies only while the tool runs.' });
  }
  if (v.expectedReturnAt) {
    if (running) {
      ctx.addIssue({
        code: 'custom',
        path: ['expectedReturnAt'],
        message: 'An expected return time fits only a state in which it is not running.',
      });
    } else if (Date.parse(v.expectedReturnAt) < Date.now() - RETURN_TIME_SLACK_MS) {
      ctx.addIssue({ code: 'custom', path: ['expectedReturnAt'], message: 'The expected return time is in the past.' });
    }
  }
}

export const stateChangeSchema = z
  .strictObject({ ...stateChangeFields, ticketId: z.number().int().positive().nullable().optional() })
  .superRefine(checkStateChange);

export type StateChangeInput = z.infer<typeof stateChangeSchema>;

export const historyQuery = z.strictObject({
  /** 'tool' for the tool's own log, a module id for one module, absent for both. */
  moduleId: z.union([z.literal('tool'), id]).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(20),
  offset: z.coerce.number().int().min(0).default(0),
});

export const toolCodeParams = z.strictObject({ code: toolCode });

// ---- The board ---------------------------------------------------------------------------

export const boardQuery = z.strictObject({
  q: plainText().trim().max(120).optional(),
  areaId: id.optional(),
  status: z.enum(BOARD_STATUSES).optional(),
});
export type BoardQuery = z.infer<typeof boardQuery>;

export interface BoardModule {
  id: number;
  code: string;
  name: string;
  state: E10State;
  status: BoardStatus;
  reason: StateReason;
  note: string | null;
  since: string;
  expectedReturnAt: string | null;
}

export interface BoardTool {
  id: number;
  code: string;
  name: string;
  areaId: number;
  criticality: ToolCriticality;
  /** The rolled-up status people see. */
  status: BoardStatus;
  /** The tool's own E10 state (its modules may make the status worse). */
  state: E10State;
  reason: StateReason;
  /** The text shown as "why": the tool's note, or what is wrong with its modules. */
  note: string | null;
  restriction: string | null;
  /** When the shown status began, as far as the open intervals tell. */
  since: string;
  expectedReturnAt: string | null;
  /** False while a user's report set the state and no technician has confirmed it. */
  confirmed: boolean;
  source: string;
  openTickets: number;
  /** The latest alarm the tool reports as set (and how many are set), or null. */
  activeAlarm: { alarmId: string; text: string; since: string; count: number } | null;
  /** The next booked maintenance window not yet over (ISO times), or null. */
  plannedMaintenance: { startsAt: string; endsAt: string } | null;
  modules: BoardModule[];
}

export interface BoardArea {
  id: number;
  code: string;
  name: string;
  tools: BoardTool[];
}

export interface BoardData {
  areas: BoardArea[];
  /** Tools per status over the whole board (before the q/area/status filters). */
  counts: Record<BoardStatus, number>;
  total: number;
}

// ---- Tool page ---------------------------------------------------------------------------

export interface PersonRef {
  id: number;
  name: string;
  /** Only for staff viewers: members see names, not staff e-mail addresses. */
  email?: string;
}

export interface AvailabilityFigure {
  from: string;
  to: string;
  /** Milliseconds of the period in which the tool existed and had a state. */
  coveredMs: number;
  /** Milliseconds in scheduled downtime, unscheduled downtime or non-scheduled time. */
  downMs: number;
  /** Share of covered time not down, 0..1; null when the tool has no time in the period. */
  availability: number | null;
  byState: Record<E10State, number>;
}

/** What a user may do on the tool page; the tool detail sends the allowed ones. */
export type ToolAction = 'change_state';

export interface ToolDetail extends BoardTool {
  description: string | null;
  area: { id: number; code: string; name: string };
  primaryEngineer: PersonRef | null;
  backupEngineer: PersonRef | null;
  retiredAt: string | null;
  /** Whether the signed-in user follows this tool. */
  following: boolean;
  availability30d: AvailabilityFigure;
  setBy: { id: number; name: string } | null;
  allowedActions: ToolAction[];
}

export interface HistoryEntry {
  id: number;
  moduleId: number | null;
  moduleName: string | null;
  state: E10State;
  previousState: E10State | null;
  reason: StateReason;
  note: string | null;
  restriction: string | null;
  startedAt: string;
  endedAt: string | null;
  expectedReturnAt: string | null;
  ticketId: number | null;
  source: string;
  confirmed: boolean;
  setBy: { id: number; name: string } | null;
}

export interface Page<T> {
  items: T[];
  total: number;
  limit: number;
  offset: number;
}

// ---- Follows, notices, displays, labels ---------------------------------------------------

export const unfollowTokenSchema = z.strictObject({
  token: plainText().regex(/^[A-Za-z0-9_-]{43}$/, 'This unfollow link is not valid.'),
});

export const noticeListQuery = z.strictObject({ unread: flag.optional(), ...page });

export interface NoticeItem {
  id: number;
  kind: string;
  title: string;
  body: string | null;
  link: string | null;
  readAt: string | null;
  createdAt: string;
}

export interface NoticePage extends Page<NoticeItem> {
  unread: number;
}

export const displayLinkCreateSchema = z.strictObject({ name });
export const displayLinkListQuery = z.strictObject({ includeRevoked: flag.optional(), ...page });

export interface DisplayLinkItem {
  id: number;
  name: string;
  createdAt: string;
  revokedAt: string | null;
  lastSeenAt: string | null;
  createdBy: string | null;
}

export const labelsQuery = z.strictObject({ areaId: id.optional() });

export interface ToolLabel {
  toolId: number;
  code: string;
  name: string;
  areaName: string;
  url: string;
  /** The QR code as an SVG document. */
  svg: string;
}
