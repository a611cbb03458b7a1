import { useForm, type DefaultValues, type FieldValues, type Path, type Resolver, type UseFormReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { isApiError } from '@/lib/api-client';

/**
 * react-hook-form bound to the same shared zod schema the server validates with: the client
 * checks what it can before sending, and the first invalid field takes the focus.
 */
export function useZodForm<S extends z.ZodType<FieldValues, FieldValues>>(schema: S, defaultValues: DefaultValues<z.input<S>>) {
  return useForm<z.input<S>, unknown, z.output<S>>({
    resolver: zodResolver(schema as never) as unknown as Resolver<z.input<S>, unknown, z.output<S>>,
    defaultValues,
    shouldFocusError: true,
    mode: 'onSubmit',
    reValidateMode: 'onChange',
  });
}

/**
 * Puts the server's field messages on their fields and focuses the first one. Returns the
 * message to show above the form when the error is not about particular fields.
 */
export function showServerErrors<T extends FieldValues>(
  form: UseFormReturn<T, unknown, never> | UseFormReturn<T, unknown, FieldValues>,
  error: unknown,
  fieldNames: readonly string[],
): string | null {
  if (!isApiError(error)) return error instanceof Error ? error.message : 'Something went wrong.';
  const known = Object.entries(error.fields ?? {}).filter(([name]) => fieldNames.includes(name));
  known.forEach(([name, messages], i) =>
    form.setError(name as Path<T>, { type: 'server', message: messages.join(' ') }, { shouldFocus: i === 0 }),
  );
  const unknown = Object.keys(error.fields ?? {}).length > known.length;
  return known.length === 0 || unknown ? error.message : null;
}
