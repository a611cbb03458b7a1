import { z } from 'zod';
import { isoInstant, plainText } from './text';
import { UNIFORMITY_FIGURES } from '../requalification';

// Inputs of the maintenance API (plans, work orders, downtime windows, calendar feeds,
// requalification, parts), shared by the client forms and the server routes.

export const WORK_ORDER_STATUSES = ['planned', 'scheduled', 'in_progress', 'done', 'skipped'] as const;
export type WorkOrderStatus = (typeof WORK_ORDER_STATUSES)[number];
export const WORK_ORDER_STATUS_LABELS: Record<WorkOrderStatus, string> = {
  planned: 'Planned',
  scheduled: 'Scheduled',
  in_progress: 'In progress',
  done: 'Done',
  skipped: 'Skipped',
};

const id = z.coerce.number().int().positive();
const text = (max: number) => plainText().trim().max(max, `Use at most ${max} characters.`);
const required = (max: number, message: string) => text(max).min(1, message);
const optionalText = (max: number) =>
  text(max)
    .nullish()
    .transform((v) => (v ? v : null));
const finite = z.number().refine(Number.isFinite, 'Enter a number.');
const optionalNumber = finite.nullish().transform((v) => v ?? null);
const isoDate = isoInstant('Enter a date and time.').transform((v) => new Date(v));

export const checklistStepSchema = z
  .strictObject({
    text: required(300, 'Say what to do.'),
    /** A step may ask for a reading, with its unit and limits. */
    unit: optionalText(20),
    min: optionalNumber,
    max: optionalNumber,
    asksValue: z.boolean().default(false),
  })
  .refine((s) => s.min === null || s.max === null || s.min <= s.max, {
    message: 'The lower limit must not be above the upper.',
    path: ['max'],
  });
export type ChecklistStep = z.output<typeof checklistStepSchema>;

const planFields = {
  title: required(160, 'Give the plan a title.'),
  moduleId: z
    .number()
    .int()
    .positive()
    .nullish()
    .transform((v) => v ?? null),
  checklist: z.array(checklistStepSchema).min(1, 'Add at least one step.').max(100, 'Use at most 100 steps.'),
  estimatedMinutes: z.number().int().min(1, 'Estimate at least a minute.').max(100_000),
  everyDays: z
    .number()
    .int()
    .min(1)
    .max(3650)
    .nullish()
    .transform((v) => v ?? null),
  everyUnits: z
    .number()
    .int()
    .min(1)
    .max(100_000_000)
    .nullish()
    .transform((v) => v ?? null),
  counterName: optionalText(40),
  leadDays: z.number().int().min(0).max(365).default(0),
  leadUnits: z.number().int().min(0).max(100_000_000).default(0),
  graceFactor: z.number().min(1, 'The grace factor is at least 1.').max(3, 'Use at most 3.').default(1.25),
};

function triggerChecks(p: { everyDays?: number | null; everyUnits?: number | null; counterName?: string | null }, ctx: z.RefinementCtx) {
  if (p.everyDays == null && p.everyUnits == null) {
    ctx.addIssue({ code: 'custom', message: 'Give an interval in days, in units of a counter, or both.', path: ['everyDays'] });
  }
  if (p.everyUnits != null && !p.counterName) {
    ctx.addIssue({ code: 'custom', message: 'Name the counter the units are read from (for example wafers).', path: ['counterName'] });
  }
}

export const planCreateSchema = z
  .strictObject({ toolId: z.number().int().positive(), ...planFields, lastDoneAt: isoDate.optional() })
  .superRefine(triggerChecks);
export type PlanCreateInput = z.output<typeof planCreateSchema>;

export const planUpdateSchema = z
  .strictObject({
    version: z.number().int().min(0),
    title: planFields.title.optional(),
    checklist: planFields.checklist.optional(),
    estimatedMinutes: planFields.estimatedMinutes.optional(),
    everyDays: z.number().int().min(1).max(3650).nullable().optional(),
    everyUnits: z.number().int().min(1).max(100_000_000).nullable().optional(),
    counterName: text(40).nullable().optional(),
    leadDays: z.number().int().min(0).max(365).optional(),
    leadUnits: z.number().int().min(0).max(100_000_000).optional(),
    graceFactor: z.number().min(1).max(3).optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 1, { message: 'Change at least one field.' });
export type PlanUpdateInput = z.output<typeof planUpdateSchema>;

export const planListQuery = z.strictObject({
  toolId: id.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});

export const workOrderListQuery = z.strictObject({
  toolId: id.optional(),
  status: z.enum(WORK_ORDER_STATUSES).optional(),
  open: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const workOrderFromTicketSchema = z.strictObject({
  title: optionalText(160),
  checklist: z.array(checklistStepSchema).max(100).default([]),
  estimatedMinutes: z
    .number()
    .int()
    .min(1)
    .max(100_000)
    .nullish()
    .transform((v) => v ?? null),
});

const version = z.number().int().min(0);

const bothDates = (a: unknown, b: unknown) => a instanceof Date && b instanceof Date;

export const windowSchema = z
  .strictObject({ version, startsAt: isoDate, endsAt: isoDate })
  // Refinements run even when a field failed to parse; only compare real dates.
  .refine((w) => !bothDates(w.startsAt, w.endsAt) || w.endsAt > w.startsAt, {
    message: 'The window must end after it starts.',
    path: ['endsAt'],
  })
  .refine((w) => !bothDates(w.startsAt, w.endsAt) || w.endsAt.getTime() - w.startsAt.getTime() <= 14 * 24 * 3600_000, {
    message: 'A window is at most 14 days long.',
    path: ['endsAt'],
  });

export const stepResultSchema = z.strictObject({
  step: z.number().int().min(0).max(99),
  done: z.boolean().default(false),
  value: optionalNumber,
});

export const workOrderProgressSchema = z.strictObject({
  version,
  results: z.array(stepResultSchema).max(100).optional(),
  handsOnMinutes: z.number().int().min(0).max(100_000).nullable().optional(),
  notes: text(8000).nullable().optional(),
});

/** Proof for returning a tool to service, shared by work orders and repair tickets. */
export const returnOverrideReason = text(1000).min(5, 'Say why the tool may return without a passing record.');

export const workOrderCompleteSchema = z.strictObject({
  version,
  overrideReason: returnOverrideReason.optional(),
});

export const workOrderSkipSchema = z.strictObject({ version, reason: required(1000, 'Say why it is skipped.') });
export const versionOnlySchema = z.strictObject({ version });

export const feedCreateSchema = z
  .strictObject({
    scope: z.enum(['facility', 'area', 'tool']),
    scopeId: z
      .number()
      .int()
      .positive()
      .nullish()
      .transform((v) => v ?? null),
    label: optionalText(120),
  })
  .refine((f) => (f.scope === 'facility') === (f.scopeId === null), {
    message: 'Choose the area or tool (and none for the whole facility).',
    path: ['scopeId'],
  });

export const feedTokenParams = z.strictObject({ token: z.string().regex(/^[A-Za-z0-9_-]{43}\.ics$/, 'Unknown feed.') });

const figureLimitSchema = z
  .strictObject({ figure: z.enum(UNIFORMITY_FIGURES), min: optionalNumber, max: optionalNumber })
  .refine((l) => l.min !== null || l.max !== null, { message: 'Give a lower limit, an upper limit or both.', path: ['max'] })
  .refine((l) => l.min === null || l.max === null || l.min <= l.max, {
    message: 'The lower limit must not be above the upper.',
    path: ['max'],
  });

const requalTemplateFields = {
  name: required(160, 'Name the check.'),
  quantity: required(120, 'Say what is measured.'),
  unit: required(20, 'Give the unit.'),
  points: z.number().int().min(1).max(500),
  target: optionalNumber,
  lsl: optionalNumber,
  usl: optionalNumber,
  limits: z.array(figureLimitSchema).min(1, 'Add at least one limit.').max(10),
};
const specLimitsInOrder = (t: { lsl: number | null; usl: number | null }) => t.lsl === null || t.usl === null || t.lsl <= t.usl;
const specLimitsMessage = { message: 'The lower spec limit must not be above the upper.', path: ['usl'] };

export const requalTemplateSchema = z.strictObject(requalTemplateFields).refine(specLimitsInOrder, specLimitsMessage);
export const requalTemplateUpdateSchema = z
  .strictObject({ ...requalTemplateFields, active: z.boolean().optional() })
  .refine(specLimitsInOrder, specLimitsMessage);
export type RequalTemplateInput = z.output<typeof requalTemplateSchema>;

export const requalRecordSchema = z
  .strictObject({
    values: z.array(finite).min(1).max(500).optional(),
    /** A column pasted from a metrology export: one value a line. */
    pasted: text(20_000).optional(),
    workOrderId: z
      .number()
      .int()
      .positive()
      .nullish()
      .transform((v) => v ?? null),
    ticketId: z
      .number()
      .int()
      .positive()
      .nullish()
      .transform((v) => v ?? null),
    note: optionalText(1000),
  })
  .refine((r) => (r.values === undefined) !== (r.pasted === undefined), {
    message: 'Type the values or paste a column (one of the two).',
    path: ['values'],
  });
export type RequalRecordInput = z.output<typeof requalRecordSchema>;

export const partCreateSchema = z.strictObject({
  name: required(160, 'Name the part.'),
  partNumber: required(80, 'Give the part number.'),
  toolIds: z.array(z.number().int().positive()).max(500).default([]),
  stock: z.number().int().min(0).max(1_000_000),
  reorderLevel: z.number().int().min(0).max(1_000_000),
});
export const partUpdateSchema = z
  .strictObject({
    name: required(160, 'Name the part.').optional(),
    partNumber: required(80, 'Give the part number.').optional(),
    toolIds: z.array(z.number().int().positive()).max(500).optional(),
    stock: z.number().int().min(0).max(1_000_000).optional(),
    reorderLevel: z.number().int().min(0).max(1_000_000).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one field.' });
export const partListQuery = z.strictObject({
  toolId: id.optional(),
  q: text(80).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(200),
  offset: z.coerce.number().int().min(0).default(0),
});

/** A part used: from the list (partId) or, for one not in the list, named in free text. */
export const partUseSchema = z
  .strictObject({
    partId: z
      .number()
      .int()
      .positive()
      .nullish()
      .transform((v) => v ?? null),
    freeText: optionalText(200),
    quantity: z.number().int().min(1).max(10_000),
  })
  .refine((u) => (u.partId === null) !== (u.freeText === null), {
    message: 'Pick a part from the list or name one (one of the two).',
    path: ['partId'],
  });
export type PartUseInput = z.output<typeof partUseSchema>;

export const counterReadingSchema = z.strictObject({
  counter: required(40, 'Name the counter.'),
  value: z.number().min(0).max(1e12),
  at: isoDate.optional(),
});

export const figuresQuery = z
  .strictObject({ from: isoDate, to: isoDate, toolId: id.optional() })
  .refine((q) => !bothDates(q.from, q.to) || q.to > q.from, { message: 'The end must be after the start.', path: ['to'] });

export const toolIdParams = z.strictObject({ toolId: id });
