// The one truth about equipment states, used by the client, the server and the analytics.
// Storage uses the six SEMI E10 states; people see the simpler board words of product.md.

export const E10_STATES = ['productive', 'standby', 'engineering', 'scheduled_downtime', 'unscheduled_downtime', 'non_scheduled'] as const;
export type E10State = (typeof E10_STATES)[number];

export const E10_LABELS: Record<E10State, string> = {
  productive: 'Productive',
  standby: 'Standby',
  engineering: 'Engineering',
  scheduled_downtime: 'Scheduled downtime',
  unscheduled_downtime: 'Unscheduled downtime',
  non_scheduled: 'Non-scheduled',
};

/**
 * Sub-reasons inside a state, kept where the E10 metrics need them (maintenance delay by
 * whose side it is on, facilities, out-of-spec input, repair) or where people ask "why".
 */
export const STATE_REASONS = [
  'none',
  'repair',
  'maintenance_delay_user',
  'maintenance_delay_supplier',
  'waiting_parts',
  'facilities_related',
  'out_of_spec_input',
  'preventive_maintenance',
  'consumables_change',
  'qualification',
  'process_development',
  'not_staffed',
] as const;
export type StateReason = (typeof STATE_REASONS)[number];

export const REASON_LABELS: Record<StateReason, string> = {
  none: 'No reason given',
  repair: 'Repair',
  maintenance_delay_user: 'Waiting on the user',
  maintenance_delay_supplier: 'Waiting on the vendor',
  waiting_parts: 'Waiting for parts',
  facilities_related: 'Facilities (gases, water, exhaust, power)',
  out_of_spec_input: 'Out-of-spec input material',
  preventive_maintenance: 'Preventive maintenance',
  consumables_change: 'Consumables change',
  qualification: 'Qualification',
  process_development: 'Process development',
  not_staffed: 'Not staffed / shut down',
};

/** Which reasons make sense in which state; the first is the default. */
export const REASONS_BY_STATE: Record<E10State, readonly StateReason[]> = {
  productive: ['none'],
  standby: ['none'],
  engineering: ['process_development', 'qualification', 'none'],
  scheduled_downtime: [
    'preventive_maintenance',
    'consumables_change',
    'qualification',
    'facilities_related',
    'maintenance_delay_supplier',
    'maintenance_delay_user',
    'none',
  ],
  unscheduled_downtime: [
    'repair',
    'waiting_parts',
    'maintenance_delay_supplier',
    'maintenance_delay_user',
    'facilities_related',
    'out_of_spec_input',
    'qualification',
    'none',
  ],
  non_scheduled: ['not_staffed', 'none'],
};

export function isReasonAllowed(state: E10State, reason: StateReason): boolean {
  return REASONS_BY_STATE[state].includes(reason);
}

/** E10 counts waiting for parts as a supplier-side maintenance delay. */
export function delayKind(reason: StateReason): 'user' | 'supplier' | null {
  if (reason === 'maintenance_delay_user') return 'user';
  if (reason === 'maintenance_delay_supplier' || reason === 'waiting_parts') return 'supplier';
  return null;
}

// ---- What people see on the board --------------------------------------------------------

export const BOARD_STATUSES = ['running', 'limited', 'down', 'maintenance', 'engineering', 'offline'] as const;
export type BoardStatus = (typeof BOARD_STATUSES)[number];

export const BOARD_LABELS: Record<BoardStatus, string> = {
  running: 'Running',
  limited: 'Limited',
  down: 'Down',
  maintenance: 'Maintenance',
  engineering: 'Engineering',
  offline: 'Offline',
};

/**
 * Each board status is told three ways: a colour whose meaning follows the IEC 60073
 * indicator code, a shape of Faultline's own, and the word. `tone` names the colour role.
 */
export const BOARD_LOOK: Record<
  BoardStatus,
  {
    tone: 'green' | 'amber' | 'red' | 'blue' | 'slate' | 'grey';
    shape: 'disc' | 'triangle' | 'cross' | 'diamond' | 'hexagon' | 'ring';
    rank: number;
  }
> = {
  // rank orders "worst first" for sorting and for summaries
  down: { tone: 'red', shape: 'cross', rank: 0 },
  limited: { tone: 'amber', shape: 'triangle', rank: 1 },
  maintenance: { tone: 'blue', shape: 'diamond', rank: 2 },
  engineering: { tone: 'slate', shape: 'hexagon', rank: 3 },
  offline: { tone: 'grey', shape: 'ring', rank: 4 },
  running: { tone: 'green', shape: 'disc', rank: 5 },
};

export function boardStatusOf(state: E10State): BoardStatus {
  switch (state) {
    case 'productive':
    case 'standby':
      return 'running';
    case 'engineering':
      return 'engineering';
    case 'scheduled_downtime':
      return 'maintenance';
    case 'unscheduled_downtime':
      return 'down';
    case 'non_scheduled':
      return 'offline';
  }
}

/** States in which a module (or tool) cannot do its job. */
export function isDownState(state: E10State): boolean {
  return state === 'unscheduled_downtime' || state === 'scheduled_downtime' || state === 'non_scheduled';
}

/**
 * The tool's board status from its own state and its modules' states.
 * - The tool's own state wins when it is not running (a tool that is Down is Down).
 * - A running tool with every active module down reads Down (nothing can be processed).
 * - A running tool with some modules down, or with a restriction in force, reads Limited.
 */
export function rollUp(toolState: E10State, moduleStates: readonly E10State[], restricted = false): BoardStatus {
  const own = boardStatusOf(toolState);
  if (own !== 'running') return own;
  const downModules = moduleStates.filter(isDownState).length;
  if (moduleStates.length > 0 && downModules === moduleStates.length) return 'down';
  if (downModules > 0 || restricted) return 'limited';
  return 'running';
}

/**
 * A state in one vocabulary: the board word first, the E10 state beside it
 * ("Down (Unscheduled downtime)"). Every place that names a state in words uses this.
 */
export function stateWords(state: E10State, status: BoardStatus = boardStatusOf(state)): string {
  return `${BOARD_LABELS[status]} (${E10_LABELS[state]})`;
}
