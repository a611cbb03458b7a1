import { Button } from '@/components/ui/button';

export interface PagerProps {
  /** Zero-based index of the first row shown. */
  offset: number;
  /** Rows on this page. */
  shown: number;
  total: number;
  pageSize: number;
  onOffsetChange: (offset: number) => void;
  busy?: boolean;
}

/** "People 26–50 of 83" with previous and next; nothing to page through, no buttons. */
export function Pager({ offset, shown, total, pageSize, onOffsetChange, busy }: PagerProps) {
  const first = total === 0 ? 0 : offset + 1;
  const last = offset + shown;
  const hasPrevious = offset > 0;
  const hasNext = last < total;
  return (
    <nav aria-label="Pages of people" className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
      <p className="text-sm text-muted" aria-live="polite">
        {total === 0 ? 'No people' : `People ${first}–${last} of ${total}`}
      </p>
      {(hasPrevious || hasNext) && (
        <div className="flex gap-2">
          <Button variant="secondary" disabled={!hasPrevious || busy} onClick={() => onOffsetChange(Math.max(0, offset - pageSize))}>
            Previous
          </Button>
          <Button variant="secondary" disabled={!hasNext || busy} onClick={() => onOffsetChange(offset + pageSize)}>
            Next
          </Button>
        </div>
      )}
    </nav>
  );
}
