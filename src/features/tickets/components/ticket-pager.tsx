import { Button } from '@/components/ui/button';

export interface TicketPagerProps {
  /** Zero-based index of the first ticket shown. */
  offset: number;
  total: number;
  pageSize: number;
  onOffsetChange: (offset: number) => void;
}

/** "11–20 of 34" with Newer and Older under a newest-first ticket table; nothing when all fit on one page. */
export function TicketPager({ offset, total, pageSize, onOffsetChange }: TicketPagerProps) {
  if (total <= pageSize) return null;
  return (
    <div className="flex items-center justify-between gap-2 border-t border-line px-4 py-2 text-sm text-muted">
      <span>
        {offset + 1}–{Math.min(offset + pageSize, total)} of {total}
      </span>
      <span className="flex gap-2">
        <Button variant="secondary" disabled={offset === 0} onClick={() => onOffsetChange(Math.max(0, offset - pageSize))}>
          Newer
        </Button>
        <Button variant="secondary" disabled={offset + pageSize >= total} onClick={() => onOffsetChange(offset + pageSize)}>
          Older
        </Button>
      </span>
    </div>
  );
}
