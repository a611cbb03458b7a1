import { z } from 'zod';
import { plainText } from './text';

// The facility's own settings, kept by an admin: its name and time zone (the board, lobby
// displays and analytics show times in it), the emergency number and a short local procedure
// (shown with every hazard caution), and who may read tickets.

/** 'all': every member reads every ticket (an open facility, the default); 'own': members read only their own reports and the public board. */
export const MEMBER_TICKET_VISIBILITY = ['all', 'own'] as const;
export type MemberTicketVisibility = (typeof MEMBER_TICKET_VISIBILITY)[number];

export const MEMBER_TICKET_VISIBILITY_LABELS: Record<MemberTicketVisibility, string> = {
  all: 'Members see every ticket (open facility)',
  own: 'Members see only their own reports and the public board',
};

/** Whether the runtime knows the IANA time zone (Intl throws a RangeError for unknown ones). */
export function isTimeZone(value: string) {
  try {
    new Intl.DateTimeFormat('en', { timeZone: value });
    return value.length > 0;
  } catch {
    return false;
  }
}

export const facilitySettingsSchema = z.strictObject({
  facilityName: plainText().trim().min(1, 'Enter the facility name.').max(120, 'Use at most 120 characters.'),
  timeZone: plainText().trim().max(64).refine(isTimeZone, 'Enter a time zone such as Europe/Berlin or America/Chicago.'),
  emergencyNumber: z
    .string()
    .trim()
    .max(40, 'Use at most 40 characters.')
    .regex(/^$|\d/, 'Include the number to call, for example 112 or ext. 4444.'),
  localProcedure: plainText().trim().max(1000, 'Keep it short: at most 1000 characters.'),
  memberTicketVisibility: z.enum(MEMBER_TICKET_VISIBILITY),
});
export type FacilitySettingsInput = z.input<typeof facilitySettingsSchema>;
export type FacilitySettings = z.output<typeof facilitySettingsSchema>;
