import { useId, type ReactNode, type SelectHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';

export interface FieldSelectProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'children'> {
  label: ReactNode;
  errors?: readonly string[];
  children: ReactNode;
  className?: string;
}

/** A labelled native select with the same look and error display as TextField. */
export function FieldSelect({ label, errors, children, className, id, ...rest }: FieldSelectProps) {
  const auto = useId();
  const selectId = id ?? auto;
  const errorId = errors?.length ? `${selectId}-errors` : undefined;
  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={selectId} className="text-sm font-semibold text-ink">
        {label}
      </label>
      <select
        id={selectId}
        aria-invalid={errorId ? true : undefined}
        aria-describedby={errorId}
        className={cx(
          'min-h-11 rounded-lg border bg-card px-3 text-base text-ink amber:border-2',
          errorId ? 'border-2 border-state-down-fill' : 'border-control',
        )}
        {...rest}
      >
        {children}
      </select>
      {errorId && (
        <p id={errorId} className="text-sm font-medium text-alert-danger-ink">
          {errors!.join(' ')}
        </p>
      )}
    </div>
  );
}
