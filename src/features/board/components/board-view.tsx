import { useId } from 'react';
import type { BoardData } from '@shared/schemas/facility';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { TextField } from '@/components/ui/text-field';
import { filterBoard, useBoardFilters } from '@/features/board/hooks/use-board-filters';
import { BoardSummary } from '@/features/board/components/board-summary';
import { ToolCard } from '@/features/board/components/tool-card';

/** The board itself: state counts, search and filters, then the tools area by area. */
export function BoardView({ data }: { data: BoardData }) {
  const { filters, setFilters } = useBoardFilters();
  const areaSelectId = useId();
  const areas = filterBoard(data, filters);
  const shown = areas.reduce((n, a) => n + a.tools.length, 0);
  const filtered = Boolean(filters.q || filters.areaId || filters.status);

  return (
    <div className="flex flex-col gap-6">
      <BoardSummary counts={data.counts} active={filters.status} onSelect={(status) => setFilters({ status })} />

      <form role="search" className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <TextField
          label="Search tools"
          type="search"
          placeholder="Name or code"
          value={filters.q}
          onChange={(e) => setFilters({ q: e.target.value })}
          className="w-full sm:w-72"
          autoComplete="off"
        />
        <div className="flex w-full flex-col gap-1.5 sm:w-60">
          <label htmlFor={areaSelectId} className="text-sm font-semibold text-ink">
            Area
          </label>
          <select
            id={areaSelectId}
            value={filters.areaId ?? ''}
            onChange={(e) => setFilters({ areaId: e.target.value ? Number(e.target.value) : null })}
            className="min-h-11 rounded-lg border border-control bg-card px-3 text-base text-ink amber:border-2"
          >
            <option value="">All areas</option>
            {data.areas.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </div>
        {filtered && (
          <Button variant="secondary" onClick={() => setFilters({ q: '', areaId: null, status: null })}>
            Clear filters
          </Button>
        )}
      </form>

      <p className="text-sm text-muted" aria-live="polite">
        {filtered ? `Showing ${shown} of ${data.total} tools.` : `${data.total} tools.`}
      </p>

      {data.total === 0 && (
        <Alert tone="info" title="No tools yet">
          An administrator adds areas and tools under Admin → Tools and areas.
        </Alert>
      )}
      {data.total > 0 && shown === 0 && (
        <Alert tone="info" title="No tool matches">
          Try another name or code, or clear the filters.
        </Alert>
      )}

      {areas.map((area) => (
        <section key={area.id} aria-labelledby={`area-${area.id}`} className="flex flex-col gap-3">
          <h2 id={`area-${area.id}`} className="flex items-baseline gap-2 text-lg font-semibold text-ink">
            {area.name}
            <span className="text-sm font-normal text-muted">
              {area.tools.length} {area.tools.length === 1 ? 'tool' : 'tools'}
            </span>
          </h2>
          <ul className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
            {area.tools.map((tool) => (
              <ToolCard key={tool.id} tool={tool} />
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}
