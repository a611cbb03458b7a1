import { Link, useNavigate, useParams } from 'react-router';
import { SignInLinkConfirm } from '@/features/auth/components/sign-in-link-confirm';
import { PublicPage } from '@/app/routes/public-page';

export function UseSignInLinkPage() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  return (
    <PublicPage
      documentTitle="Sign in by e-mail"
      heading="Sign in by e-mail"
      footer={
        <p className="mt-6 text-center text-xs leading-relaxed text-muted">
          Rather use your password?{' '}
          <Link to="/sign-in" className="inline-flex min-h-11 items-center font-semibold">
            Sign in
          </Link>
        </p>
      }
    >
      <SignInLinkConfirm key={token} token={token} onSuccess={() => navigate('/', { replace: true })} />
    </PublicPage>
  );
}

export { UseSignInLinkPage as Component };
