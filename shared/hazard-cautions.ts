import { HAZARDS, HAZARD_CAUTIONS, HAZARD_LABELS, type Hazard } from './report-options';

// What to do first for each kind of hazard a report can name. These are common practice for
// a cleanroom (leave, warn, raise the alarm, do not investigate alone); the facility's own
// procedure and emergency number, set by an admin, are shown with them and come first.
export const HAZARD_FIRST_STEPS: Record<Hazard, readonly string[]> = {
  smell: [
    'Step back from the smell and warn the people near you.',
    'Do not look for the source, open cabinets or sniff containers.',
    'If you feel dizzy, sick or short of breath, leave the area and get fresh air.',
  ],
  leak: [
    'Keep away from the liquid or gas and warn the people near you.',
    'Do not wipe up or touch a chemical you cannot identify.',
    'A large spill or a gas alarm: leave the area and raise the facility alarm.',
  ],
  fire_smoke: [
    'Leave the area now and raise the facility alarm.',
    'Use an extinguisher only if you are trained and the fire is very small.',
    'Do not go back in until the emergency team says so.',
  ],
  injury: [
    'Call for help on the emergency number before anything else.',
    'Chemical on skin or in the eyes: rinse at the nearest safety shower or eyewash, for at least 15 minutes.',
    'Do not move a hurt person unless staying puts them in more danger.',
  ],
  electrical: [
    'Do not touch the tool, its cables, or anyone in contact with them.',
    'Cut the power at the emergency stop or main switch only if you can reach it safely.',
    'Keep others away until staff arrive.',
  ],
};

/** The generic lines that apply to every hazard (all but the last line, which is the limits line). */
export const GENERIC_CAUTIONS: readonly string[] = HAZARD_CAUTIONS.slice(0, -1);
/** Always shown last: what Faultline does not replace. */
export const LIMITS_CAUTION: string = HAZARD_CAUTIONS[HAZARD_CAUTIONS.length - 1];

export interface CautionSettings {
  emergencyNumber: string;
  localProcedure: string;
  facilityName?: string;
}

export interface Cautions {
  /** The facility's emergency number, when an admin has set it. */
  emergencyNumber: string | null;
  /** The facility's own short procedure, when set. */
  localProcedure: string | null;
  /** First steps per ticked hazard, in the fixed hazard order. */
  specific: { hazard: Hazard; label: string; steps: readonly string[] }[];
  generic: readonly string[];
  limits: string;
}

/** The cautions for what was ticked, with the facility's own number and procedure. */
export function cautionsFor(hazards: readonly Hazard[], settings: CautionSettings | null): Cautions {
  const ticked = new Set(hazards);
  return {
    emergencyNumber: settings?.emergencyNumber.trim() || null,
    localProcedure: settings?.localProcedure.trim() || null,
    specific: HAZARDS.filter((h) => ticked.has(h)).map((h) => ({ hazard: h, label: HAZARD_LABELS[h], steps: HAZARD_FIRST_STEPS[h] })),
    generic: GENERIC_CAUTIONS,
    limits: LIMITS_CAUTION,
  };
}

/** The same cautions as plain text lines (for e-mail). */
export function cautionLines(c: Cautions): string[] {
  return [
    ...(c.emergencyNumber ? [`Emergency number: ${c.emergencyNumber}`] : []),
    ...(c.localProcedure ? [`Local procedure: ${c.localProcedure}`] : []),
    ...c.specific.flatMap((s) => [`${s.label}:`, ...s.steps.map((l) => `- ${l}`)]),
    'Always:',
    ...c.generic.map((l) => `- ${l}`),
    c.limits,
  ];
}
