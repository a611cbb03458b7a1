import { useRef, useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { z } from 'zod';
import { newPasswordSchema, passwordResetParams, PASSWORD_MIN, PASSWORD_RECOMMENDED } from '@shared/schemas/password';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { PasswordField } from '@/components/ui/password-field';
import { isApiError } from '@/lib/api-client';
import { useFieldErrors, type FieldErrors } from '@/lib/use-field-errors';
import { useResetPassword } from '@/features/auth/api/reset-password';

type FieldName = 'password' | 'repeat';

/** A link that is malformed, expired or already used; a new one is the only way on. */
function isDeadLink(error: unknown): boolean {
  return isApiError(error) && (error.code === 'reset_link_invalid' || Boolean(error.fields?.token?.length));
}

function describeFailure(error: unknown): string {
  if (!isApiError(error)) return 'The password could not be saved. Try again.';
  if (error.isNetworkError) return 'Faultline cannot be reached. Check your connection and try again.';
  if (error.code === 'rate_limited') return error.message || 'Too many attempts. Wait a while, then try again.';
  if (error.fields?.password?.length) return 'Check the password below.';
  return error.message;
}

function DeadLink() {
  return (
    <div className="flex flex-col gap-5">
      <Alert tone="warning" live title="This link no longer works">
        Links to choose a password work only once and only for a while (one hour after asking for a new password, seven days after an
        invitation). Ask for a fresh link; it works for invitations too.
      </Alert>
      <Link to="/forgot-password" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
        Get a new link
      </Link>
    </div>
  );
}

/**
 * Sets a password from an e-mailed link. The same link shape serves invitations (the first
 * password) and resets (a replacement), so the wording fits both.
 */
export function ResetPasswordForm({ token }: { token: string }) {
  const reset = useResetPassword();
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [show, setShow] = useState(false);
  const { fieldErrors, setFieldErrors, clearFieldError } = useFieldErrors<FieldName>();
  const passwordInput = useRef<HTMLInputElement>(null);
  const repeatInput = useRef<HTMLInputElement>(null);

  // A link mangled by a mail program can be told at once, without a round trip.
  if (!passwordResetParams.safeParse({ token }).success || isDeadLink(reset.error)) return <DeadLink />;

  if (reset.isSuccess) {
    return (
      <div className="flex flex-col gap-5">
        <Alert tone="success" live title="Your password is set">
          Sign in with your e-mail address and the new password. Any other place where this account was signed in has been signed out.
        </Alert>
        <Link to="/sign-in" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
          Go to sign in
        </Link>
      </div>
    );
  }

  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const errors: FieldErrors<FieldName> = {};
    const parsed = newPasswordSchema.safeParse(password);
    if (!parsed.success) errors.password = z.flattenError(parsed.error).formErrors;
    else if (repeat !== password) errors.repeat = ['The two entries differ. Type the same password twice.'];
    setFieldErrors(errors);
    if (errors.password) return passwordInput.current?.focus();
    if (errors.repeat) return repeatInput.current?.focus();

    reset.mutate(
      { token, password },
      {
        onError: (error) => {
          const fromServer = isApiError(error) ? error.fields?.password : undefined;
          if (fromServer?.length) {
            setFieldErrors({ password: fromServer });
            passwordInput.current?.focus();
          }
        },
      },
    );
  };

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5">
      <p className="text-sm leading-relaxed text-muted">
        Choose the password you will sign in with. If you were invited, this finishes setting up your account; if you asked for a reset, it
        replaces your old password.
      </p>

      {reset.isError && (
        <Alert tone="danger" live title="Password not saved">
          {describeFailure(reset.error)}
        </Alert>
      )}

      <PasswordField
        ref={passwordInput}
        label="New password"
        name="password"
        shown={show}
        onShownChange={setShow}
        toggleTarget="passwords"
        autoComplete="new-password"
        required
        hint={`At least ${PASSWORD_MIN} characters, ${PASSWORD_RECOMMENDED} or more is better. A few unrelated words are strong and easy to remember.`}
        value={password}
        errors={fieldErrors.password}
        onChange={(event) => {
          setPassword(event.target.value);
          clearFieldError('password');
        }}
      />

      <PasswordField
        ref={repeatInput}
        label="Repeat the password"
        name="repeat"
        shown={show}
        autoComplete="new-password"
        required
        value={repeat}
        errors={fieldErrors.repeat}
        onChange={(event) => {
          setRepeat(event.target.value);
          clearFieldError('repeat');
        }}
      />

      <Button type="submit" size="lg" busy={reset.isPending} className="w-full">
        {reset.isPending ? 'Saving…' : 'Save the password'}
      </Button>
    </form>
  );
}
