import { useEffect, useState } from 'react';
import { CATEGORY_LABELS, FIX_KIND_LABELS, HAZARD_LABELS, IMPACT_LABELS } from '@shared/report-options';
import { PRIORITY_LABELS } from '@shared/priority';
import { STATUS_LABELS } from '@shared/ticket-workflow';
import { stateWords } from '@shared/equipment-state';
import { WAFER_RECOVERABLE_LABELS, type TicketDetail } from '@shared/schemas/tickets';
import { Button } from '@/components/ui/button';
import { formatExact } from '@/lib/time';
import { useOlderTicketEvents } from '@/features/tickets/api/get-ticket-events';
import { EventList } from '@/features/tickets/components/ticket-timeline';

// One A4 page: the browser's own header and footer lines stay out of the way of the sheet.
const PAGE_CSS = '@page { size: A4; margin: 12mm; }';

/**
 * Printing a ticket: a "Print work sheet" button (staff may add the internal notes) and the
 * sheet itself, which only paper sees. The rest of the ticket page is `print:hidden`, so
 * the browser's own Print gives the same clean sheet: the problem, photos as thumbnails
 * and the public timeline — no menu, no reply box, no staff notes unless asked for.
 */
export function TicketPrint({ ticket }: { ticket: TicketDetail }) {
  const staff = ticket.viewer.role !== 'member';
  const [withNotes, setWithNotes] = useState(false);
  const [printing, setPrinting] = useState(false);
  const firstShownId = ticket.events[0]?.id ?? 0;
  // A long ticket's earlier events load only when a sheet is asked for.
  const older = useOlderTicketEvents(ticket.id, firstShownId, printing && ticket.olderEvents > 0);
  const pages = older.data?.pages ?? [];
  const remaining = pages.length > 0 ? pages[pages.length - 1].olderEvents : ticket.olderEvents;

  useEffect(() => {
    if (!printing) return;
    if (ticket.olderEvents > 0 && !older.isError) {
      if (!older.data) return; // the first earlier page is on its way
      if (remaining > 0 && older.hasNextPage) {
        if (!older.isFetching) void older.fetchNextPage();
        return;
      }
    }
    if (older.isFetching) return;
    setPrinting(false);
    window.print();
  }, [printing, remaining, older, ticket.olderEvents]);

  const loaded = [...pages].reverse().flatMap((p) => p.events);
  const events = [...loaded, ...ticket.events].filter((e) => withNotes || !e.internal);
  const stillOlder = pages.length > 0 ? remaining : ticket.olderEvents;

  return (
    <>
      <style>{PAGE_CSS}</style>
      <div className="mb-4 flex flex-wrap items-center justify-end gap-3 print:hidden" data-testid="ticket-print-controls">
        {staff && (
          <label className="flex min-h-11 items-center gap-2 text-sm font-medium text-ink">
            <input
              type="checkbox"
              className="size-5"
              checked={withNotes}
              onChange={(e) => setWithNotes(e.target.checked)}
              data-testid="print-include-notes"
            />
            Include internal notes
          </label>
        )}
        <Button variant="secondary" busy={printing} onClick={() => setPrinting(true)}>
          Print work sheet
        </Button>
      </div>
      <TicketSheet ticket={ticket} events={events} olderNotShown={stillOlder} withNotes={withNotes} />
    </>
  );
}

function TicketSheet({
  ticket,
  events,
  olderNotShown,
  withNotes,
}: {
  ticket: TicketDetail;
  events: TicketDetail['events'];
  olderNotShown: number;
  withNotes: boolean;
}) {
  const own = ticket.toolStates.find((s) => s.moduleId === null);
  const facts: [string, string][] = [
    ['Tool', `${ticket.tool.code} · ${ticket.tool.name}${ticket.module ? ` · ${ticket.module.name}` : ''}`],
    ['Area', ticket.tool.areaName ?? '—'],
    ['Priority', PRIORITY_LABELS[ticket.priority]],
    ['Status', STATUS_LABELS[ticket.status]],
    ['Reported', `${formatExact(new Date(ticket.createdAt))} by ${ticket.reporter?.name ?? 'the tool'}`],
    ['Assigned to', ticket.assignee?.name ?? 'Nobody yet'],
    ['Category', CATEGORY_LABELS[ticket.category]],
    ['Impact', IMPACT_LABELS[ticket.impact]],
  ];
  if (own) facts.push(['Tool state when printed', stateWords(own.state)]);
  if (ticket.hazards.length) facts.push(['Hazard', ticket.hazards.map((h) => HAZARD_LABELS[h]).join(', ')]);
  if (ticket.alarmText) facts.push(['Alarm text', ticket.alarmText]);
  if (ticket.wafersCount > 0)
    facts.push([
      'Wafers inside',
      [String(ticket.wafersCount), ticket.wafersOwner, ticket.wafersRecoverable ? WAFER_RECOVERABLE_LABELS[ticket.wafersRecoverable] : null]
        .filter(Boolean)
        .join(' · '),
    ]);
  if (ticket.fixKind)
    facts.push(['Recorded as', `${FIX_KIND_LABELS[ticket.fixKind]}${ticket.failureMode ? ` · ${ticket.failureMode}` : ''}`]);
  if (ticket.partsUsed) facts.push(['Parts used', ticket.partsUsed]);

  return (
    <article className="ticket-print-sheet hidden text-[11pt] leading-snug text-black print:block" data-testid="ticket-print-sheet">
      <header className="mb-3 border-b-2 border-black pb-2">
        <p className="font-mono text-sm">Faultline work sheet · ticket #{ticket.id}</p>
        <h1 className="text-xl font-bold">{ticket.title}</h1>
      </header>
      <section aria-label="The problem" className="mb-3 break-inside-avoid">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-sm">
          {facts.map(([k, v]) => (
            <div key={k} className="contents">
              <dt className="font-semibold">{k}</dt>
              <dd className="break-words">{v}</dd>
            </div>
          ))}
        </dl>
        {ticket.description && <p className="mt-2 text-sm whitespace-pre-wrap">{ticket.description}</p>}
      </section>
      <section aria-label="Timeline" className="[&_img]:h-20">
        <h2 className="mb-1 text-base font-bold">Timeline{withNotes ? ' (with internal notes)' : ''}</h2>
        {olderNotShown > 0 && (
          <p className="mb-1 text-xs">{olderNotShown} earlier events are not on this sheet: use “Print work sheet” to include them.</p>
        )}
        <EventList events={events} modules={ticket.modules} eager />
      </section>
      <p className="mt-2 text-xs">Printed {formatExact(new Date())} from Faultline. Check the ticket for changes after this time.</p>
    </article>
  );
}
