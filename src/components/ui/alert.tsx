import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

export type AlertTone = 'info' | 'warning' | 'danger' | 'success';

export interface AlertProps {
  tone?: AlertTone;
  title?: ReactNode;
  children?: ReactNode;
  /**
   * Announce the alert when it appears (role="alert"). Use for errors after an action, not
   * for cautions that are part of the page, which screen readers should meet in order.
   */
  live?: boolean;
  /** Controls at the end, e.g. a "Try again" button. */
  actions?: ReactNode;
  className?: string;
}

const TONES: Record<AlertTone, string> = {
  info: 'bg-alert-info-tint text-alert-info-ink border-alert-info-ink/30',
  warning: 'bg-alert-warning-tint text-alert-warning-ink border-alert-warning-ink/30',
  danger: 'bg-alert-danger-tint text-alert-danger-ink border-alert-danger-ink/30',
  success: 'bg-alert-success-tint text-alert-success-ink border-alert-success-ink/30',
};

// The tone is also named in words for screen readers and for the amber room, where the
// tint disappears.
const TONE_WORDS: Record<AlertTone, string> = {
  info: 'Note',
  warning: 'Caution',
  danger: 'Warning',
  success: 'Done',
};

function ToneIcon({ tone }: { tone: AlertTone }) {
  const common = { viewBox: '0 0 20 20', className: 'mt-0.5 size-5 shrink-0', 'aria-hidden': true } as const;
  switch (tone) {
    case 'danger':
      return (
        <svg {...common}>
          <path d="M6.5 1.5h7l5 5v7l-5 5h-7l-5-5v-7Z" fill="currentColor" />
          <path d="M10 5.5v5.5M10 13.8v.7" stroke="var(--color-card)" strokeWidth="2" strokeLinecap="round" />
        </svg>
      );
    case 'warning':
      return (
        <svg {...common}>
          <path d="M10 1.5 19 18H1Z" fill="currentColor" />
          <path d="M10 7v5M10 14.6v.6" stroke="var(--color-card)" strokeWidth="2" strokeLinecap="round" />
        </svg>
      );
    case 'success':
      return (
        <svg {...common}>
          <circle cx="10" cy="10" r="9" fill="currentColor" />
          <path
            d="m5.8 10.3 2.8 2.8 5.6-6"
            fill="none"
            stroke="var(--color-card)"
            strokeWidth="2"
            strokeLinecap="round"
            strokeLinejoin="round"
          />
        </svg>
      );
    default:
      return (
        <svg {...common}>
          <circle cx="10" cy="10" r="9" fill="currentColor" />
          <path d="M10 9v5.5M10 5.6v.6" stroke="var(--color-card)" strokeWidth="2" strokeLinecap="round" />
        </svg>
      );
  }
}

export function Alert({ tone = 'info', title, children, live = false, actions, className }: AlertProps) {
  return (
    <div
      role={live ? 'alert' : undefined}
      className={cx(
        'flex gap-3 rounded-lg border p-4 text-sm amber:border-2 amber:border-black',
        tone === 'danger' && 'amber:border-4',
        TONES[tone],
        className,
      )}
    >
      <ToneIcon tone={tone} />
      <div className="min-w-0 flex-1">
        <p className={cx('font-semibold', !title && 'sr-only')}>{title ?? TONE_WORDS[tone]}</p>
        {children && <div className={cx(Boolean(title) && 'mt-1', 'leading-relaxed [&_a]:text-current [&_a]:underline')}>{children}</div>}
        {actions && <div className="mt-3 flex flex-wrap gap-2">{actions}</div>}
      </div>
    </div>
  );
}
