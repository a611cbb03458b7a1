import { PRIORITY_LABELS, type Priority } from '@shared/priority';
import { STATUS_LABELS, type TicketStatus } from '@shared/ticket-workflow';
import { HAZARD_LABELS, type Hazard } from '@shared/report-options';
import { cx } from '@/lib/cx';

// Priority is told by weight and fill, never by a state colour, so a P1 ticket never reads as
// a tool that is Down. The code (P1…P4) is always printed.
const PRIORITY_LOOK: Record<Priority, string> = {
  P1: 'bg-ink text-card border-ink',
  P2: 'bg-card text-ink border-ink border-2',
  P3: 'bg-card text-ink border-control',
  P4: 'bg-sunken text-muted border-line',
};

export function PriorityBadge({ priority, long = false, className }: { priority: Priority; long?: boolean; className?: string }) {
  const [code, word] = PRIORITY_LABELS[priority].split(' · ');
  return (
    <span
      data-priority={priority}
      className={cx(
        'inline-flex h-7 shrink-0 items-center gap-1.5 rounded-md border px-2 text-xs font-bold whitespace-nowrap',
        PRIORITY_LOOK[priority],
        className,
      )}
    >
      <span className="font-mono">{code}</span>
      <span className={cx(long ? '' : 'sr-only', 'font-semibold')}>{word}</span>
    </span>
  );
}

const STATUS_MARK: Record<TicketStatus, string> = {
  reported: 'M8 2.5a5.5 5.5 0 1 0 0 11a5.5 5.5 0 0 0 0-11Z', // open ring
  acknowledged: 'M3 8.5l3 3 7-7',
  in_repair: 'M3 13l6-6m1.5-1.5L13 3m-3 0 3 3',
  waiting: 'M8 4v4l2.5 2.5M8 2.5a5.5 5.5 0 1 0 0 11a5.5 5.5 0 0 0 0-11Z',
  fixed: 'M2.5 8.5l3.5 3.5 7.5-8',
  closed: 'M3 3h10v10H3Z',
  merged: 'M4 3v4c0 2 2 3 4 3h4M10 7.5 12.5 10 10 12.5',
  no_fault_found: 'M4 4l8 8M12 4l-8 8',
};

export function TicketStatusBadge({ status, className }: { status: TicketStatus; className?: string }) {
  const done = status === 'fixed' || status === 'closed' || status === 'no_fault_found' || status === 'merged';
  return (
    <span
      data-ticket-status={status}
      className={cx(
        'inline-flex h-7 shrink-0 items-center gap-1.5 rounded-full border px-2.5 text-xs font-semibold whitespace-nowrap amber:border-2',
        done ? 'border-line bg-sunken text-muted' : 'border-accent/40 bg-accent-tint text-accent-ink',
        className,
      )}
    >
      <svg viewBox="0 0 16 16" className="size-3.5" aria-hidden="true">
        <path d={STATUS_MARK[status]} fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {STATUS_LABELS[status]}
    </span>
  );
}

export function HazardChips({ hazards, className }: { hazards: readonly Hazard[]; className?: string }) {
  if (hazards.length === 0) return null;
  return (
    <span className={cx('inline-flex flex-wrap gap-1', className)}>
      {hazards.map((h) => (
        <span
          key={h}
          className="inline-flex h-7 items-center gap-1 rounded-md border border-alert-danger-ink/40 bg-alert-danger-tint px-2 text-xs font-semibold text-alert-danger-ink amber:border-2 amber:border-black"
        >
          <svg viewBox="0 0 16 16" className="size-3.5" aria-hidden="true">
            <path d="M8 1.5 15 14H1Z" fill="currentColor" />
            <path d="M8 6v4M8 11.5v.5" stroke="var(--color-card)" strokeWidth="1.6" strokeLinecap="round" />
          </svg>
          {HAZARD_LABELS[h]}
        </span>
      ))}
    </span>
  );
}
