import { useState } from 'react';
import { Link } from 'react-router';
import { Card } from '@/components/ui/card';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { useTickets } from '@/features/tickets/api/get-tickets';
import { TicketPager } from '@/features/tickets/components/ticket-pager';
import { TicketTable } from '@/features/tickets/components/ticket-table';

const PAGE = 10;

/** A tool's tickets for everyone: the open ones first, then the history, a page at a time. */
export function ToolTickets({ toolId, toolCode }: { toolId: number; toolCode?: string }) {
  const [status, setStatus] = useState<'open' | 'all'>('open');
  const [offset, setOffset] = useState(0);
  const list = useTickets({ toolId, status, sort: status === 'open' ? 'queue' : 'newest', limit: PAGE, offset });
  const total = list.data?.total ?? 0;

  return (
    <Card
      as="section"
      flush
      title="Tickets"
      description={status === 'open' ? 'Open problems on this tool, most urgent first.' : 'Every ticket on this tool, newest first.'}
      actions={
        <div role="group" aria-label="Which tickets" className="flex gap-1">
          {(['open', 'all'] as const).map((s) => (
            <Button
              key={s}
              size="md"
              variant={status === s ? 'primary' : 'secondary'}
              aria-pressed={status === s}
              onClick={() => (setStatus(s), setOffset(0))}
            >
              {s === 'open' ? 'Open' : 'All'}
            </Button>
          ))}
          {toolCode && (
            <Link
              to={`/report?tool=${encodeURIComponent(toolCode)}`}
              className="inline-flex min-h-11 items-center px-3 text-sm font-semibold"
            >
              Report a fault
            </Link>
          )}
        </div>
      }
    >
      {list.isPending && (
        <div className="p-5">
          <Spinner label="Loading tickets…" showLabel />
        </div>
      )}
      {list.isError && (
        <div className="p-5">
          <Alert tone="danger" live title="The tickets could not be loaded">
            {list.error.message}
          </Alert>
        </div>
      )}
      {list.data && list.data.items.length === 0 && (
        <p className="px-5 pb-5 text-sm text-muted">
          {status === 'open' ? 'No open tickets. Nobody has reported a problem that is still open.' : 'No tickets yet.'}
        </p>
      )}
      {list.data && list.data.items.length > 0 && (
        <>
          <TicketTable items={list.data.items} caption="Tickets on this tool" showTool={false} showTargets={status === 'open'} />
          <TicketPager offset={offset} total={total} pageSize={PAGE} onOffsetChange={setOffset} />
        </>
      )}
    </Card>
  );
}
