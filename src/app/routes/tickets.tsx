import { useLocation, useParams, Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useTicket } from '@/features/tickets/api/get-ticket';
import { TicketView } from '@/features/tickets/components/ticket-view';
import { TicketPrint } from '@/features/tickets/components/ticket-print-sheet';
import { useTicketRoom } from '@/app/realtime';
import { TicketAlarmPanel } from '@/features/alarms/components/ticket-alarm-panel';
import { hasRole } from '@shared/roles';
import { useSession } from '@/features/auth/api/get-session';
import { TicketMaintenance } from '@/features/maintenance/components/ticket-maintenance';

/** /tickets/:id — the ticket with its whole timeline and what the viewer may do next. */
export function TicketPage() {
  const id = Number(useParams().id);
  const location = useLocation();
  const ticket = useTicket(id);
  useTicketRoom(id);
  const { data: session } = useSession();
  const staff = session?.user ? hasRole(session.user.role, 'technician') : false;
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
      <TicketPrint ticket={ticket.data} />
      {/* Paper gets the work sheet above; everything else on the page stays on screen. */}
      <div className="print:hidden">
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
        <div className="mt-6">
          <TicketAlarmPanel
            ticketId={ticket.data.id}
            enabled={ticket.data.viewer.role !== 'member' && ticket.data.events.some((e) => e.kind === 'alarm_reported')}
          />
        </div>
        {staff && (
          <div className="mt-6">
            <TicketMaintenance ticketId={ticket.data.id} toolId={ticket.data.tool.id} />
          </div>
        )}
      </div>
    </>
  );
}

export { TicketPage as Component };
