import { useState } from 'react';

export type FieldErrors<Name extends string> = Partial<Record<Name, string[]>>;

/** Per-field messages for a form; a field's messages go as soon as the person edits that field. */
export function useFieldErrors<Name extends string>() {
  const [fieldErrors, setFieldErrors] = useState<FieldErrors<Name>>({});
  const clearFieldError = (name: Name) => {
    if (fieldErrors[name]) setFieldErrors((errors) => ({ ...errors, [name]: undefined }));
  };
  return { fieldErrors, setFieldErrors, clearFieldError };
}
