import { useParams } from 'react-router';
import { Wordmark } from '@/components/layout/wordmark';
import { UnfollowResult } from '@/features/tools/components/unfollow-result';

/** Opened from the link in a notification e-mail; no sign-in needed. */
export function UnfollowPage() {
  const { token = '' } = useParams();
  return (
    <div className="flex min-h-dvh flex-col items-center bg-page px-4 py-10 sm:justify-center">
      <title>Stop following · Faultline</title>
      <main id="main" className="flex w-full max-w-md flex-col gap-6">
        <Wordmark />
        <h1 className="text-2xl font-bold text-ink">Stop following a tool</h1>
        <UnfollowResult token={token} />
      </main>
    </div>
  );
}

export { UnfollowPage as Component };
