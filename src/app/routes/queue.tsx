import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { QueueFilters } from '@/features/queue/components/queue-filters';
import { QUEUE_PAGE_SIZE, useQueueFilters } from '@/features/queue/hooks/use-queue-filters';
import { useTickets } from '@/features/tickets/api/get-tickets';
import { TicketTable } from '@/features/tickets/components/ticket-table';

/** /queue — technicians' triage list, most urgent and oldest first, updating live. */
export function QueuePage() {
  const { filters, update, clear } = useQueueFilters();
  const list = useTickets(filters);
  const offset = filters.offset ?? 0;
  const total = list.data?.total ?? 0;

  return (
    <>
      <title>Queue · Faultline</title>
      <PageHeader
        title="Queue"
        description="Open tickets by priority, then by age. Timers turn to a warning before a service target is missed."
      />
      <div className="flex flex-col gap-4">
        <QueueFilters filters={filters} update={update} clear={clear} />
        {list.isPending && <PageSpinner label="Loading the queue…" />}
        {list.isError && (
          <Alert
            tone="danger"
            live
            title="The queue could not be loaded"
            actions={<Button onClick={() => void list.refetch()}>Try again</Button>}
          >
            {list.error.message}
          </Alert>
        )}
        {list.data && (
          <Card flush>
            <p className="px-4 pt-3 text-sm text-muted" aria-live="polite" data-testid="queue-count">
              {total === 0 ? 'Nothing here. No ticket matches these filters.' : `${total} ticket${total === 1 ? '' : 's'}`}
            </p>
            {list.data.items.length > 0 && <TicketTable items={list.data.items} caption="Queue, most urgent first" showTargets />}
            {total > QUEUE_PAGE_SIZE && (
              <nav aria-label="Pages" className="flex items-center justify-between gap-2 border-t border-line px-4 py-2 text-sm text-muted">
                <span>
                  {offset + 1}–{Math.min(offset + QUEUE_PAGE_SIZE, total)} of {total}
                </span>
                <span className="flex gap-2">
                  <Button
                    variant="secondary"
                    disabled={offset === 0}
                    onClick={() => update({ offset: String(Math.max(0, offset - QUEUE_PAGE_SIZE)) })}
                  >
                    Previous
                  </Button>
                  <Button
                    variant="secondary"
                    disabled={offset + QUEUE_PAGE_SIZE >= total}
                    onClick={() => update({ offset: String(offset + QUEUE_PAGE_SIZE) })}
                  >
                    Next
                  </Button>
                </span>
              </nav>
            )}
          </Card>
        )}
      </div>
    </>
  );
}

export { QueuePage as Component };
