import { useEffect, useRef } from 'react';
import { Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Spinner } from '@/components/ui/spinner';
import { useUnfollowByToken } from '@/features/tools/api/unfollow-by-token';

/** Runs the unfollow from an e-mail link once, then says what happened. */
export function UnfollowResult({ token }: { token: string }) {
  const unfollow = useUnfollowByToken();
  const started = useRef(false);
  const { mutate } = unfollow;
  useEffect(() => {
    // Strict mode mounts twice in development; the link must be used once.
    if (started.current) return;
    started.current = true;
    mutate(token);
  }, [mutate, token]);

  if (unfollow.isIdle || unfollow.isPending) return <Spinner label="Stopping the notifications…" showLabel />;
  if (unfollow.isError) {
    return (
      <Alert tone="warning" live title="This link did not work">
        {unfollow.error.message}
      </Alert>
    );
  }
  const tool = unfollow.data.tool;
  return (
    <Alert tone="success" live title="You no longer follow this tool">
      {tool ? (
        <>
          Faultline will not e-mail you about <strong>{tool.name}</strong> ({tool.code}) any more. To follow it again, open{' '}
          <Link to={`/tools/${encodeURIComponent(tool.code)}`}>its page</Link>.
        </>
      ) : (
        'Faultline will not e-mail you about it any more.'
      )}
    </Alert>
  );
}
