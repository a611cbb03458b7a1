import type { ButtonHTMLAttributes, Ref } from 'react';
import { cx } from '@/lib/cx';
import { Spinner } from '@/components/ui/spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'ghost';
export type ButtonSize = 'md' | 'lg';

const BASE =
  'inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-lg font-semibold ' +
  'no-underline transition-colors select-none disabled:cursor-not-allowed disabled:opacity-60 ' +
  'amber:border-2';

const VARIANTS: Record<ButtonVariant, string> = {
  primary: 'bg-accent text-on-accent hover:bg-accent-hover border border-transparent amber:border-black',
  secondary: 'bg-card text-ink border border-control hover:bg-sunken',
  danger: 'bg-danger text-on-danger hover:bg-danger-hover border border-transparent amber:border-black',
  ghost: 'bg-transparent text-ink border border-transparent hover:bg-sunken amber:border-transparent amber:underline',
};

// lg is for gloved hands on the report form and the board: 52 px tall.
const SIZES: Record<ButtonSize, string> = {
  md: 'px-4 py-2 text-sm',
  lg: 'min-h-13 px-6 py-3 text-base',
};

/** Button looks for other elements, e.g. a router <Link> that should look like a button. */
export function buttonClasses({
  variant = 'primary',
  size = 'md',
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}): string {
  return cx(BASE, VARIANTS[variant], SIZES[size], className);
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner, disables the button and tells assistive tech it is busy. */
  busy?: boolean;
  ref?: Ref<HTMLButtonElement>;
}

export function Button({
  variant = 'primary',
  size = 'md',
  busy = false,
  disabled,
  className,
  children,
  type = 'button',
  ref,
  ...rest
}: ButtonProps) {
  return (
    <button
      ref={ref}
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={buttonClasses({ variant, size, className })}
      {...rest}
    >
      {busy && <Spinner size="sm" decorative />}
      {children}
    </button>
  );
}
