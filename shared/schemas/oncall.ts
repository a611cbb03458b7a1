import { z } from 'zod';
import { isoInstant, plainText } from './text';
import { DUTIES, SEVERITIES, WEEK_MS, type Duty, type Severity, type Step } from '../oncall';

const userId = z.number({ error: 'Choose a person.' }).int().positive();
const instant = (label: string) => isoInstant(`Give the ${label} as a date and time.`).transform((v) => new Date(v));
const clock = z
  .string()
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Give a time of day as HH:MM (00:00–23:59).')
  .nullable();

export const shiftInput = z
  .strictObject({
    userId,
    duty: z.enum(DUTIES),
    startsAt: instant('start'),
    endsAt: instant('end'),
    weekly: z.boolean().default(false),
    repeatUntil: instant('last week').nullable().default(null),
  })
  .superRefine((v, ctx) => {
    if (v.endsAt <= v.startsAt) ctx.addIssue({ code: 'custom', path: ['endsAt'], message: 'The end must come after the start.' });
    else if (v.weekly && v.endsAt.getTime() - v.startsAt.getTime() > WEEK_MS)
      ctx.addIssue({ code: 'custom', path: ['endsAt'], message: 'A shift that repeats every week lasts at most a week.' });
    if (v.repeatUntil && v.repeatUntil <= v.startsAt)
      ctx.addIssue({ code: 'custom', path: ['repeatUntil'], message: 'The repeats must end after the first shift starts.' });
  });
export type ShiftInput = z.input<typeof shiftInput>;

export const coverInput = z
  .strictObject({
    userId,
    duty: z.enum(DUTIES),
    startsAt: instant('start'),
    endsAt: instant('end'),
    note: plainText().trim().max(200).default(''),
  })
  .superRefine((v, ctx) => {
    if (v.endsAt <= v.startsAt) ctx.addIssue({ code: 'custom', path: ['endsAt'], message: 'The end must come after the start.' });
  });
export type CoverInput = z.input<typeof coverInput>;

export const policyInput = z.strictObject({
  stepMinutes: z
    .number({ error: 'Give the minutes as a whole number.' })
    .int()
    .min(1, 'At least 1 minute.')
    .max(240, 'At most 240 minutes.'),
  managerId: userId.nullable(),
  nightStarts: clock.default(null),
  nightEnds: clock.default(null),
});
export type PolicyInput = z.input<typeof policyInput>;

export const severityParams = z.strictObject({ severity: z.enum(SEVERITIES) });
export const userParams = z.strictObject({ userId: z.coerce.number().int().positive() });

export const contactInput = z.strictObject({
  phone: z
    .string()
    .trim()
    .regex(/^\+[1-9]\d{6,14}$/, 'Give the number in international form, e.g. +4930123456.'),
});

export const pageAckInput = z.strictObject({
  token: z
    .string()
    .min(20)
    .max(100)
    .regex(/^[A-Za-z0-9_-]+$/, 'This is not a page link.'),
});

export const rotaQuery = z.strictObject({ from: isoInstant().optional(), days: z.coerce.number().int().min(1).max(28).default(14) });

/** A reply an admin sends from the local SMS fake, as if the paged person had texted back. */
export const fakeReplyInput = z.strictObject({ text: plainText().trim().min(1, 'Write the reply.').max(160) });

/**
 * An inbound message event as the SMS provider posts it. Only the fields Faultline reads are
 * checked; the provider adds others as it sees fit, so unknown keys are let through here (the
 * signature, checked before this, is what makes the body trustworthy).
 */
export const inboundSmsEvent = z.looseObject({
  data: z.looseObject({
    id: z.string().min(1).max(100),
    event_type: z.string().max(100),
    payload: z
      .looseObject({
        from: z.looseObject({ phone_number: z.string().max(20) }),
        text: plainText().max(1000).nullable().optional(),
      })
      .optional(),
  }),
});

export interface Person {
  id: number;
  name: string;
}

export interface ShiftView {
  id: number;
  person: Person;
  duty: Duty;
  startsAt: string;
  endsAt: string;
  weekly: boolean;
  repeatUntil: string | null;
}

export interface CoverView {
  id: number;
  person: Person;
  duty: Duty;
  startsAt: string;
  endsAt: string;
  note: string;
}

export interface PolicyView {
  severity: Severity;
  stepMinutes: number;
  manager: Person | null;
  nightStarts: string | null;
  nightEnds: string | null;
}

export interface ContactView {
  person: Person & { role: string };
  phone: string | null;
}

/** One stretch of the coming days: who holds each duty then. */
export interface RotaStretch {
  from: string;
  to: string;
  onCall: Person | null;
  backup: Person | null;
}

export interface RotaView {
  shifts: ShiftView[];
  covers: CoverView[];
  policies: PolicyView[];
  contacts: ContactView[];
  now: { onCall: Person | null; backup: Person | null };
  upcoming: RotaStretch[];
  timeZone: string;
  /** Whether texts go to the local fake (demo) or the real provider. */
  smsMode: 'fake' | 'provider' | 'off';
}

export interface PageView {
  id: number;
  step: Step;
  person: Person;
  /** Only the last digits: enough to tell numbers apart on the ticket page. */
  phoneEnd: string | null;
  sentAt: string;
  /** When the text left through the provider (null while it waits in the outbox). */
  textSentAt: string | null;
}

export interface EscalationView {
  id: number;
  severity: Severity;
  status: 'open' | 'acknowledged' | 'unanswered';
  startedAt: string;
  stepMinutes: number;
  nextStepAt: string | null;
  nextStep: Step | null;
  acknowledgedAt: string | null;
  acknowledgedBy: Person | null;
  acknowledgedVia: 'link' | 'sms' | 'app' | null;
  pages: PageView[];
}

export interface TicketPagesView {
  escalations: EscalationView[];
  /** Whether the viewer may acknowledge in the app (they were paged on an open escalation). */
  mayAcknowledge: boolean;
}

export interface CaughtText {
  id: string;
  to: string;
  from: string;
  text: string;
  idempotencyKey: string | null;
  repeat: boolean;
  receivedAt: string;
  /** Replies sent from the fake back to Faultline's webhook, and the answer's status. */
  replies: { text: string; at: string; status: number }[];
}
