import type { ReactNode } from 'react';
import { useFormContext, type FieldValues, type Path } from 'react-hook-form';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';
import { cx } from '@/lib/cx';

// The form kit's fields: each registers itself with the surrounding react-hook-form
// (FormProvider) and shows its own messages, client-side or from the server.

function useFieldError(name: string): string[] | undefined {
  const { formState } = useFormContext();
  const message = name.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], formState.errors) as
    { message?: string } | undefined;
  return message?.message ? [message.message] : undefined;
}

export function FormTextField<T extends FieldValues>({
  name,
  ...props
}: { name: Path<T> } & Omit<TextFieldProps, 'name' | 'errors' | 'value' | 'onChange' | 'onBlur' | 'ref'>) {
  const { register } = useFormContext<T>();
  return <TextField {...props} {...register(name)} errors={useFieldError(name)} />;
}

const CONTROL = 'min-h-11 w-full rounded-lg border bg-card px-3 py-2 text-base text-ink amber:border-2';

export function FormTextArea<T extends FieldValues>({
  name,
  label,
  hint,
  rows = 4,
  maxLength,
  required,
}: {
  name: Path<T>;
  label: ReactNode;
  hint?: ReactNode;
  rows?: number;
  maxLength?: number;
  required?: boolean;
}) {
  const { register } = useFormContext<T>();
  const errors = useFieldError(name);
  const id = `field-${name}`;
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
        {required && <span className="font-normal text-muted"> (required)</span>}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-muted">
          {hint}
        </p>
      )}
      <textarea
        id={id}
        rows={rows}
        maxLength={maxLength}
        aria-invalid={errors ? true : undefined}
        aria-describedby={[hint ? `${id}-hint` : '', errors ? `${id}-errors` : ''].join(' ').trim() || undefined}
        className={cx(CONTROL, errors ? 'border-2 border-state-down-fill' : 'border-control')}
        {...register(name)}
      />
      {errors && (
        <p id={`${id}-errors`} className="text-sm font-medium text-alert-danger-ink">
          {errors.join(' ')}
        </p>
      )}
    </div>
  );
}

export function FormRadioGroup<T extends FieldValues>({
  name,
  legend,
  choices,
}: {
  name: Path<T>;
  legend: ReactNode;
  choices: readonly { value: string; label: ReactNode; help?: ReactNode }[];
}) {
  const { register } = useFormContext<T>();
  const errors = useFieldError(name);
  return (
    <fieldset className="flex flex-col gap-2" aria-invalid={errors ? true : undefined}>
      <legend className="mb-1 text-sm font-semibold text-ink">{legend}</legend>
      {choices.map((c) => (
        <label
          key={c.value}
          className="flex min-h-11 cursor-pointer items-start gap-3 rounded-lg border border-control p-3 has-[:checked]:border-2 has-[:checked]:border-accent"
        >
          <input type="radio" value={c.value} className="mt-1 size-5" {...register(name)} />
          <span>
            <span className="block font-semibold">{c.label}</span>
            {c.help && <span className="block text-sm text-muted">{c.help}</span>}
          </span>
        </label>
      ))}
      {errors && <p className="text-sm font-medium text-alert-danger-ink">{errors.join(' ')}</p>}
    </fieldset>
  );
}
