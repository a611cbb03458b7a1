import { E10_LABELS, REASON_LABELS, boardStatusOf, type BoardStatus, type E10State, type StateReason } from '@shared/equipment-state';
import { StateBadge, type StateBadgeSize } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';

export interface StateNameProps {
  /** The E10 state as stored. */
  state: E10State;
  /** The board word to lead with; by default the one the state maps to (a roll-up may differ). */
  status?: BoardStatus;
  reason?: StateReason | null;
  size?: StateBadgeSize;
  /** Replaces the badge's word (keep the board word in it), e.g. "Down · reported". */
  label?: string;
  className?: string;
}

/**
 * A state in the one vocabulary of Faultline: the board's badge (colour, shape, word) first and
 * the SEMI E10 state beside it, then the reason. Used wherever a state is shown.
 */
export function StateName({ state, status, reason, size = 'sm', label, className }: StateNameProps) {
  return (
    <span className={cx('inline-flex flex-wrap items-center gap-1.5', className)} data-testid="state-name">
      <StateBadge status={status ?? boardStatusOf(state)} size={size} label={label} />
      <span className="text-sm text-muted" data-testid="state-e10">
        {E10_LABELS[state]}
        {reason && reason !== 'none' ? ` · ${REASON_LABELS[reason]}` : ''}
      </span>
    </span>
  );
}
