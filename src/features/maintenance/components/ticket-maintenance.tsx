import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { useParts } from '@/features/maintenance/api/parts';
import { useToolRequal } from '@/features/maintenance/api/requalification';
import { useTicketParts, useUseTicketPart, useWorkOrderFromTicket } from '@/features/maintenance/api/ticket-parts';
import { RequalEntry } from '@/features/maintenance/components/requal-entry';

/**
 * On a repair ticket, for staff: parts used (picked from the parts list, or named when not
 * in it), the tool's requalification checks (needed before it returns to service), and a
 * work order made from the ticket for larger corrective work.
 */
export function TicketMaintenance({ ticketId, toolId }: { ticketId: number; toolId: number }) {
  const parts = useParts({ toolId });
  const used = useTicketParts(ticketId);
  const use = useUseTicketPart(ticketId);
  const requal = useToolRequal(toolId);
  const makeOrder = useWorkOrderFromTicket(ticketId);
  const [partId, setPartId] = useState('');
  const [freeText, setFreeText] = useState('');
  const [qty, setQty] = useState('1');
  const field = 'min-h-11 rounded-lg border border-control bg-card px-2 font-normal';
  return (
    <Card as="section" title="Parts, requalification and work order">
      <div className="flex flex-col gap-5 px-5 pb-5">
        <div className="flex flex-col gap-2">
          <h3 className="font-semibold text-ink">Parts used</h3>
          {used.data && used.data.length > 0 ? (
            <ul className="text-sm" data-testid="ticket-parts">
              {used.data.map((p) => (
                <li key={p.id}>
                  {p.quantity} × {p.name ? `${p.name} (${p.partNumber})` : p.freeText}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-muted">None recorded from the parts list.</p>
          )}
          <div className="flex flex-wrap items-end gap-3">
            <label className="flex flex-col gap-1 text-sm font-semibold">
              From the parts list
              <select value={partId} onChange={(e) => setPartId(e.target.value)} className={field}>
                <option value="">— a part not in the list —</option>
                {parts.data?.items.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name} ({p.partNumber}), {p.stock} in stock
                  </option>
                ))}
              </select>
            </label>
            {partId === '' && (
              <label className="flex flex-col gap-1 text-sm font-semibold">
                Or name it
                <input value={freeText} onChange={(e) => setFreeText(e.target.value)} className={field} />
              </label>
            )}
            <label className="flex flex-col gap-1 text-sm font-semibold">
              How many
              <input inputMode="numeric" value={qty} onChange={(e) => setQty(e.target.value)} className={`${field} w-20`} />
            </label>
            <Button
              variant="secondary"
              busy={use.isPending}
              onClick={() =>
                use.mutate({
                  partId: partId ? Number(partId) : null,
                  freeText: partId ? null : freeText.trim() || null,
                  quantity: Number(qty),
                })
              }
            >
              Add the part
            </Button>
          </div>
          {use.isError && <Alert tone="danger">{use.error.message}</Alert>}
        </div>
        {requal.data && requal.data.length > 0 && (
          <div className="flex flex-col gap-4">
            <p className="text-sm text-ink">
              This tool returns to Running only with a passing record for each check below, or a manager&apos;s override with a reason.
            </p>
            {requal.data.map((t) => (
              <RequalEntry key={t.template.id} template={t.template} ticketId={ticketId} />
            ))}
          </div>
        )}
        <div>
          <Button variant="secondary" busy={makeOrder.isPending} onClick={() => makeOrder.mutate()}>
            Make a work order from this ticket
          </Button>
          {makeOrder.isError && <Alert tone="danger">{makeOrder.error.message}</Alert>}
        </div>
      </div>
    </Card>
  );
}
