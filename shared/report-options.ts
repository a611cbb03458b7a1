// The fixed choices of a fault report. The zod schemas, the report form and the server all
// read them from here so that a key added in one place cannot be missing in another.

export const TICKET_CATEGORIES = [
  'alarm_interlock',
  'wafer_handling',
  'process_out_of_spec',
  'vacuum',
  'temperature',
  'chemical_supply_waste',
  'utilities',
  'software_controller',
  'mechanical_damage',
  'leak_smell',
  'other',
] as const;
export type TicketCategory = (typeof TICKET_CATEGORIES)[number];

export const CATEGORY_LABELS: Record<TicketCategory, string> = {
  alarm_interlock: 'Alarm or interlock',
  wafer_handling: 'Wafer handling (stuck, broken or dropped wafer)',
  process_out_of_spec: 'Process out of specification',
  vacuum: 'Vacuum',
  temperature: 'Temperature',
  chemical_supply_waste: 'Chemical supply or waste',
  utilities: 'Utilities (gases, cooling water, exhaust, power)',
  software_controller: 'Software or controller',
  mechanical_damage: 'Mechanical damage',
  leak_smell: 'Leak or smell',
  other: 'Other',
};

// Ordered from worst to mildest so a form can list them in that order.
export const IMPACTS = ['tool_stopped', 'tool_limited', 'still_usable'] as const;
export type Impact = (typeof IMPACTS)[number];

export const IMPACT_LABELS: Record<Impact, string> = {
  tool_stopped: 'Tool stopped',
  tool_limited: 'Tool limited',
  still_usable: 'Still usable',
};

export const IMPACT_HELP: Record<Impact, string> = {
  tool_stopped: 'The tool cannot run at all right now.',
  tool_limited: 'It runs, but some modules, recipes or settings cannot be used.',
  still_usable: 'It works as normal for now, but someone should look at the problem.',
};

export const HAZARDS = ['smell', 'leak', 'fire_smoke', 'injury', 'electrical'] as const;
export type Hazard = (typeof HAZARDS)[number];

export const HAZARD_LABELS: Record<Hazard, string> = {
  smell: 'Unusual smell',
  leak: 'Leak or spill',
  fire_smoke: 'Fire or smoke',
  injury: 'Someone is hurt',
  electrical: 'Electrical danger',
};

// These are the maintenance-delay reasons that the uptime figures need to tell apart
// (a wait for the user or for facilities is not charged to the equipment).
export const WAIT_REASONS = ['parts', 'vendor', 'facilities', 'user'] as const;
export type WaitReason = (typeof WAIT_REASONS)[number];

export const WAIT_REASON_LABELS: Record<WaitReason, string> = {
  parts: 'Waiting for parts',
  vendor: 'Waiting for vendor service',
  facilities: 'Waiting for facilities',
  user: 'Waiting for the user',
};

// Failures and assists are counted separately: one feeds MTBF, the other the assist rate.
export const FIX_KINDS = ['failure', 'assist'] as const;
export type FixKind = (typeof FIX_KINDS)[number];

export const FIX_KIND_LABELS: Record<FixKind, string> = {
  failure: 'Failure',
  assist: 'Assist',
};

export const FIX_KIND_HELP: Record<FixKind, string> = {
  failure: 'Something unplanned left the tool unable to do its job, and it needed a repair.',
  assist: 'An unplanned stop that was cleared without a repair, for example freeing a stuck wafer.',
};

// Shown on the report form when a hazard is ticked and on every ticket that carries one.
// The last line must stay last: it states the limits of what the app does.
export const HAZARD_CAUTIONS: readonly string[] = [
  'Fire, smoke, a gas alarm or a large spill: leave the area now and raise the facility alarm.',
  'If someone is hurt, call for help through the facility emergency number before reporting.',
  'Press the emergency stop only in a real emergency.',
  'Do not touch, wipe up or move a chemical you cannot identify.',
  "Follow your facility's own emergency procedures and local regulations; they come first.",
  "Faultline records the report and tells the right people. It does not replace the facility's alarm systems, its trained staff or the emergency response.",
];
