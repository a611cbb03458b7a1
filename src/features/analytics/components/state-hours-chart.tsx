import { useState } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import type { AnalyticsMonthRow } from '@shared/schemas/analytics';
import { seriesFill } from '@/features/analytics/components/chart-patterns';
import { formatHours, formatMonth, STATE_SERIES } from '@/features/analytics/components/format';

// Downtime is a thin slice of a month's hours; on its own scale its bars can be read.
const DOWNTIME_KEYS = new Set(['scheduledDowntime', 'unscheduledDowntime']);

/** Hours in each E10 state per month, stacked; partial months are marked with an asterisk. */
export function StateHoursChart({ months }: { months: AnalyticsMonthRow[] }) {
  const [downtimeOnly, setDowntimeOnly] = useState(false);
  const data = months.map((m) => ({ label: `${formatMonth(m.month)}${m.partial ? '*' : ''}`, ...m.hours }));
  const series = downtimeOnly ? STATE_SERIES.filter((s) => DOWNTIME_KEYS.has(s.key)) : STATE_SERIES;
  return (
    <figure className="flex flex-col gap-2" data-testid="chart-state-hours" data-scale={downtimeOnly ? 'downtime' : 'all'}>
      <div className="flex flex-wrap items-center gap-2 print:hidden" role="group" aria-label="Which states the chart shows">
        {[
          { only: false, label: 'All states' },
          { only: true, label: 'Downtime only (own scale)' },
        ].map((o) => (
          <button
            key={o.label}
            type="button"
            aria-pressed={downtimeOnly === o.only}
            onClick={() => setDowntimeOnly(o.only)}
            className={
              downtimeOnly === o.only
                ? 'min-h-11 rounded-lg border border-accent bg-accent-tint px-3 text-sm font-semibold text-accent-ink amber:border-2 amber:underline'
                : 'min-h-11 rounded-lg border border-control bg-card px-3 text-sm font-semibold text-ink hover:bg-sunken amber:border-2'
            }
          >
            {o.label}
          </button>
        ))}
      </div>
      <BarChart responsive style={{ width: '100%', height: 320 }} data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
        <CartesianGrid strokeDasharray="3 3" vertical={false} />
        <XAxis dataKey="label" tick={{ fontSize: 12 }} interval="preserveStartEnd" />
        <YAxis
          tick={{ fontSize: 12 }}
          width={56}
          tickFormatter={(v: number) => `${Math.round(v)}`}
          label={{ value: 'hours', angle: -90, position: 'insideLeft', fontSize: 12 }}
        />
        <Tooltip formatter={(value) => formatHours(Number(value))} />
        <Legend
          verticalAlign="top"
          itemSorter={null}
          wrapperStyle={{ fontSize: 12, paddingBottom: 8 }}
          formatter={(value) => <span style={{ color: '#1b1d21' }}>{value}</span>}
        />
        {series.map((s) => (
          <Bar
            key={s.key}
            dataKey={s.key}
            name={s.label}
            stackId="hours"
            fill={seriesFill(s.color, s.pattern)}
            stroke={s.pattern ? s.color : undefined}
            isAnimationActive={false}
          />
        ))}
      </BarChart>
      <figcaption className="text-xs text-muted">
        {downtimeOnly ? 'Scheduled and unscheduled downtime only, on their own scale. ' : ''}Hours of the tools in scope, per calendar month
        (UTC). * A month only partly inside the period (the current month so far).
      </figcaption>
    </figure>
  );
}
