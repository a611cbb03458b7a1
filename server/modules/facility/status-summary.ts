import { boardStatusOf, isDownState, rollUp, type BoardStatus, type E10State } from '../../../shared/equipment-state';

// Pure: what the board says about one tool, from the open intervals of the tool and of its
// active modules. Kept free of database code so it is easy to test and reuse.

export interface OpenState {
  state: E10State;
  note: string | null;
  restriction?: string | null;
  startedAt: Date;
  expectedReturnAt: Date | null;
}

export interface OpenModuleState extends OpenState {
  code: string;
  name: string;
}

export interface StatusSummary {
  status: BoardStatus;
  since: Date;
  note: string | null;
  expectedReturnAt: Date | null;
}

const latest = (dates: Date[]) => new Date(Math.max(...dates.map((d) => d.getTime())));
const earliest = (dates: Date[]) => new Date(Math.min(...dates.map((d) => d.getTime())));

/** Full service is back when the last of them is back; unknown if any of them has no time. */
function lastReturn(states: OpenState[]): Date | null {
  if (states.length === 0 || states.some((s) => !s.expectedReturnAt)) return null;
  return latest(states.map((s) => s.expectedReturnAt!));
}

function moduleLine(m: OpenModuleState): string {
  const word = m.state === 'scheduled_downtime' ? 'in maintenance' : m.state === 'non_scheduled' ? 'offline' : 'down';
  return m.note ? `${m.name} ${word}: ${m.note}` : `${m.name} ${word}`;
}

/**
 * The shown status follows `rollUp`. "Since" is when that status began as far as the open
 * intervals tell: the tool's own change, or for a status caused by modules, when the first
 * module went down (Limited) or the last one did (Down). A running tool counts from its own
 * change or a module's later return, whichever is later.
 */
export function summarizeStatus(tool: OpenState, modules: readonly OpenModuleState[]): StatusSummary {
  const status = rollUp(
    tool.state,
    modules.map((m) => m.state),
    Boolean(tool.restriction),
  );
  if (boardStatusOf(tool.state) !== 'running') {
    return { status, since: tool.startedAt, note: tool.note, expectedReturnAt: tool.expectedReturnAt };
  }
  const down = modules.filter((m) => isDownState(m.state));
  const parts = [tool.restriction ? `Restricted: ${tool.restriction}` : null, ...down.map(moduleLine)].filter((p): p is string =>
    Boolean(p),
  );
  if (status === 'running') {
    const since = latest([tool.startedAt, ...modules.map((m) => m.startedAt)]);
    return { status, since, note: tool.note, expectedReturnAt: null };
  }
  if (status === 'down') {
    return {
      status,
      since: latest([tool.startedAt, ...down.map((m) => m.startedAt)]),
      note: parts.join('; ') || tool.note,
      expectedReturnAt: lastReturn(down),
    };
  }
  const since = down.length > 0 ? latest([tool.startedAt, earliest(down.map((m) => m.startedAt))]) : tool.startedAt;
  return { status, since, note: parts.join('; ') || tool.note, expectedReturnAt: lastReturn(down) };
}
