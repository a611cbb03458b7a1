import type { ReactNode } from 'react';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';

export interface EmailFieldProps extends Omit<TextFieldProps, 'type' | 'inputMode' | 'label'> {
  label?: ReactNode;
}

/** An e-mail address input: the address keyboard on phones, and no capitals, corrections or spell marks added to it. */
export function EmailField({ label = 'E-mail address', ...fieldProps }: EmailFieldProps) {
  return (
    <TextField label={label} type="email" inputMode="email" autoCapitalize="none" autoCorrect="off" spellCheck={false} {...fieldProps} />
  );
}
