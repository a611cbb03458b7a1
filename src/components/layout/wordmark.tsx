import { cx } from '@/lib/cx';

/**
 * Faultline's mark: two blocks displaced along a slanted break, like strata across a fault.
 * Drawn here so it needs no image request and follows the amber-room colours.
 */
export function FaultlineGlyph({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 24 24" className={cx('shrink-0', className)} aria-hidden="true" focusable="false">
      <path d="M2 7h9.2L7.2 22H2Z" fill="var(--color-ink)" />
      <path d="M13.4 2H22v15H9.4Z" fill="var(--color-accent)" />
    </svg>
  );
}

export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={cx('inline-flex items-center gap-2 text-ink', className)}>
      <FaultlineGlyph className="size-6" />
      <span className="text-lg font-bold tracking-tight">Faultline</span>
    </span>
  );
}
