import { Link } from 'react-router';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { PublicPage } from '@/app/routes/public-page';

export function RequestSignInLinkPage() {
  return (
    <PublicPage documentTitle="Sign in by e-mail" heading="Sign in by e-mail">
      <ForgotPasswordForm
        kind="sign-in"
        after={
          <Link to="/sign-in" className="inline-flex min-h-11 items-center justify-center self-center font-semibold">
            Back to sign in
          </Link>
        }
      />
    </PublicPage>
  );
}

export { RequestSignInLinkPage as Component };
