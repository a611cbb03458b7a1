import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { pushSupported, usePushStatus, useSetPush, useThisBrowserSubscribed } from '@/features/push/api/push-subscription';

/**
 * "Tell this phone": the same "tool is back" and "your report was fixed" messages as the in-app
 * notices, as phone notifications (web push) in this browser. Shown only where the browser can.
 */
export function PushToggle() {
  const status = usePushStatus();
  const here = useThisBrowserSubscribed();
  const set = useSetPush();
  if (!pushSupported() || !status.data) return null;
  const on = here.data === true;
  return (
    <div className="flex flex-col gap-2">
      <Button
        variant="secondary"
        size="lg"
        busy={set.isPending || here.isLoading}
        onClick={() => set.mutate({ on: !on, publicKey: status.data.publicKey })}
      >
        {on ? 'Stop notifications on this device' : 'Notify this device too'}
      </Button>
      <p className="text-sm text-muted" aria-live="polite">
        {on
          ? 'This device shows a notification when a tool you follow is back and when your report is fixed.'
          : 'Get a phone notification when a tool you follow is back and when your report is fixed.'}
      </p>
      {set.isError && (
        <Alert tone="danger" live>
          {set.error.message}
        </Alert>
      )}
    </div>
  );
}
