import { useParams } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { useWorkOrder } from '@/features/maintenance/api/get-work-order';
import { WorkOrderSheet } from '@/features/maintenance/components/work-order-sheet';

// Printing hides the app's bars and prints the sheet alone on one A4 page.
const PRINT_CSS = `
@page { size: A4; margin: 12mm; }
@media print {
  body * { visibility: hidden; }
  .work-order-sheet, .work-order-sheet * { visibility: visible; }
  .work-order-sheet { position: absolute; left: 0; top: 0; width: 100%; padding: 0; }
}`;

/** /maintenance/work-orders/:id/print — the paper sheet. */
export function WorkOrderPrintPage() {
  const id = Number(useParams().id);
  const detail = useWorkOrder(id);
  if (detail.isPending) return <PageSpinner label="Loading the work order…" />;
  if (detail.isError) return <Alert tone="danger">{detail.error.message}</Alert>;
  return (
    <>
      <title>{`Work order #${id} (print) · Faultline`}</title>
      <style>{PRINT_CSS}</style>
      <div className="mb-4 print:hidden">
        <Button onClick={() => window.print()}>Print</Button>
      </div>
      <WorkOrderSheet detail={detail.data} />
    </>
  );
}

export const Component = WorkOrderPrintPage;
