import { useLocation, useParams, Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useTicket } from '@/features/tickets/api/get-ticket';
import { TicketView } from '@/features/tickets/components/ticket-view';

/** /tickets/:id — the ticket with its whole timeline and what the viewer may do next. */
export function TicketPage() {
  const id = Number(useParams().id);
  const location = useLocation();
  const ticket = useTicket(id);
  const just = (location.state as { justReported?: 'new' | 'add' } | null)?.justReported;

  if (!Number.isInteger(id) || id <= 0) return <Alert tone="warning" title="There is no such ticket" />;
  if (ticket.isPending) return <PageSpinner label="Loading the ticket…" />;
  if (ticket.isError) {
    const missing = isApiError(ticket.error) && ticket.error.status === 404;
    return (
      <Alert
        tone={missing ? 'warning' : 'danger'}
        live
        title={missing ? `Ticket #${id} does not exist` : 'The ticket could not be loaded'}
        actions={!missing && <Button onClick={() => void ticket.refetch()}>Try again</Button>}
      >
        {missing ? <Link to="/">Back to the start page</Link> : ticket.error.message}
      </Alert>
    );
  }
  return (
    <>
      <title>{`#${ticket.data.id} ${ticket.data.title} · Faultline`}</title>
      {just && (
        <Alert
          tone="success"
          live
          title={just === 'new' ? 'Thank you — your report is in' : 'Thank you — your report was added'}
          className="mb-6"
        >
          The technicians have been told. You will get an e-mail when something changes.
        </Alert>
      )}
      <TicketView ticket={ticket.data} />
    </>
  );
}

export { TicketPage as Component };
