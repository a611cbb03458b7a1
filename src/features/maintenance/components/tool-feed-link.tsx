import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { useCreateFeed } from '@/features/maintenance/api/calendar-feeds';

/** A secret calendar link of this tool's maintenance windows, made by and for the viewer. */
export function ToolFeedLink({ toolId }: { toolId: number }) {
  const create = useCreateFeed();
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-muted">
        Booked maintenance windows of this tool in your calendar program. Manage your links under Calendar feeds.
      </p>
      <div>
        <Button variant="secondary" busy={create.isPending} onClick={() => create.mutate({ scope: 'tool', scopeId: toolId })}>
          Make a calendar link
        </Button>
      </div>
      {create.data?.url && (
        <Alert tone="success" live title="Copy this link now; it is shown only once">
          <code className="break-all">{create.data.url}</code>
        </Alert>
      )}
      {create.isError && <Alert tone="danger">{create.error.message}</Alert>}
    </div>
  );
}
