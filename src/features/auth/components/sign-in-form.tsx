import { useRef, useState, type FormEvent } from 'react';
import { z } from 'zod';
import { signInSchema, type SignInInput } from '@shared/schemas/session';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmailField } from '@/components/ui/email-field';
import { PasswordField } from '@/components/ui/password-field';
import { isApiError } from '@/lib/api-client';
import { useFieldErrors, type FieldErrors } from '@/lib/use-field-errors';
import type { Session } from '@/features/auth/api/get-session';
import { useSignIn } from '@/features/auth/api/sign-in';

type FieldName = keyof SignInInput;

export interface SignInFormProps {
  onSuccess: (session: Session) => void;
}

/** What to say for a failed sign-in; the server's message is kept where it says more (when to retry). */
function describeFailure(error: unknown): string {
  if (!isApiError(error)) return 'Signing in failed. Try again.';
  if (error.code === 'bad_credentials') return 'That e-mail address and password do not match an account. Check both and try again.';
  if (error.code === 'rate_limited') return error.message || 'Too many attempts. Wait a while, then try again.';
  if (error.isNetworkError) return 'Faultline cannot be reached. Check your connection and try again.';
  if (error.code === 'validation_failed') return 'Check the fields marked below.';
  return error.message;
}

function pickFields(fields: Record<string, string[]> | undefined): FieldErrors<FieldName> {
  if (!fields) return {};
  const picked: FieldErrors<FieldName> = {};
  if (fields.email?.length) picked.email = fields.email;
  if (fields.password?.length) picked.password = fields.password;
  return picked;
}

export function SignInForm({ onSuccess }: SignInFormProps) {
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [showPassword, setShowPassword] = useState(false);
  const { fieldErrors, setFieldErrors, clearFieldError } = useFieldErrors<FieldName>();
  const emailInput = useRef<HTMLInputElement>(null);
  const passwordInput = useRef<HTMLInputElement>(null);

  const focusFirstInvalid = (errors: FieldErrors<FieldName>) => {
    if (errors.email) emailInput.current?.focus();
    else if (errors.password) passwordInput.current?.focus();
  };

  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    // Phones' autofill often leaves a trailing space after the address.
    const parsed = signInSchema.safeParse({ email: email.trim(), password });
    if (!parsed.success) {
      const errors = z.flattenError(parsed.error).fieldErrors as FieldErrors<FieldName>;
      setFieldErrors(errors);
      focusFirstInvalid(errors);
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, {
      onSuccess,
      onError: (error) => {
        const fromServer = isApiError(error) ? pickFields(error.fields) : {};
        setFieldErrors(fromServer);
        if (isApiError(error) && error.code === 'bad_credentials') {
          setPassword('');
          passwordInput.current?.focus();
        } else {
          focusFirstInvalid(fromServer);
        }
      },
    });
  };

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5">
      {signIn.isError && (
        <Alert tone="danger" live title="Not signed in">
          {describeFailure(signIn.error)}
        </Alert>
      )}

      <EmailField
        ref={emailInput}
        name="email"
        autoComplete="username"
        required
        value={email}
        errors={fieldErrors.email}
        onChange={(event) => {
          setEmail(event.target.value);
          clearFieldError('email');
        }}
      />

      <PasswordField
        ref={passwordInput}
        label="Password"
        name="password"
        shown={showPassword}
        onShownChange={setShowPassword}
        autoComplete="current-password"
        required
        value={password}
        errors={fieldErrors.password}
        onChange={(event) => {
          setPassword(event.target.value);
          clearFieldError('password');
        }}
      />

      <Button type="submit" size="lg" busy={signIn.isPending} className="w-full">
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
