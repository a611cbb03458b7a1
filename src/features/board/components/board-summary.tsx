import { BOARD_LABELS, BOARD_LOOK, BOARD_STATUSES, type BoardStatus } from '@shared/equipment-state';
import { StateBadge } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';

export interface BoardSummaryProps {
  counts: Record<BoardStatus, number>;
  active: BoardStatus | null;
  onSelect: (status: BoardStatus | null) => void;
}

const WORST_FIRST = [...BOARD_STATUSES].sort((a, b) => BOARD_LOOK[a].rank - BOARD_LOOK[b].rank);

/** How many tools are in each state; each count is also a filter (press again to clear). */
export function BoardSummary({ counts, active, onSelect }: BoardSummaryProps) {
  return (
    <div role="group" aria-label="Show only tools in one state" className="flex flex-wrap gap-2">
      {WORST_FIRST.map((status) => {
        const pressed = active === status;
        return (
          <button
            key={status}
            type="button"
            aria-pressed={pressed}
            onClick={() => onSelect(pressed ? null : status)}
            className={cx(
              'inline-flex min-h-11 items-center gap-2 rounded-lg border bg-card px-2 text-sm amber:border-2',
              pressed ? 'border-ink ring-2 ring-ink' : 'border-line hover:bg-sunken',
            )}
          >
            <StateBadge status={status} size="sm" />
            <span className="min-w-6 text-left font-semibold tabular-nums text-ink">{counts[status]}</span>
            <span className="sr-only">{`tools ${BOARD_LABELS[status]}`}</span>
          </button>
        );
      })}
    </div>
  );
}
