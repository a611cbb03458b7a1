import { useId, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';

// Textarea and select in the look of the shared TextField, for the ticket forms.

const CONTROL = 'min-h-11 w-full rounded-lg border border-control bg-card px-3 py-2 text-base text-ink amber:border-2';

function Errors({ id, errors }: { id: string; errors?: readonly string[] }) {
  if (!errors?.length) return null;
  return (
    <ul id={id} className="text-sm font-medium text-alert-danger-ink">
      {errors.map((e) => (
        <li key={e}>{e}</li>
      ))}
    </ul>
  );
}

export function TextAreaField({
  label,
  hint,
  errors,
  className,
  ...props
}: { label: ReactNode; hint?: ReactNode; errors?: readonly string[]; className?: string } & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
        {props.required && <span className="font-normal text-muted"> (required)</span>}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-muted">
          {hint}
        </p>
      )}
      <textarea
        id={id}
        rows={3}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={[hint ? `${id}-hint` : '', errors?.length ? `${id}-err` : ''].join(' ').trim() || undefined}
        className={cx(CONTROL, Boolean(errors?.length) && 'border-2 border-state-down-fill')}
        {...props}
      />
      <Errors id={`${id}-err`} errors={errors} />
    </div>
  );
}

export function SelectField({
  label,
  hint,
  errors,
  className,
  children,
  ...props
}: {
  label: ReactNode;
  hint?: ReactNode;
  errors?: readonly string[];
  className?: string;
  children: ReactNode;
} & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = useId();
  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      {hint && <p className="text-sm text-muted">{hint}</p>}
      <select id={id} aria-invalid={errors?.length ? true : undefined} className={CONTROL} {...props}>
        {children}
      </select>
      <Errors id={`${id}-err`} errors={errors} />
    </div>
  );
}
