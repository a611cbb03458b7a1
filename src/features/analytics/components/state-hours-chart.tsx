import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import type { AnalyticsMonthRow } from '@shared/schemas/analytics';
import { seriesFill } from '@/features/analytics/components/chart-patterns';
import { formatHours, formatMonth, STATE_SERIES } from '@/features/analytics/components/format';

/** Hours in each E10 state per month, stacked; partial months are marked with an asterisk. */
export function StateHoursChart({ months }: { months: AnalyticsMonthRow[] }) {
  const data = months.map((m) => ({ label: `${formatMonth(m.month)}${m.partial ? '*' : ''}`, ...m.hours }));
  return (
    <figure className="flex flex-col gap-2" data-testid="chart-state-hours">
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
        {STATE_SERIES.map((s) => (
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
        Hours of the tools in scope, per calendar month (UTC). * A month only partly inside the period.
      </figcaption>
    </figure>
  );
}
