import { useId, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { cx } from '@/lib/cx';

export interface TextFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'children'> {
  label: ReactNode;
  /** Help shown under the label, always visible (never only in a placeholder). */
  hint?: ReactNode;
  /** Messages for this field; any message marks the field invalid. */
  errors?: readonly string[];
  /** Something to the right of the input inside the field row, e.g. a "Show" button. */
  trailing?: ReactNode;
  /** Classes for the outer wrapper. */
  className?: string;
  inputClassName?: string;
  ref?: Ref<HTMLInputElement>;
}

export function TextField({ label, hint, errors, trailing, id, className, inputClassName, required, ref, ...inputProps }: TextFieldProps) {
  const autoId = useId();
  const inputId = id ?? `field-${autoId}`;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = errors && errors.length > 0 ? `${inputId}-errors` : undefined;
  const describedBy = [hintId, errorId, inputProps['aria-describedby']].filter(Boolean).join(' ') || undefined;
  const invalid = Boolean(errorId);

  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={inputId} className="text-sm font-semibold text-ink">
        {label}
        {required && <span className="font-normal text-muted"> (required)</span>}
      </label>
      {hint && (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      )}
      <div className="flex items-stretch gap-2">
        <input
          ref={ref}
          id={inputId}
          required={required}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          className={cx(
            'min-h-11 w-full min-w-0 flex-1 rounded-lg border bg-card px-3 py-2 text-base text-ink',
            'placeholder:text-muted disabled:bg-sunken amber:border-2',
            invalid ? 'border-state-down-fill border-2 amber:border-4' : 'border-control',
            inputClassName,
          )}
          {...inputProps}
        />
        {trailing}
      </div>
      {errorId && (
        <ul id={errorId} className="flex flex-col gap-0.5 text-sm font-medium text-alert-danger-ink">
          {errors!.map((message) => (
            <li key={message} className="flex gap-1.5">
              <svg viewBox="0 0 16 16" className="mt-0.5 size-4 shrink-0" aria-hidden="true">
                <path d="M8 1.5 15 14H1Z" fill="currentColor" />
                <path d="M8 6v4M8 11.5v1" stroke="var(--color-card)" strokeWidth="1.6" strokeLinecap="round" />
              </svg>
              <span>{message}</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
