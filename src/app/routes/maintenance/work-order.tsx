import { Link, useParams } from 'react-router';
import { hasRole } from '@shared/roles';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { PageSpinner } from '@/components/ui/spinner';
import { useSession } from '@/features/auth/api/get-session';
import { useWorkOrder } from '@/features/maintenance/api/get-work-order';
import { WorkOrderView } from '@/features/maintenance/components/work-order-view';

/** /maintenance/work-orders/:id — a technician works the order here. */
export function WorkOrderPage() {
  const id = Number(useParams().id);
  const detail = useWorkOrder(id);
  const { data: session } = useSession();
  if (detail.isPending) return <PageSpinner label="Loading the work order…" />;
  if (detail.isError)
    return (
      <Alert tone="danger" title="The work order could not be loaded">
        {detail.error.message}
      </Alert>
    );
  const d = detail.data;
  return (
    <>
      <title>{`Work order #${d.workOrder.id} · Faultline`}</title>
      <PageHeader
        title={d.workOrder.title}
        description={
          <>
            Work order #{d.workOrder.id} on <Link to={`/tools/${encodeURIComponent(d.tool.code)}`}>{d.tool.name}</Link>
            {d.workOrder.ticketId && (
              <>
                {' '}
                · from <Link to={`/tickets/${d.workOrder.ticketId}`}>ticket #{d.workOrder.ticketId}</Link>
              </>
            )}
          </>
        }
      />
      <WorkOrderView detail={d} canOverride={session?.user ? hasRole(session.user.role, 'manager') : false} />
    </>
  );
}

export const Component = WorkOrderPage;
