import { useRef, useState, type FormEvent, type ReactNode } from 'react';
import { z } from 'zod';
import { passwordResetRequestSchema } from '@shared/schemas/password';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmailField } from '@/components/ui/email-field';
import { isApiError } from '@/lib/api-client';
import { useRequestPasswordReset } from '@/features/auth/api/request-password-reset';

function describeFailure(error: unknown): string {
  if (!isApiError(error)) return 'The request could not be sent. Try again.';
  // The server's message says how long to wait.
  if (error.code === 'rate_limited') return error.message || 'Too many requests. Wait a while, then try again.';
  if (error.isNetworkError) return 'Faultline cannot be reached. Check your connection and try again.';
  if (error.code === 'validation_failed') return 'Check the e-mail address below.';
  return error.message;
}

export interface ForgotPasswordFormProps {
  /** Shown after sending; typically a link back to sign-in. */
  after?: ReactNode;
}

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
export function ForgotPasswordForm({ after }: ForgotPasswordFormProps) {
  const request = useRequestPasswordReset();
  const [email, setEmail] = useState('');
  const [emailErrors, setEmailErrors] = useState<string[] | undefined>();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const emailInput = useRef<HTMLInputElement>(null);

  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = passwordResetRequestSchema.safeParse({ email: email.trim() });
    if (!parsed.success) {
      setEmailErrors(z.flattenError(parsed.error).fieldErrors.email);
      emailInput.current?.focus();
      return;
    }
    setEmailErrors(undefined);
    request.mutate(parsed.data, {
      onSuccess: () => setSentTo(parsed.data.email),
      onError: (error) => {
        const fromServer = isApiError(error) ? error.fields?.email : undefined;
        if (fromServer?.length) {
          setEmailErrors(fromServer);
          emailInput.current?.focus();
        }
      },
    });
  };

  if (sentTo) {
    return (
      <div className="flex flex-col gap-5">
        <Alert tone="success" live title="Check your e-mail">
          <p>
            If <strong className="font-semibold break-all">{sentTo}</strong> belongs to an active Faultline account, a link to choose a new
            password is on its way. The link works for one hour and only once.
          </p>
        </Alert>
        <p className="text-sm leading-relaxed text-muted">
          Nothing after a few minutes? Look in the spam folder, check the address, or ask a facility administrator.
        </p>
        <Button
          variant="secondary"
          className="w-full"
          onClick={() => {
            setSentTo(null);
            request.reset();
          }}
        >
          Use another address
        </Button>
        {after}
      </div>
    );
  }

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5">
      <p className="text-sm leading-relaxed text-muted">
        Enter the e-mail address you sign in with. We will send a link to choose a new password.
      </p>

      {request.isError && (
        <Alert tone="danger" live title="No link sent">
          {describeFailure(request.error)}
        </Alert>
      )}

      <EmailField
        ref={emailInput}
        name="email"
        autoComplete="username"
        required
        value={email}
        errors={emailErrors}
        onChange={(event) => {
          setEmail(event.target.value);
          if (emailErrors) setEmailErrors(undefined);
        }}
      />

      <Button type="submit" size="lg" busy={request.isPending} className="w-full">
        {request.isPending ? 'Sending…' : 'Send the link'}
      </Button>
      {after}
    </form>
  );
}
