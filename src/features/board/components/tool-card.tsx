import { Link } from 'react-router';
import { BOARD_LABELS, E10_LABELS, REASON_LABELS } from '@shared/equipment-state';
import type { BoardTool } from '@shared/schemas/facility';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateBadge } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';
import { useNow } from '@/lib/use-now';
import { formatWindow } from '@/lib/maintenance-window';

// The coloured edge repeats the badge's colour; the badge's shape and word carry the meaning.
const EDGE: Record<BoardTool['status'], string> = {
  running: 'border-l-state-running-fill',
  limited: 'border-l-state-limited-fill',
  down: 'border-l-state-down-fill',
  maintenance: 'border-l-state-maintenance-fill',
  engineering: 'border-l-state-engineering-fill',
  offline: 'border-l-state-offline-mark',
};

/** Why the tool is in its state, in words people at the tool can act on. */
export function reasonText(tool: BoardTool): string | null {
  if (tool.note) return tool.note;
  if (tool.reason !== 'none') return REASON_LABELS[tool.reason];
  return null;
}

export function ToolCard({ tool }: { tool: BoardTool }) {
  const now = useNow();
  const why = reasonText(tool);
  const reported = !tool.confirmed;
  const overdue = tool.expectedReturnAt && new Date(tool.expectedReturnAt).getTime() < now;
  return (
    <li
      data-testid={`board-tool-${tool.code}`}
      data-status={tool.status}
      className={cx(
        'flex flex-col gap-2 rounded-lg border border-l-[6px] border-line bg-card p-3 shadow-sm amber:border-2 amber:border-l-[6px] amber:border-black',
        EDGE[tool.status],
      )}
    >
      <div className="flex items-start justify-between gap-3">
        <div className="min-w-0">
          <Link
            to={`/tools/${encodeURIComponent(tool.code)}`}
            className="block min-h-11 py-0.5 font-semibold leading-snug text-ink no-underline hover:underline"
          >
            {tool.name}
            <span className="block font-mono text-xs font-normal text-muted">{tool.code}</span>
          </Link>
        </div>
        {/* The board word leads; the E10 state sits beside it (one vocabulary everywhere). */}
        <span className="flex shrink-0 flex-col items-end gap-1">
          <StateBadge status={tool.status} label={reported ? `${BOARD_LABELS[tool.status]} · reported` : undefined} />
          <span className="text-xs text-muted" data-testid="state-e10">
            {E10_LABELS[tool.state]}
          </span>
        </span>
      </div>

      {why && <p className="line-clamp-3 text-sm text-ink">{why}</p>}
      {tool.plannedMaintenance && tool.status !== 'maintenance' && (
        <p className="text-sm font-medium text-ink" data-testid="planned-maintenance">
          Maintenance planned {formatWindow(tool.plannedMaintenance.startsAt, tool.plannedMaintenance.endsAt)}
        </p>
      )}
      {reported && <p className="text-xs font-medium text-muted">Set by a user’s report; staff have not confirmed it yet.</p>}
      {tool.activeAlarm && (
        <p className="text-sm text-ink" data-testid={`board-alarm-${tool.code}`}>
          <span className="font-semibold">Alarm{tool.activeAlarm.count > 1 ? ` (${tool.activeAlarm.count} set)` : ''}:</span>{' '}
          <span className="font-mono">{tool.activeAlarm.text}</span>{' '}
          <RelativeTime value={tool.activeAlarm.since} mode="elapsed" prefix="for" className="text-muted" />
        </p>
      )}

      <p className="flex flex-wrap gap-x-3 gap-y-1 text-sm text-muted">
        <RelativeTime value={tool.since} mode="elapsed" prefix={`${BOARD_LABELS[tool.status]} for`} />
        {tool.expectedReturnAt && (
          <span className={cx(overdue && 'font-semibold text-alert-danger-ink')}>
            {overdue ? 'Was expected back ' : 'Expected back '}
            <RelativeTime value={tool.expectedReturnAt} />
          </span>
        )}
        {tool.openTickets > 0 && (
          <span className="font-medium text-ink">
            {tool.openTickets} open {tool.openTickets === 1 ? 'ticket' : 'tickets'}
          </span>
        )}
      </p>
    </li>
  );
}
