import { useState } from 'react';
import { Navigate, Outlet, redirect, useLocation, type LoaderFunctionArgs } from 'react-router';
import { AppLayout } from '@/components/layout/app-layout';
import { PageSpinner } from '@/components/ui/spinner';
import { queryClient } from '@/lib/query-client';
import { reportSessionMayHaveEnded } from '@/lib/api-client';
import { useRealtimeStatus } from '@/lib/socket';
import { useRealtime } from '@/app/realtime';
import { sessionQueryOptions, useSession, type SessionUser } from '@/features/auth/api/get-session';
import { useSignOut } from '@/features/auth/api/sign-out';
import { signInPathFor } from '@/app/routes/sign-in-path';

/** Before any signed-in page loads: know who is there, or go to sign-in first. */
export async function protectedLoader({ request }: LoaderFunctionArgs) {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (!session.user) throw redirect(signInPathFor(new URL(request.url)));
  return null;
}

/**
 * The signed-in shell. It also watches the session after the first load: a 401 anywhere
 * invalidates the session query, and when that comes back without a user this sends the
 * person to sign-in, with a way back to where they were.
 */
export function ProtectedLayout() {
  const session = useSession();
  const location = useLocation();
  const [signingOut, setSigningOut] = useState(false);
  const [signOutError, setSignOutError] = useState<string | null>(null);
  const signOut = useSignOut();

  const user = session.data?.user;
  if (!user) {
    if (session.isError) throw session.error;
    if (session.isPending) return <PageSpinner />;
    // After "Sign out" there is no page to come back to.
    return <Navigate to={signingOut ? '/sign-in' : signInPathFor(location)} replace />;
  }

  const onSignOut = () => {
    setSigningOut(true);
    setSignOutError(null);
    signOut.mutate(undefined, {
      onError: () => {
        setSigningOut(false);
        setSignOutError('Signing out failed: Faultline could not be reached. Try again, or close the browser to end the visit.');
      },
    });
  };

  return <SignedInShell user={user} onSignOut={onSignOut} signingOut={signingOut} signOutError={signOutError} />;
}

interface SignedInShellProps {
  user: SessionUser;
  onSignOut: () => void;
  signingOut: boolean;
  signOutError: string | null;
}

// Split out so the socket exists only while someone is signed in.
function SignedInShell({ user, onSignOut, signingOut, signOutError }: SignedInShellProps) {
  // Cut off by the server or refused: ask the API who we are; if nobody, the router goes to sign-in.
  useRealtime({ onRefused: reportSessionMayHaveEnded });
  const realtime = useRealtimeStatus();
  return (
    <AppLayout user={user} onSignOut={onSignOut} signingOut={signingOut} signOutError={signOutError} realtime={realtime}>
      <Outlet />
    </AppLayout>
  );
}
