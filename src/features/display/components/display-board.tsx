import { BOARD_LABELS, BOARD_LOOK, BOARD_STATUSES, REASON_LABELS, type BoardStatus } from '@shared/equipment-state';
import type { BoardData, BoardTool } from '@shared/schemas/facility';
import { FaultlineGlyph } from '@/components/layout/wordmark';
import { StateBadge } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';
import { formatDuration } from '@/lib/time';
import { useNow } from '@/lib/use-now';
import type { DisplaySocketStatus } from '@/features/display/hooks/use-display-socket';

const clock = new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit' });
const dayTime = new Intl.DateTimeFormat(undefined, { weekday: 'short', hour: '2-digit', minute: '2-digit' });

function why(tool: BoardTool): string | null {
  return tool.note ?? (tool.reason !== 'none' ? REASON_LABELS[tool.reason] : null);
}

/** A tool that is not simply running: big, with why and until when, for reading across a corridor. */
function AttentionRow({ tool, now }: { tool: BoardTool; now: number }) {
  const back = tool.expectedReturnAt ? new Date(tool.expectedReturnAt) : null;
  return (
    <li className="flex flex-col gap-2 border-b-2 border-line py-3 last:border-0 sm:flex-row sm:items-center sm:gap-5" data-testid={`display-tool-${tool.code}`} data-status={tool.status}>
      <StateBadge status={tool.status} size="xl" className="self-start sm:w-[18rem] sm:self-center" label={tool.confirmed ? undefined : `${BOARD_LABELS[tool.status]}*`} />
      <div className="min-w-0 flex-1">
        <p className="text-[clamp(1.5rem,2.4vw,2.75rem)] leading-tight font-bold break-words text-ink">
          {tool.name} <span className="font-mono text-[0.6em] font-semibold whitespace-nowrap text-muted">{tool.code}</span>
        </p>
        {why(tool) && <p className="text-[clamp(1.125rem,1.6vw,1.75rem)] text-ink">{why(tool)}</p>}
      </div>
      <div className="text-[clamp(1.125rem,1.5vw,1.75rem)] tabular-nums text-muted sm:text-right">
        <p>for {formatDuration(now - new Date(tool.since).getTime())}</p>
        {back && <p className="font-semibold text-ink">{back.getTime() < now ? 'overdue' : `back ${dayTime.format(back)}`}</p>}
      </div>
    </li>
  );
}

export interface DisplayBoardProps {
  name: string;
  data: BoardData;
  status: DisplaySocketStatus;
  /** Area codes to show (a screen in one bay); empty for the whole facility. */
  areaCodes?: string[];
}

function countsOf(tools: BoardTool[]): Record<BoardStatus, number> {
  const counts = Object.fromEntries(BOARD_STATUSES.map((s) => [s, 0])) as Record<BoardStatus, number>;
  for (const t of tools) counts[t.status]++;
  return counts;
}

/** The lobby screen: counts, what needs attention, then every tool. No controls, large type. */
export function DisplayBoard({ name, data, status, areaCodes = [] }: DisplayBoardProps) {
  const now = useNow();
  const wanted = new Set(areaCodes.map((c) => c.toUpperCase()));
  const areas = wanted.size ? data.areas.filter((a) => wanted.has(a.code.toUpperCase())) : data.areas;
  const tools = areas.flatMap((a) => a.tools);
  const counts = wanted.size ? countsOf(tools) : data.counts;
  const attention = tools.filter((t) => t.status !== 'running').sort((a, b) => BOARD_LOOK[a.status].rank - BOARD_LOOK[b.status].rank || a.name.localeCompare(b.name));
  const worstFirst = [...BOARD_STATUSES].sort((a, b) => BOARD_LOOK[a].rank - BOARD_LOOK[b].rank);
  const anyUnconfirmed = attention.some((t) => !t.confirmed);

  return (
    <div className="flex min-h-dvh flex-col gap-6 bg-page p-[clamp(1rem,2vw,2.5rem)]" data-testid="display-board">
      <header className="flex flex-wrap items-center gap-x-6 gap-y-3">
        <div className="flex items-center gap-3">
          <FaultlineGlyph className="size-[clamp(2rem,3vw,3.5rem)]" />
          <div>
            <h1 className="text-[clamp(1.75rem,3vw,3.5rem)] leading-none font-bold tracking-tight text-ink">Tool status</h1>
            <p className="text-[clamp(1rem,1.3vw,1.5rem)] text-muted">{name}</p>
          </div>
        </div>
        <ul className="flex flex-wrap gap-3" aria-label="Tools per state">
          {worstFirst.map((s) => (
            <li key={s} className="flex items-center gap-2 text-[clamp(1.25rem,2vw,2.25rem)] font-bold tabular-nums text-ink">
              <StateBadge status={s} size="lg" />
              <span data-testid={`display-count-${s}`}>{counts[s]}</span>
            </li>
          ))}
        </ul>
        <div className="ml-auto text-right">
          <p className="text-[clamp(2rem,3.5vw,4rem)] leading-none font-bold tabular-nums text-ink">{clock.format(now)}</p>
          <p className={cx('text-[clamp(0.9rem,1.1vw,1.25rem)] font-semibold', status === 'live' ? 'text-muted' : 'text-alert-danger-ink')} role="status">
            {status === 'live' ? 'Live' : status === 'connecting' ? 'Connecting…' : 'Connection lost — reconnecting; the board may be out of date'}
          </p>
        </div>
      </header>

      <section aria-labelledby="attention" className="rounded-xl border-2 border-line bg-card px-[clamp(1rem,2vw,2rem)] py-3">
        <h2 id="attention" className="text-[clamp(1.25rem,2vw,2.25rem)] font-bold text-ink">
          {attention.length === 0 ? 'Every tool is running' : `Needs attention (${attention.length})`}
        </h2>
        {attention.length > 0 && (
          <ul className="grid gap-x-10 2xl:grid-cols-2">
            {attention.map((t) => (
              <AttentionRow key={t.id} tool={t} now={now} />
            ))}
          </ul>
        )}
        {anyUnconfirmed && <p className="pt-2 text-[clamp(1rem,1.2vw,1.4rem)] text-muted">* Reported by a user; staff have not confirmed it yet.</p>}
      </section>

      <section aria-label="All tools" className="columns-1 gap-6 sm:columns-2 xl:columns-3 2xl:columns-4">
        {areas.map((area) => (
          <div key={area.id} className="mb-6 break-inside-avoid">
            <h2 className="mb-2 border-b-2 border-ink text-[clamp(1.25rem,1.8vw,2rem)] font-bold text-ink">{area.name}</h2>
            <ul>
              {area.tools.map((t) => (
                <li key={t.id} className="flex items-center justify-between gap-3 py-1.5 text-[clamp(1.125rem,1.5vw,1.75rem)] text-ink">
                  <span className="min-w-0 truncate font-semibold">{t.name}</span>
                  <StateBadge status={t.status} size="md" />
                </li>
              ))}
            </ul>
          </div>
        ))}
      </section>

      <footer className="mt-auto text-[clamp(0.875rem,1vw,1.125rem)] text-muted">
        Scan a tool’s label to report a fault. This screen does not replace the facility’s alarms: in an emergency, follow the emergency procedures.
      </footer>
    </div>
  );
}
