import { useState } from 'react';
import { E10_LABELS, REASON_LABELS, boardStatusOf, stateWords } from '@shared/equipment-state';
import type { HistoryEntry } from '@shared/schemas/facility';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';
import { Spinner } from '@/components/ui/spinner';
import { StateBadge } from '@/components/ui/state-badge';
import { formatDuration, formatExact } from '@/lib/time';
import { useToolHistory } from '@/features/tools/api/get-tool-history';

const PAGE = 15;

// Who set a state when no person is recorded.
const UNNAMED: Record<string, string> = {
  staff: 'set by staff',
  user_report: 'from a user’s report',
  alarm: 'from a tool alarm',
  schedule: 'set by the schedule',
  system: 'set automatically',
};

function Entry({ entry }: { entry: HistoryEntry }) {
  const status = boardStatusOf(entry.state);
  const lasted = entry.endedAt ? formatDuration(new Date(entry.endedAt).getTime() - new Date(entry.startedAt).getTime()) : null;
  const who = entry.setBy
    ? `by ${entry.setBy.name}${entry.source === 'user_report' ? ' (a user’s report)' : ''}`
    : (UNNAMED[entry.source] ?? 'set by staff');
  return (
    <li className="relative flex gap-3 pb-5 last:pb-0" data-testid="history-entry">
      <span aria-hidden="true" className="absolute top-8 bottom-0 left-[0.6875rem] w-0.5 bg-line" />
      <span aria-hidden="true" className="relative mt-1.5 size-6 shrink-0 rounded-full border-2 border-line bg-card" />
      <div className="min-w-0 flex-1">
        <div className="flex flex-wrap items-center gap-2">
          <StateBadge status={status} size="sm" />
          <span className="text-sm font-semibold text-ink">
            {entry.moduleName ? `${entry.moduleName}: ` : ''}
            {E10_LABELS[entry.state]}
          </span>
          {entry.previousState && <span className="text-sm text-muted">from {stateWords(entry.previousState)}</span>}
        </div>
        {(entry.note || entry.reason !== 'none') && (
          <p className="mt-1 text-sm text-ink">
            {entry.reason !== 'none' && <span className="font-medium">{REASON_LABELS[entry.reason]}. </span>}
            {entry.note}
          </p>
        )}
        {entry.restriction && <p className="mt-1 text-sm text-ink">Restriction: {entry.restriction}</p>}
        <p className="mt-1 text-xs text-muted">
          <RelativeTime value={entry.startedAt} /> · {formatExact(new Date(entry.startedAt))} · {who}
          {lasted ? ` · lasted ${lasted}` : ' · still in this state'}
          {!entry.confirmed && ' · not confirmed by staff'}
          {entry.ticketId && ` · ticket #${entry.ticketId}`}
        </p>
      </div>
    </li>
  );
}

// Changes no person made (busy ↔ idle flips, the schedule): most of a long history.
const isAutomatic = (e: HistoryEntry) => e.source === 'system' || e.source === 'schedule';

/** Folded until asked for: on a phone a long history would push everything else away. */
export function StateHistory({ toolId }: { toolId: number }) {
  const [open, setOpen] = useState(false);
  return (
    <details
      className="rounded-xl border border-line bg-card p-5 amber:border-2"
      onToggle={(e) => setOpen((e.target as HTMLDetailsElement).open)}
      data-testid="state-history"
    >
      <summary className="flex min-h-11 cursor-pointer items-center text-lg font-semibold text-ink">State history</summary>
      {open && (
        <div className="mt-3">
          <HistoryList toolId={toolId} />
        </div>
      )}
    </details>
  );
}

/** Every change of the tool and its modules, newest first, a page at a time. */
function HistoryList({ toolId }: { toolId: number }) {
  const [offset, setOffset] = useState(0);
  const [showAutomatic, setShowAutomatic] = useState(false);
  const history = useToolHistory(toolId, { limit: PAGE, offset });
  if (history.isPending) return <Spinner label="Loading the history…" showLabel />;
  if (history.isError) return <Alert tone="danger">{history.error.message}</Alert>;
  const { items, total } = history.data;
  const pages = Math.max(1, Math.ceil(total / PAGE));
  const page = Math.floor(offset / PAGE) + 1;
  const hidden = showAutomatic ? 0 : items.filter(isAutomatic).length;
  return (
    <div className="flex flex-col gap-4">
      <label className="flex min-h-11 items-center gap-3 text-sm">
        <input type="checkbox" className="size-5" checked={showAutomatic} onChange={(e) => setShowAutomatic(e.target.checked)} />
        Show automatic changes (busy and idle, the schedule)
      </label>
      <ol className="flex flex-col" aria-busy={history.isFetching || undefined}>
        {items
          .filter((entry) => showAutomatic || !isAutomatic(entry))
          .map((entry) => (
            <Entry key={entry.id} entry={entry} />
          ))}
      </ol>
      {hidden > 0 && (
        <p className="text-sm text-muted">
          {hidden === 1 ? 'One automatic change' : `${hidden} automatic changes`} on this page folded away.
        </p>
      )}
      <nav aria-label="History pages" className="flex flex-wrap items-center gap-3">
        <Button variant="secondary" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - PAGE))}>
          Newer
        </Button>
        <span className="text-sm text-muted tabular-nums">
          Page {page} of {pages} · {total} changes
        </span>
        <Button variant="secondary" disabled={offset + PAGE >= total} onClick={() => setOffset(offset + PAGE)}>
          Older
        </Button>
      </nav>
    </div>
  );
}
