import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { Wordmark } from '@/components/layout/wordmark';
import { PageSpinner } from '@/components/ui/spinner';
import { useSession } from '@/features/auth/api/get-session';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { safeNext } from '@/app/routes/sign-in-path';

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = safeNext(params.get('next'));
  const session = useSession();

  // Someone already signed in (another tab, the back button) has nothing to do here.
  if (session.data?.user) return <Navigate to={next} replace />;

  return (
    <div className="flex min-h-dvh flex-col items-center bg-page px-4 py-10 sm:justify-center sm:py-16">
      <title>Sign in · Faultline</title>
      <main id="main" className="w-full max-w-sm">
        <div className="mb-8 flex flex-col items-center gap-3 text-center">
          <Wordmark className="scale-125" />
          <p className="text-sm text-muted">Fault reports and tool status for the cleanroom</p>
        </div>
        <div className="rounded-xl border border-line bg-card p-6 shadow-sm sm:p-8 amber:border-2 amber:shadow-none">
          <h1 className="mb-6 text-xl font-bold text-ink">Sign in</h1>
          {session.isPending ? (
            <PageSpinner />
          ) : (
            <SignInForm onSuccess={() => navigate(next, { replace: true })} />
          )}
          <p className="mt-4 text-center text-sm">
            <Link to="/forgot-password" className="inline-flex min-h-11 items-center font-semibold">
              Forgot your password?
            </Link>
          </p>
        </div>
        <p className="mt-6 text-center text-xs leading-relaxed text-muted">
          No account yet? Ask a facility administrator for an invitation.
        </p>
        <p className="mt-3 text-center text-xs leading-relaxed text-muted">
          For fire, gas, a major spill or an injury, raise the facility alarm and follow the emergency procedures first.
        </p>
      </main>
    </div>
  );
}

export { SignInPage as Component };
