import { cx } from '@/lib/cx';

export interface SpinnerProps {
  /** Read by screen readers; shown beside the spinner when `showLabel` is set. */
  label?: string;
  showLabel?: boolean;
  size?: 'sm' | 'md' | 'lg';
  /** Hide from assistive tech when the surrounding control already says it is busy. */
  decorative?: boolean;
  className?: string;
}

const SIZES = { sm: 'size-4', md: 'size-6', lg: 'size-10' } as const;

export function Spinner({ label = 'Loading…', showLabel = false, size = 'md', decorative = false, className }: SpinnerProps) {
  return (
    <span
      role={decorative ? undefined : 'status'}
      aria-hidden={decorative || undefined}
      className={cx('inline-flex items-center gap-2', decorative ? 'text-current' : 'text-muted', className)}
    >
      <svg className={cx(SIZES[size], 'animate-spin')} viewBox="0 0 24 24" aria-hidden="true">
        <circle cx="12" cy="12" r="9" fill="none" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
        <path d="M21 12a9 9 0 0 0-9-9" fill="none" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
      </svg>
      {!decorative && <span className={showLabel ? 'text-sm' : 'sr-only'}>{label}</span>}
    </span>
  );
}

/** A spinner centred in the page area, for whole-page loads. */
export function PageSpinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-[40vh] items-center justify-center p-8">
      <Spinner size="lg" label={label} showLabel />
    </div>
  );
}
