import { Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import type { Session } from '@/features/auth/api/get-session';
import { useSignInLink } from '@/features/auth/api/sign-in-link';

export interface SignInLinkConfirmProps {
  token: string;
  onSuccess: (session: Session) => void;
}

/**
 * Signs in with a mailed link, on a button press: mail programs that open links to scan them
 * must not use up the link (it works once).
 */
export function SignInLinkConfirm({ token, onSuccess }: SignInLinkConfirmProps) {
  const signInWithLink = useSignInLink(token);
  const dead =
    isApiError(signInWithLink.error) &&
    (signInWithLink.error.code === 'sign_in_link_invalid' || Boolean(signInWithLink.error.fields?.token?.length));

  if (dead) {
    return (
      <div className="flex flex-col gap-5">
        <Alert tone="warning" live title="This link no longer works">
          Sign-in links work once and for 15 minutes. Ask for a fresh one, or sign in with your password.
        </Alert>
        <Link to="/sign-in-link" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
          Get a new link
        </Link>
      </div>
    );
  }

  return (
    <div className="flex flex-col gap-5">
      <p className="text-sm leading-relaxed text-muted">This link signs you in to Faultline once. Continue on this device?</p>
      {signInWithLink.isError && (
        <Alert tone="danger" live title="Not signed in">
          {isApiError(signInWithLink.error) && signInWithLink.error.isNetworkError
            ? 'Faultline cannot be reached. Check your connection and try again.'
            : signInWithLink.error.message}
        </Alert>
      )}
      <Button size="lg" busy={signInWithLink.isPending} className="w-full" onClick={() => signInWithLink.mutate(undefined, { onSuccess })}>
        {signInWithLink.isPending ? 'Signing in…' : 'Sign me in'}
      </Button>
    </div>
  );
}
