import type { TicketList } from '@shared/schemas/tickets';
import { Button } from '@/components/ui/button';

export interface QueuePagerProps {
  list: TicketList;
  pageSize: number;
  /** False when the page was reached from the end of a list too long to count. */
  positionKnown: boolean;
  /** Sets the page parameters of the address (null removes one). */
  navigate: (change: Record<string, string | null>) => void;
}

const count = (n: number, capped: boolean) => `${n.toLocaleString('en')}${capped ? '+' : ''}`;

/**
 * First, Previous, Next and Last under the queue. Previous and Next page from the tickets at
 * the page's edges, so a page deep in years of history costs what the first one does; the
 * position ("26–50 of 10,000+") is carried along in the address. Last asks for the last page
 * by offset when the total is known (the server reads it from the end), and as "the last 25"
 * when the list is too long to count.
 */
export function QueuePager({ list, pageSize, positionKnown, navigate }: QueuePagerProps) {
  if (!list.hasPrevious && !list.hasNext) return null;
  const { items, offset, total, totalCapped } = list;
  const first = items[0]?.id;
  const last = items[items.length - 1]?.id;
  const lastStart = Math.max(0, Math.floor((total - 1) / pageSize) * pageSize);
  const position = positionKnown
    ? `${(offset + 1).toLocaleString('en')}–${(offset + items.length).toLocaleString('en')} of ${count(total, totalCapped)}`
    : `${items.length} ${list.hasNext ? 'tickets near the end' : 'last tickets'} of ${count(total, totalCapped)}`;
  const none = { offset: null, after: null, before: null, last: null };
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-2 border-t border-line px-4 py-2 text-sm text-muted">
      <span data-testid="queue-position">{position}</span>
      <span className="flex flex-wrap gap-2">
        <Button variant="secondary" disabled={!list.hasPrevious} onClick={() => navigate(none)}>
          First
        </Button>
        <Button
          variant="secondary"
          disabled={!list.hasPrevious || first === undefined}
          onClick={() =>
            navigate({ ...none, before: String(first), offset: positionKnown ? String(Math.max(0, offset - pageSize)) : null })
          }
        >
          Previous
        </Button>
        <Button
          variant="secondary"
          disabled={!list.hasNext || last === undefined}
          onClick={() => navigate({ ...none, after: String(last), offset: positionKnown ? String(offset + items.length) : null })}
        >
          Next
        </Button>
        <Button
          variant="secondary"
          disabled={!list.hasNext}
          onClick={() => navigate(totalCapped ? { ...none, last: 'true' } : { ...none, offset: String(lastStart) })}
        >
          Last
        </Button>
      </span>
    </nav>
  );
}
