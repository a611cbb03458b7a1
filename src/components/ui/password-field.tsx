import { Button } from '@/components/ui/button';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';

export interface PasswordFieldProps extends Omit<TextFieldProps, 'type' | 'trailing'> {
  /** Whether the characters are readable. Held by the caller so one toggle can reveal a password and its repeat. */
  shown: boolean;
  /** Draws the Show/Hide button; leave out on a field revealed by a partner's button. */
  onShownChange?: (shown: boolean) => void;
  /** What the button reveals, for its accessible name ("Show password"); "passwords" when it reveals a repeat too. */
  toggleTarget?: string;
}

/** A password input with a Show/Hide button, so a typo on a phone keyboard can be checked before sending. */
export function PasswordField({ shown, onShownChange, toggleTarget = 'password', ...fieldProps }: PasswordFieldProps) {
  return (
    <TextField
      {...fieldProps}
      type={shown ? 'text' : 'password'}
      trailing={
        onShownChange && (
          <Button
            variant="secondary"
            aria-label={`${shown ? 'Hide' : 'Show'} ${toggleTarget}`}
            onClick={() => onShownChange(!shown)}
            className="w-20"
          >
            {shown ? 'Hide' : 'Show'}
          </Button>
        )
      }
    />
  );
}
