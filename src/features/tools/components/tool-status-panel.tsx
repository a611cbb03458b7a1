import { BOARD_LABELS, E10_LABELS, REASON_LABELS } from '@shared/equipment-state';
import type { ToolDetail } from '@shared/schemas/facility';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateBadge } from '@/components/ui/state-badge';
import { formatExact } from '@/lib/time';

/** The tool's state as big as the page allows: what, since when, why, back when. */
export function ToolStatusPanel({ tool }: { tool: ToolDetail }) {
  const reported = !tool.confirmed;
  return (
    <div className="flex flex-col gap-3" data-testid="tool-status">
      <div className="flex flex-wrap items-center gap-3">
        <StateBadge status={tool.status} size="lg" label={reported ? `${BOARD_LABELS[tool.status]} · reported` : undefined} />
        <span className="text-muted">
          <RelativeTime value={tool.since} mode="elapsed" prefix="for" />{' '}
          <span className="text-sm">(since {formatExact(new Date(tool.since))})</span>
        </span>
      </div>
      {tool.note && <p className="text-base text-ink">{tool.note}</p>}
      <dl className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
        <dt className="font-semibold text-muted">E10 state</dt>
        <dd className="text-ink">
          {E10_LABELS[tool.state]}
          {tool.reason !== 'none' && ` — ${REASON_LABELS[tool.reason]}`}
        </dd>
        {tool.restriction && (
          <>
            <dt className="font-semibold text-muted">Restriction</dt>
            <dd className="text-ink">{tool.restriction}</dd>
          </>
        )}
        {tool.expectedReturnAt && (
          <>
            <dt className="font-semibold text-muted">Expected back</dt>
            <dd className="text-ink">
              <RelativeTime value={tool.expectedReturnAt} /> ({formatExact(new Date(tool.expectedReturnAt))})
            </dd>
          </>
        )}
        {tool.setBy && (
          <>
            <dt className="font-semibold text-muted">Set by</dt>
            <dd className="text-ink">{tool.setBy.name}</dd>
          </>
        )}
        <dt className="font-semibold text-muted">Open tickets</dt>
        <dd className="text-ink">{tool.openTickets}</dd>
      </dl>
      {reported && <p className="text-sm font-medium text-muted">A user’s report set this state; staff have not confirmed it yet.</p>}
    </div>
  );
}
