import { useState } from 'react';
import { Link } from 'react-router';
import type { ReliabilityTrend } from '@shared/reliability';
import type { AnalyticsToolRow } from '@shared/schemas/analytics';
import { cx } from '@/lib/cx';
import { formatCount, formatHours, formatPercent } from '@/features/analytics/components/format';

export type ToolSort = 'availability' | 'downtime' | 'trend';

const SORTS: { key: ToolSort; label: string }[] = [
  { key: 'availability', label: 'Lowest availability' },
  { key: 'downtime', label: 'Most downtime' },
  { key: 'trend', label: 'Getting worse first' },
];

/** Rows printed on the one-page report; the CSV has them all. */
export const PRINTED_TOOLS = 8;

const TREND_RANK: Record<ReliabilityTrend, number> = { worsening: 0, none: 1, insufficient: 2, improving: 3 };

export function sortTools(tools: AnalyticsToolRow[], sort: ToolSort): AnalyticsToolRow[] {
  const rows = [...tools];
  const availability = (t: AnalyticsToolRow) => t.figures.availabilityPct ?? 101;
  if (sort === 'availability') rows.sort((a, b) => availability(a) - availability(b) || a.code.localeCompare(b.code));
  if (sort === 'downtime')
    rows.sort((a, b) => b.figures.hours.unscheduledDowntime - a.figures.hours.unscheduledDowntime || a.code.localeCompare(b.code));
  if (sort === 'trend') {
    rows.sort(
      (a, b) =>
        TREND_RANK[a.trend] - TREND_RANK[b.trend] || (b.crowBeta ?? 0) - (a.crowBeta ?? 0) || b.figures.failures - a.figures.failures,
    );
  }
  return rows;
}

// The answer to "Getting worse?" in plain words; the statistics sit under it, explained below.
const TREND_WORDS: Record<ReliabilityTrend, string> = {
  worsening: 'Yes: failing more often',
  improving: 'No: failing less often',
  none: 'No clear change',
  insufficient: 'Too few failures to tell',
};

/** The trend told by a shape and a word as well as a colour. */
function TrendBadge({ trend }: { trend: ReliabilityTrend }) {
  const worse = trend === 'worsening';
  const better = trend === 'improving';
  return (
    <span
      className={cx(
        'inline-flex items-center gap-1 rounded-md border px-2 py-0.5 text-xs font-semibold whitespace-nowrap amber:border-2 amber:border-black',
        worse && 'border-state-down-fill bg-state-down-tint text-state-down-ink',
        better && 'border-state-running-fill bg-state-running-tint text-state-running-ink',
        !worse && !better && 'border-line bg-sunken text-muted',
      )}
      data-trend={trend}
    >
      {(worse || better) && (
        <svg viewBox="0 0 12 12" className="size-3" aria-hidden="true">
          <path d={worse ? 'M6 1 11 10H1Z' : 'M6 11 1 2h10Z'} fill="currentColor" />
        </svg>
      )}
      {TREND_WORDS[trend]}
    </span>
  );
}

export function ToolRanking({ tools, single = false }: { tools: AnalyticsToolRow[]; single?: boolean }) {
  const [sort, setSort] = useState<ToolSort>('availability');
  const rows = sortTools(tools, sort);
  if (tools.length === 0) return <p className="p-5 text-sm text-muted">No tool has any logged time in this period.</p>;
  return (
    <div className="flex flex-col">
      {/* One tool has nothing to rank. */}
      <div
        className={cx('flex flex-wrap items-center gap-2 px-5 pb-3 print:hidden', single && 'hidden')}
        role="group"
        aria-label="Rank the tools by"
      >
        <span className="text-sm font-semibold text-muted">Rank by</span>
        {SORTS.map((s) => (
          <button
            key={s.key}
            type="button"
            aria-pressed={sort === s.key}
            onClick={() => setSort(s.key)}
            className={cx(
              'min-h-11 rounded-lg border px-3 text-sm font-semibold amber:border-2',
              sort === s.key
                ? 'border-accent bg-accent-tint text-accent-ink amber:underline'
                : 'border-control bg-card text-ink hover:bg-sunken',
            )}
          >
            {s.label}
          </button>
        ))}
      </div>
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Tools ranked (scrolls sideways)">
        <table className="w-full border-collapse text-left text-sm" data-testid="tool-ranking">
          <caption className="sr-only">Tools ranked by {SORTS.find((s) => s.key === sort)!.label.toLowerCase()}</caption>
          <thead className="border-y border-line text-xs font-semibold tracking-wide text-muted uppercase">
            <tr>
              <th scope="col" className="px-4 py-2">
                Tool
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Availability
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Unscheduled downtime
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                Failures
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                MTBF
              </th>
              <th scope="col" className="px-4 py-2 text-right">
                MTTR (E10)
              </th>
              <th scope="col" className="px-4 py-2">
                Getting worse?
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((t, i) => (
              <tr
                key={t.id}
                className={cx('border-b border-line align-top print:[&>*]:py-0.5', i >= PRINTED_TOOLS && 'print:hidden')}
                data-tool={t.code}
              >
                <th scope="row" className="px-4 py-2 font-normal">
                  <Link
                    to={`/tools/${encodeURIComponent(t.code)}`}
                    className="inline-flex min-h-11 flex-col justify-center font-semibold print:min-h-0"
                  >
                    <span className="font-mono whitespace-nowrap">{t.code}</span>
                  </Link>
                  <span className="block text-xs text-muted print:ml-2 print:inline">
                    {t.name} · {t.areaName}
                  </span>
                </th>
                <td className="px-4 py-2 text-right tabular-nums">{formatPercent(t.figures.availabilityPct)}</td>
                <td className="px-4 py-2 text-right tabular-nums">{formatHours(t.figures.hours.unscheduledDowntime)}</td>
                <td className="px-4 py-2 text-right tabular-nums">{formatCount(t.figures.failures)}</td>
                <td className="px-4 py-2 text-right tabular-nums">{formatHours(t.figures.mtbf.point)}</td>
                <td className="px-4 py-2 text-right tabular-nums">{formatHours(t.figures.mttrHours)}</td>
                <td className="px-4 py-2">
                  <TrendBadge trend={t.trend} />
                  {t.crowBeta !== null && (
                    <span className="mt-1 block text-xs text-muted tabular-nums" title="Crow-AMSAA shape β: above 1, failures come faster">
                      β {t.crowBeta.toFixed(2)}
                    </span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="px-5 pt-3 text-xs text-muted print:pt-1">
        Getting worse? “Yes” when the gaps between failures are shrinking beyond chance (the reverse-arrangement test, 95 %, one-sided); “No
        clear change” when they are not. β, the Crow-AMSAA shape over the period, says how fast: 1 is a steady rate, above 1 failures come
        faster, below 1 slower. At least four failures are needed for an answer.
        {tools.length > PRINTED_TOOLS && (
          <span className="hidden print:inline">
            {' '}
            Printed: the first {PRINTED_TOOLS} of {tools.length} tools; the CSV export has all of them.
          </span>
        )}
      </p>
    </div>
  );
}
