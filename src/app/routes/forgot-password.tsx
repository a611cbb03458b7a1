import { Link } from 'react-router';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { PublicPage } from '@/app/routes/public-page';

export function ForgotPasswordPage() {
  return (
    <PublicPage documentTitle="Forgot your password" heading="Forgot your password?">
      <ForgotPasswordForm
        after={
          <Link to="/sign-in" className="inline-flex min-h-11 items-center justify-center self-center font-semibold">
            Back to sign in
          </Link>
        }
      />
    </PublicPage>
  );
}

export { ForgotPasswordPage as Component };
