import { useId, type ReactNode, type SelectHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';

// The UI kit has a text field only; these match its look for the few other controls here.

export interface SelectFieldProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'children'> {
  label: ReactNode;
  hint?: ReactNode;
  options: readonly { value: string; label: string }[];
  className?: string;
}

export function SelectField({ label, hint, options, id, className, ...selectProps }: SelectFieldProps) {
  const autoId = useId();
  const selectId = id ?? `select-${autoId}`;
  const hintId = hint ? `${selectId}-hint` : undefined;
  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={selectId} className="text-sm font-semibold text-ink">
        {label}
      </label>
      {hint && (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      )}
      <select
        id={selectId}
        aria-describedby={hintId}
        className="min-h-11 w-full rounded-lg border border-control bg-card px-3 py-2 text-base text-ink disabled:bg-sunken disabled:text-muted amber:border-2"
        {...selectProps}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export interface CheckboxFieldProps {
  label: ReactNode;
  hint?: ReactNode;
  checked: boolean;
  onChange: (checked: boolean) => void;
  name?: string;
  disabled?: boolean;
  className?: string;
}

/** A checkbox whose whole row (at least 44 px tall) is the tap target. */
export function CheckboxField({ label, hint, checked, onChange, name, disabled, className }: CheckboxFieldProps) {
  const autoId = useId();
  const inputId = `check-${autoId}`;
  const hintId = hint ? `${inputId}-hint` : undefined;
  return (
    <div className={cx('flex flex-col gap-1', className)}>
      <label htmlFor={inputId} className="flex min-h-11 cursor-pointer items-center gap-3 text-sm font-semibold text-ink">
        <input
          id={inputId}
          type="checkbox"
          name={name}
          checked={checked}
          disabled={disabled}
          aria-describedby={hintId}
          onChange={(event) => onChange(event.target.checked)}
          className="size-5 shrink-0 accent-[var(--color-accent)]"
        />
        {label}
      </label>
      {hint && (
        <p id={hintId} className="-mt-1 pl-8 text-sm text-muted">
          {hint}
        </p>
      )}
    </div>
  );
}
