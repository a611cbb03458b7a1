import { Link, useParams } from 'react-router';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';
import { PublicPage } from '@/app/routes/public-page';

export function ResetPasswordPage() {
  const { token = '' } = useParams();
  return (
    <PublicPage
      documentTitle="Choose your password"
      heading="Choose your password"
      footer={
        <p className="mt-6 text-center text-xs leading-relaxed text-muted">
          Already have a password that works?{' '}
          <Link to="/sign-in" className="inline-flex min-h-11 items-center font-semibold">
            Sign in
          </Link>
        </p>
      }
    >
      {/* A new token means a new form, not the last link's leftover state. */}
      <ResetPasswordForm key={token} token={token} />
    </PublicPage>
  );
}

export { ResetPasswordPage as Component };
