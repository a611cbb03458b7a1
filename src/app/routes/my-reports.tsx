import { useState } from 'react';
import { Link } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { useTickets } from '@/features/tickets/api/get-tickets';
import { TicketPager } from '@/features/tickets/components/ticket-pager';
import { TicketTable } from '@/features/tickets/components/ticket-table';

const PAGE = 20;

/** /my-reports — what I reported or added to, newest first, with where each one stands. */
export function MyReportsPage() {
  const [offset, setOffset] = useState(0);
  const list = useTickets({ reportedByMe: 'true', status: 'all', sort: 'newest', limit: PAGE, offset });
  const total = list.data?.total ?? 0;
  return (
    <>
      <title>My reports · Faultline</title>
      <PageHeader
        title="My reports"
        description="Problems you reported, or added your report to. You get an e-mail when one of them changes."
        actions={
          <Link to="/report" className={buttonClasses({ size: 'lg' })}>
            Report a fault
          </Link>
        }
      />
      {list.isPending && <PageSpinner label="Loading your reports…" />}
      {list.isError && (
        <Alert
          tone="danger"
          live
          title="Your reports could not be loaded"
          actions={<Button onClick={() => void list.refetch()}>Try again</Button>}
        >
          {list.error.message}
        </Alert>
      )}
      {list.data && list.data.items.length === 0 && (
        <Alert tone="info" title="No reports yet">
          When you report a fault, it appears here with its status.
        </Alert>
      )}
      {list.data && list.data.items.length > 0 && (
        <Card flush>
          <TicketTable items={list.data.items} caption="My reports, newest first" />
          <TicketPager offset={offset} total={total} pageSize={PAGE} onOffsetChange={setOffset} />
        </Card>
      )}
    </>
  );
}

export { MyReportsPage as Component };
