import { useId } from 'react';
import { STATUS_LABELS, TICKET_STATUSES } from '@shared/ticket-workflow';
import type { TicketListQuery } from '@shared/schemas/tickets';
import { Button } from '@/components/ui/button';
import { cx } from '@/lib/cx';
import { QUEUE_TOGGLES, TOGGLE_LABELS } from '@/features/queue/hooks/use-queue-filters';
import { useFilterOptions } from '@/features/queue/api/get-filter-options';

const SELECT =
  'min-h-11 w-full min-w-0 rounded-lg border border-control bg-card px-3 py-2 text-sm text-ink sm:w-auto sm:max-w-xs amber:border-2';

function Select({
  label,
  value,
  onChange,
  children,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  children: React.ReactNode;
}) {
  const id = useId();
  return (
    <div className="flex w-full min-w-0 flex-col gap-1 sm:w-auto">
      <label htmlFor={id} className="text-xs font-semibold text-muted">
        {label}
      </label>
      <select id={id} className={SELECT} value={value} onChange={(e) => onChange(e.target.value)}>
        {children}
      </select>
    </div>
  );
}

export function QueueFilters({
  filters,
  update,
  clear,
}: {
  filters: TicketListQuery;
  update: (change: Record<string, string | null>) => void;
  clear: () => void;
}) {
  const options = useFilterOptions();
  const area = options.data?.areas.find((a) => a.id === filters.areaId);
  const tools = (area ? [area] : (options.data?.areas ?? [])).flatMap((a) => a.tools);
  const active = QUEUE_TOGGLES.some((t) => filters[t]) || filters.toolId || filters.areaId || filters.status !== 'open';

  return (
    <div className="flex flex-col gap-3" role="search" aria-label="Filter the queue">
      <div className="flex flex-wrap gap-2" role="group" aria-label="Show only">
        {QUEUE_TOGGLES.map((t) => {
          const on = Boolean(filters[t]);
          return (
            <button
              key={t}
              type="button"
              aria-pressed={on}
              onClick={() => update({ [t]: on ? null : 'true' })}
              className={cx(
                'inline-flex min-h-11 items-center gap-2 rounded-full border px-4 text-sm font-semibold amber:border-2',
                on ? 'border-accent bg-accent text-on-accent' : 'border-control bg-card text-ink hover:bg-sunken',
              )}
            >
              <svg viewBox="0 0 16 16" className="size-4" aria-hidden="true">
                {on ? (
                  <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
                ) : (
                  <circle cx="8" cy="8" r="5" fill="none" stroke="currentColor" strokeWidth="1.5" />
                )}
              </svg>
              {TOGGLE_LABELS[t]}
            </button>
          );
        })}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <Select label="Status" value={filters.status ?? 'open'} onChange={(v) => update({ status: v === 'open' ? null : v })}>
          <option value="open">Open (not yet fixed)</option>
          {TICKET_STATUSES.map((s) => (
            <option key={s} value={s}>
              {STATUS_LABELS[s]}
            </option>
          ))}
          <option value="resolved">Fixed, closed or no fault</option>
          <option value="all">Every ticket</option>
        </Select>
        <Select label="Area" value={String(filters.areaId ?? '')} onChange={(v) => update({ areaId: v || null, toolId: null })}>
          <option value="">All areas</option>
          {options.data?.areas.map((a) => (
            <option key={a.id} value={a.id}>
              {a.name}
            </option>
          ))}
        </Select>
        <Select label="Tool" value={String(filters.toolId ?? '')} onChange={(v) => update({ toolId: v || null })}>
          <option value="">All tools</option>
          {tools.map((t) => (
            <option key={t.id} value={t.id}>
              {t.code} · {t.name}
            </option>
          ))}
        </Select>
        {active && (
          <Button variant="ghost" onClick={clear}>
            Clear filters
          </Button>
        )}
      </div>
    </div>
  );
}
