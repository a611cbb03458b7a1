import { useState } from 'react';
import { cx } from '@/lib/cx';
import { formatDuration, formatExact, formatRelative, toDate } from '@/lib/time';
import { useNow } from '@/lib/use-now';

export interface RelativeTimeProps {
  /** A Date, an ISO string from the API, or epoch milliseconds. */
  value: Date | string | number;
  /**
   * `relative` (default): "2 h 14 min ago" / "in 3 h".
   * `elapsed`: just the time since (or until) it, "2 h 14 min", for "down 2 h 14 min".
   */
  mode?: 'relative' | 'elapsed';
  /** Words before the time, e.g. "down" gives "down 2 h 14 min". */
  prefix?: string;
  className?: string;
}

/**
 * A relative time that keeps ticking, with the exact local time in the tooltip and shown
 * inline on tap or keyboard focus (a phone has no hover).
 */
export function RelativeTime({ value, mode = 'relative', prefix, className }: RelativeTimeProps) {
  const now = useNow();
  const [revealed, setRevealed] = useState(false);
  const date = toDate(value);

  if (Number.isNaN(date.getTime())) return <span className={className}>—</span>;

  const exact = formatExact(date);
  const text = mode === 'elapsed' ? formatDuration(now - date.getTime()) : formatRelative(date, now);
  const shown = prefix ? `${prefix} ${text}` : text;

  return (
    <time
      dateTime={date.toISOString()}
      title={exact}
      tabIndex={0}
      aria-label={`${shown} (${exact})`}
      // A tap focuses the element too; both only reveal, so the tap never cancels itself out.
      onClick={() => setRevealed(true)}
      onFocus={() => setRevealed(true)}
      onBlur={() => setRevealed(false)}
      onKeyDown={(event) => {
        if (event.key === 'Escape') setRevealed(false);
      }}
      className={cx('cursor-help tabular-nums underline decoration-dotted decoration-1 underline-offset-4', className)}
    >
      {shown}
      {revealed && <span className="text-muted"> · {exact}</span>}
    </time>
  );
}
