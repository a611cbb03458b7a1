import { targetStatus, type TargetStatus } from '@shared/priority';
import type { TargetClock as Clock } from '@shared/schemas/tickets';
import { formatDuration, formatExact } from '@/lib/time';
import { useNow } from '@/lib/use-now';
import { cx } from '@/lib/cx';

const LOOK: Record<TargetStatus, string> = {
  ok: 'text-muted',
  warning: 'text-alert-warning-ink bg-alert-warning-tint border-alert-warning-ink/30',
  missed: 'text-alert-danger-ink bg-alert-danger-tint border-alert-danger-ink/30',
};

function Mark({ status }: { status: TargetStatus }) {
  if (status === 'missed') {
    return (
      <svg viewBox="0 0 16 16" className="size-3.5 shrink-0" aria-hidden="true">
        <path d="M5.2 1.5h5.6l3.7 3.7v5.6l-3.7 3.7H5.2l-3.7-3.7V5.2Z" fill="currentColor" />
        <path d="M8 4.5v4.2M8 10.8v.6" stroke="var(--color-card)" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
    );
  }
  if (status === 'warning') {
    return (
      <svg viewBox="0 0 16 16" className="size-3.5 shrink-0" aria-hidden="true">
        <path d="M8 1.5 15 14H1Z" fill="currentColor" />
        <path d="M8 6v4M8 11.5v.5" stroke="var(--color-card)" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
    );
  }
  return (
    <svg viewBox="0 0 16 16" className="size-3.5 shrink-0" aria-hidden="true">
      <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <path d="M8 4.5V8l2.5 1.5" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
    </svg>
  );
}

/**
 * One service-target timer: time left while it runs, live; "met" or "missed by" once it
 * stopped. The status is recomputed here every tick with the shared rule, so a queue left
 * open turns to a warning without a refetch.
 */
export function TargetClock({
  label,
  clock,
  createdAt,
  compact = false,
}: {
  label: string;
  clock: Clock;
  createdAt: string;
  compact?: boolean;
}) {
  const now = useNow();
  const start = new Date(createdAt).getTime();
  const due = new Date(clock.dueAt).getTime();
  const done = clock.doneAt ? new Date(clock.doneAt).getTime() : null;
  const end = done ?? now;
  const status = targetStatus(Math.max(0, (end - start) / 60_000), clock.targetMinutes);
  let text: string;
  if (done !== null) text = done <= due ? 'met' : `missed by ${formatDuration(done - due)}`;
  else if (now <= due) text = `${formatDuration(due - now)} left`;
  else text = `overdue ${formatDuration(now - due)}`;
  const stopped = done !== null;
  return (
    <span
      data-target-status={stopped ? `${status}-stopped` : status}
      title={`${label} target ${formatDuration(clock.targetMinutes * 60_000)}, due ${formatExact(new Date(due))}`}
      className={cx(
        'inline-flex items-center gap-1 rounded-md border border-transparent px-1.5 py-0.5 text-xs font-medium whitespace-nowrap tabular-nums',
        stopped && status === 'ok' ? 'text-muted' : LOOK[status],
        // A stopped clock reads by its muted colour and its words, never by fading (contrast).
        status !== 'ok' && 'amber:border-2 amber:border-black amber:font-bold',
      )}
    >
      <Mark status={stopped && status !== 'missed' ? 'ok' : status} />
      <span>
        {compact ? '' : `${label}: `}
        {text}
        {!stopped && status === 'warning' && <span className="sr-only"> (due soon)</span>}
      </span>
    </span>
  );
}
