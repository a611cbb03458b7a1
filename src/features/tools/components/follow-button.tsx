import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { useFollowTool } from '@/features/tools/api/follow-tool';

/** "Tell me when it's back": an e-mail and a notice on every state change of this tool. */
export function FollowButton({
  toolId,
  code,
  following,
  disabled,
}: {
  toolId: number;
  code: string;
  following: boolean;
  disabled?: boolean;
}) {
  const follow = useFollowTool(toolId, code);
  return (
    <div className="flex flex-col gap-2">
      <Button
        variant="secondary"
        size="lg"
        busy={follow.isPending}
        disabled={disabled}
        onClick={() => follow.mutate(!following)}
        title={
          following
            ? 'You get an e-mail and a notice when this tool changes state'
            : 'Get an e-mail and a notice when this tool changes state'
        }
      >
        <svg viewBox="0 0 20 20" className="size-5" aria-hidden="true">
          <path
            d="M10 2.5a5 5 0 0 0-5 5v3.2L3.3 14h13.4L15 10.7V7.5a5 5 0 0 0-5-5Zm-2 13a2 2 0 0 0 4 0"
            fill={following ? 'currentColor' : 'none'}
            stroke="currentColor"
            strokeWidth="1.6"
            strokeLinejoin="round"
          />
        </svg>
        {following ? 'Stop following' : 'Follow this tool'}
      </Button>
      <p className="text-sm text-muted" aria-live="polite">
        {following
          ? 'You follow this tool: you get an e-mail and a notice when its state changes.'
          : 'Follow to be told by e-mail and in Faultline when its state changes.'}
      </p>
      {follow.isError && (
        <Alert tone="danger" live>
          {follow.error.message}
        </Alert>
      )}
    </div>
  );
}
