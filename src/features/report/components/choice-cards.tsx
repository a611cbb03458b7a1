import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

// Big tap targets for the report form: whole cards are the control, so a gloved finger
// never has to hit a 16-pixel radio button.

const CARD =
  'flex min-h-13 cursor-pointer items-start gap-3 rounded-xl border bg-card p-3 text-left amber:border-2 ' +
  'has-[:checked]:border-2 has-[:checked]:border-accent has-[:checked]:bg-accent-tint amber:has-[:checked]:border-4 amber:has-[:checked]:border-black ' +
  'has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-focus';

export interface Choice<T extends string> {
  value: T;
  label: ReactNode;
  help?: ReactNode;
}

export function RadioCards<T extends string>({
  name,
  legend,
  hint,
  choices,
  value,
  onChange,
  errors,
  columns = 1,
}: {
  name: string;
  legend: ReactNode;
  hint?: ReactNode;
  choices: Choice<T>[];
  value: T | '' | null;
  onChange: (v: T) => void;
  errors?: string[];
  columns?: 1 | 2;
}) {
  return (
    <fieldset className="flex flex-col gap-2" aria-invalid={errors?.length ? true : undefined}>
      <legend className="mb-1 text-base font-semibold text-ink">{legend}</legend>
      {hint && <p className="-mt-1 mb-1 text-sm text-muted">{hint}</p>}
      <div className={cx('grid gap-2', columns === 2 && 'sm:grid-cols-2')}>
        {choices.map((c) => (
          <label key={c.value} className={cx(CARD, 'border-control')}>
            <input
              type="radio"
              name={name}
              value={c.value}
              checked={value === c.value}
              onChange={() => onChange(c.value)}
              className="mt-0.5 size-6 shrink-0 accent-[var(--color-accent)]"
            />
            <span className="min-w-0">
              <span className="block font-semibold text-ink">{c.label}</span>
              {c.help && <span className="block text-sm text-muted">{c.help}</span>}
            </span>
          </label>
        ))}
      </div>
      {errors?.map((e) => (
        <p key={e} className="text-sm font-medium text-alert-danger-ink">
          {e}
        </p>
      ))}
    </fieldset>
  );
}

export function CheckCards<T extends string>({
  legend,
  hint,
  choices,
  values,
  onChange,
  tone = 'normal',
}: {
  legend: ReactNode;
  hint?: ReactNode;
  choices: Choice<T>[];
  values: T[];
  onChange: (v: T[]) => void;
  tone?: 'normal' | 'danger';
}) {
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 text-base font-semibold text-ink">{legend}</legend>
      {hint && <p className="-mt-1 mb-1 text-sm text-muted">{hint}</p>}
      <div className="grid gap-2 sm:grid-cols-2">
        {choices.map((c) => {
          const on = values.includes(c.value);
          return (
            <label
              key={c.value}
              className={cx(
                CARD,
                'border-control',
                tone === 'danger' && on && 'has-[:checked]:border-alert-danger-ink has-[:checked]:bg-alert-danger-tint',
              )}
            >
              <input
                type="checkbox"
                checked={on}
                onChange={() => onChange(on ? values.filter((v) => v !== c.value) : [...values, c.value])}
                className="mt-0.5 size-6 shrink-0 accent-[var(--color-accent)]"
              />
              <span className="font-semibold text-ink">{c.label}</span>
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}
