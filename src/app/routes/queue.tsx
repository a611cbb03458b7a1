import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { QueueFilters } from '@/features/queue/components/queue-filters';
import { QueuePager } from '@/features/queue/components/queue-pager';
import { QUEUE_PAGE_SIZE, useQueueFilters } from '@/features/queue/hooks/use-queue-filters';
import { useMemo } from 'react';
import { useBoard } from '@/features/board/api/get-board';
import { useTickets } from '@/features/tickets/api/get-tickets';
import { TicketTable } from '@/features/tickets/components/ticket-table';

/** /queue — technicians' triage list, most urgent and oldest first, updating live. */
export function QueuePage() {
  const { filters, positionKnown, update, clear } = useQueueFilters();
  const list = useTickets(filters);
  const total = list.data?.total ?? 0;
  // The tools' states come from the live board (already cached and kept current by the socket),
  // so each row names its tool's state in the board's words with the E10 state beside it.
  const board = useBoard();
  const toolStates = useMemo(
    () => new Map(board.data?.areas.flatMap((a) => a.tools.map((t) => [t.id, { status: t.status, state: t.state }] as const)) ?? []),
    [board.data],
  );

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
              {total === 0
                ? 'Nothing here. No ticket matches these filters.'
                : `${total.toLocaleString('en')}${list.data.totalCapped ? '+' : ''} ticket${total === 1 ? '' : 's'}`}
            </p>
            {list.data.items.length > 0 && (
              <TicketTable items={list.data.items} caption="Queue, most urgent first" showTargets toolStates={toolStates} />
            )}
            <QueuePager list={list.data} pageSize={QUEUE_PAGE_SIZE} positionKnown={positionKnown} navigate={update} />
          </Card>
        )}
      </div>
    </>
  );
}

export { QueuePage as Component };
