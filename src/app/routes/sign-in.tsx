import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { PageSpinner } from '@/components/ui/spinner';
import { useSession } from '@/features/auth/api/get-session';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { PublicPage } from '@/app/routes/public-page';
import { safeNext } from '@/app/routes/sign-in-path';

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = safeNext(params.get('next'));
  const session = useSession();

  // Someone already signed in (another tab, the back button) has nothing to do here.
  if (session.data?.user) return <Navigate to={next} replace />;

  return (
    <PublicPage
      documentTitle="Sign in"
      heading="Sign in"
      footer={
        <p className="mt-6 text-center text-xs leading-relaxed text-muted">
          No account yet? Ask a facility administrator for an invitation.
        </p>
      }
    >
      {session.isPending ? <PageSpinner /> : <SignInForm onSuccess={() => navigate(next, { replace: true })} />}
      <p className="mt-4 flex flex-col items-center text-center text-sm">
        <Link to="/forgot-password" className="inline-flex min-h-11 items-center font-semibold">
          Forgot your password?
        </Link>
        <Link to="/sign-in-link" className="inline-flex min-h-11 items-center font-semibold">
          E-mail me a sign-in link
        </Link>
      </p>
    </PublicPage>
  );
}

export { SignInPage as Component };
