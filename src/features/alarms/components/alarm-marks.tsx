import { cx } from '@/lib/cx';

// Small marks beside an alarm: a shape and a word each, never colour alone.

export function ChatteringMark({ className }: { className?: string }) {
  return (
    <span
      data-testid="chattering-mark"
      className={cx(
        'inline-flex items-center gap-1 rounded border border-alert-warning-ink/40 bg-alert-warning-tint px-1.5 py-0.5 text-xs font-semibold text-alert-warning-ink',
        className,
      )}
    >
      <svg aria-hidden="true" viewBox="0 0 16 10" className="h-2.5 w-4">
        <path d="M0 5 L3 1 L6 9 L9 1 L12 9 L16 5" fill="none" stroke="currentColor" strokeWidth="1.8" />
      </svg>
      Chattering
    </span>
  );
}

export function StaleMark() {
  return (
    <span
      data-testid="stale-mark"
      className="inline-flex items-center gap-1 rounded border border-line bg-sunken px-1.5 py-0.5 text-xs font-semibold text-ink"
    >
      <svg aria-hidden="true" viewBox="0 0 10 10" className="h-2.5 w-2.5">
        <circle cx="5" cy="5" r="4" fill="none" stroke="currentColor" strokeWidth="1.6" />
        <path d="M5 2.5 V5 L7 6" fill="none" stroke="currentColor" strokeWidth="1.4" />
      </svg>
      Stale (set over 24 h)
    </span>
  );
}

export function SafetyMark() {
  return (
    <span className="inline-flex items-center gap-1 rounded border border-alert-danger-ink/40 bg-alert-danger-tint px-1.5 py-0.5 text-xs font-semibold text-alert-danger-ink">
      <svg aria-hidden="true" viewBox="0 0 10 10" className="h-2.5 w-2.5">
        <path d="M5 0.5 L9.5 9.5 H0.5 Z" fill="none" stroke="currentColor" strokeWidth="1.4" />
      </svg>
      Safety
    </span>
  );
}
