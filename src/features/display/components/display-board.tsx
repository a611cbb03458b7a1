import { useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { BOARD_LABELS, BOARD_LOOK, BOARD_STATUSES, REASON_LABELS, type BoardStatus } from '@shared/equipment-state';
import type { BoardData, BoardTool } from '@shared/schemas/facility';
import { FaultlineGlyph } from '@/components/layout/wordmark';
import { StateBadge } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';
import { formatDuration } from '@/lib/time';
import { useNow } from '@/lib/use-now';
import type { RealtimeStatus } from '@/lib/socket';

function why(tool: BoardTool): string | null {
  return tool.note ?? (tool.reason !== 'none' ? REASON_LABELS[tool.reason] : null);
}

/** A tool that is not simply running: one line, with why and until when, readable across a corridor. */
function AttentionRow({ tool, now, dayTime }: { tool: BoardTool; now: number; dayTime: Intl.DateTimeFormat }) {
  const back = tool.expectedReturnAt ? new Date(tool.expectedReturnAt) : null;
  return (
    <li
      className="flex min-w-0 items-center gap-[0.6em] border-b border-line py-[0.15em] last:border-0"
      data-testid={`display-tool-${tool.code}`}
      data-status={tool.status}
    >
      <StateBadge
        status={tool.status}
        size="sm"
        className="shrink-0"
        label={tool.confirmed ? undefined : `${BOARD_LABELS[tool.status]}*`}
      />
      <p className="min-w-0 flex-1 truncate">
        <span className="font-bold text-ink">{tool.name}</span> <span className="font-mono text-[0.8em] text-muted">{tool.code}</span>
        {why(tool) && <span className="text-ink"> · {why(tool)}</span>}
      </p>
      <p className="shrink-0 text-right tabular-nums text-muted">
        {formatDuration(now - new Date(tool.since).getTime())}
        {back && <span className="font-semibold text-ink"> · {back.getTime() < now ? 'overdue' : `back ${dayTime.format(back)}`}</span>}
      </p>
    </li>
  );
}

const PAGE_MS = 15_000;

/**
 * Splits the bays into pages that fit the box: lays everything out once, counts the bays
 * that fit, and pages by that many. Re-measures when the screen's size or the bays change.
 */
function usePagedAreas<T>(areas: T[], box: React.RefObject<HTMLElement | null>) {
  const [perPage, setPerPage] = useState(areas.length || 1);
  const [page, setPage] = useState(0);
  const [size, setSize] = useState({ w: 0, h: 0 });
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setSize({ w: el.clientWidth, h: el.clientHeight }));
    ro.observe(el);
    return () => ro.disconnect();
  }, [box]);
  // A new screen size or a new number of bays: measure again from "everything fits".
  useLayoutEffect(() => setPerPage(Math.max(1, areas.length)), [areas.length, size.w, size.h]);
  // One measurement: with every bay laid out in columns of a fixed-height box, the bays past
  // the box's right or bottom edge are the ones that do not fit; the page holds the others.
  useLayoutEffect(() => {
    const el = box.current;
    if (!el || perPage <= 1) return;
    const edge = el.getBoundingClientRect();
    const bays = [...el.children].map((c) => c.getBoundingClientRect());
    const fit = bays.findIndex((r) => r.right > edge.right + 1 || r.bottom > edge.bottom + 1);
    if (fit !== -1 && fit < perPage) setPerPage(Math.max(1, fit));
  }, [box, perPage, areas, size.w, size.h]);
  const pages = Math.max(1, Math.ceil(areas.length / perPage));
  useEffect(() => {
    if (pages <= 1) return;
    const t = setInterval(() => setPage((p) => (p + 1) % pages), PAGE_MS);
    return () => clearInterval(t);
  }, [pages]);
  const current = Math.min(page, pages - 1);
  return { shown: areas.slice(current * perPage, (current + 1) * perPage), page: current, pages };
}

export interface DisplayBoardProps {
  name: string;
  /** The facility's time zone: a lobby screen shows the facility's time, not its own browser's. */
  timeZone?: string;
  data: BoardData;
  status: RealtimeStatus;
  /** Area codes to show (a screen in one bay); empty for the whole facility. */
  areaCodes?: string[];
}

function countsOf(tools: BoardTool[]): Record<BoardStatus, number> {
  const counts = Object.fromEntries(BOARD_STATUSES.map((s) => [s, 0])) as Record<BoardStatus, number>;
  for (const t of tools) counts[t.status]++;
  return counts;
}

/**
 * The lobby screen, made to fit one screen without scrolling (1280×720 up to 1920×1080 and
 * beyond, sizes follow the width): counts, what needs attention, then every tool by bay.
 * When the bays do not fit, they page by themselves every 15 s with a page indicator.
 */
export function DisplayBoard({ name, data, status, areaCodes = [], timeZone }: DisplayBoardProps) {
  const now = useNow();
  const wanted = new Set(areaCodes.map((c) => c.toUpperCase()));
  const areas = wanted.size ? data.areas.filter((a) => wanted.has(a.code.toUpperCase())) : data.areas;
  const tools = areas.flatMap((a) => a.tools);
  const counts = wanted.size ? countsOf(tools) : data.counts;
  const attention = tools
    .filter((t) => t.status !== 'running')
    .sort((a, b) => BOARD_LOOK[a.status].rank - BOARD_LOOK[b.status].rank || a.name.localeCompare(b.name));
  const worstFirst = [...BOARD_STATUSES].sort((a, b) => BOARD_LOOK[a].rank - BOARD_LOOK[b].rank);
  const anyUnconfirmed = attention.some((t) => !t.confirmed);
  const { clock, dayTime } = useMemo(
    () => ({
      clock: new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit', timeZone }),
      dayTime: new Intl.DateTimeFormat(undefined, { weekday: 'short', hour: '2-digit', minute: '2-digit', timeZone }),
    }),
    [timeZone],
  );
  const box = useRef<HTMLDivElement>(null);
  const { shown, page, pages } = usePagedAreas(areas, box);

  return (
    <main
      className="flex h-dvh flex-col gap-[1.2vh] overflow-hidden bg-page p-[1.5vw] text-[max(14px,1.1vw)]"
      data-testid="display-board"
      data-pages={pages}
    >
      <header className="flex shrink-0 flex-wrap items-center gap-x-[1.5vw] gap-y-2">
        <div className="flex items-center gap-3">
          <FaultlineGlyph className="size-[2.6vw] min-h-8 min-w-8" />
          <div>
            <h1 className="text-[2.2em] leading-none font-bold tracking-tight text-ink">Tool status</h1>
            <p className="text-muted">{name}</p>
          </div>
        </div>
        <ul className="flex flex-wrap gap-[0.8vw]" aria-label="Tools per state">
          {worstFirst.map((s) => (
            <li key={s} className="flex items-center gap-2 text-[1.4em] font-bold tabular-nums text-ink">
              <StateBadge status={s} size="md" />
              <span data-testid={`display-count-${s}`}>{counts[s]}</span>
            </li>
          ))}
        </ul>
        <div className="ml-auto text-right">
          <p className="text-[2.4em] leading-none font-bold tabular-nums text-ink" data-testid="display-clock">
            {clock.format(now)}
          </p>
          <p className="text-[0.85em] text-muted">{timeZone ?? ''}</p>
          <p className={cx('text-[0.85em] font-semibold', status === 'live' ? 'text-muted' : 'text-alert-danger-ink')} role="status">
            {status === 'live'
              ? 'Live'
              : status === 'connecting'
                ? 'Connecting…'
                : 'Connection lost — reconnecting; the board may be out of date'}
          </p>
        </div>
      </header>

      <section
        aria-labelledby="attention"
        className="max-h-[45%] shrink-0 overflow-hidden rounded-xl border-2 border-line bg-card px-[1vw] py-[0.6vh]"
      >
        <h2 id="attention" className="text-[1.3em] font-bold text-ink">
          {attention.length === 0 ? 'Every tool is running' : `Needs attention (${attention.length})`}
        </h2>
        {attention.length > 0 && (
          <ul className="grid grid-cols-2 gap-x-[2vw] xl:grid-cols-3">
            {attention.map((t) => (
              <AttentionRow key={t.id} tool={t} now={now} dayTime={dayTime} />
            ))}
          </ul>
        )}
        {anyUnconfirmed && <p className="text-[0.85em] text-muted">* Reported by a user; staff have not confirmed it yet.</p>}
      </section>

      <section aria-labelledby="all-tools" className="flex min-h-0 flex-1 flex-col">
        <div className="flex items-baseline gap-4">
          <h2 id="all-tools" className="text-[1.3em] font-bold text-ink">
            Every tool
          </h2>
          {pages > 1 && (
            <p className="font-semibold text-ink" data-testid="display-page" aria-live="off">
              Page {page + 1} of {pages} · bays change every {PAGE_MS / 1000} s
            </p>
          )}
        </div>
        <div ref={box} className="min-h-0 flex-1 columns-[16em] gap-[1.5vw] overflow-hidden [column-fill:auto]" data-testid="display-bays">
          {shown.map((area) => (
            <div key={area.id} className="mb-[0.8vh] break-inside-avoid" data-testid="display-bay">
              <h3 className="border-b-2 border-ink font-bold text-ink">{area.name}</h3>
              <ul>
                {area.tools.map((t) => (
                  <li key={t.id} className="flex items-center justify-between gap-2 leading-tight text-ink" data-testid="display-bay-tool">
                    <span className="min-w-0 truncate">{t.name}</span>
                    <StateBadge status={t.status} size="sm" />
                  </li>
                ))}
              </ul>
            </div>
          ))}
        </div>
      </section>

      <footer className="shrink-0 text-[0.85em] text-muted">
        Scan a tool’s label to report a fault. This screen does not replace the facility’s alarms: in an emergency, follow the emergency
        procedures.
      </footer>
    </main>
  );
}
