import { CartesianGrid, Line, LineChart, Tooltip, XAxis, YAxis } from 'recharts';
import type { AnalyticsMonthRow } from '@shared/schemas/analytics';
import { formatMonth, formatPercent } from '@/features/analytics/components/format';

/** Availability (E10 operational uptime) per month. */
export function AvailabilityTrendChart({ months }: { months: AnalyticsMonthRow[] }) {
  // A month with no operations time yet (or none at all) has no availability: a gap, never 0 %.
  const data = months.map((m) => ({
    label: `${formatMonth(m.month)}${m.partial ? '*' : ''}`,
    availability: m.availabilityPct,
    partial: m.partial,
  }));
  const values = data.map((d) => d.availability).filter((v): v is number => v !== null);
  const low = values.length ? Math.max(0, Math.floor(Math.min(...values) - 2)) : 0;
  return (
    <figure className="flex flex-col gap-2" data-testid="chart-availability">
      <LineChart responsive style={{ width: '100%', height: 240 }} data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
        <CartesianGrid strokeDasharray="3 3" vertical={false} />
        <XAxis dataKey="label" tick={{ fontSize: 12 }} interval="preserveStartEnd" />
        <YAxis domain={[low, 100]} tick={{ fontSize: 12 }} width={48} tickFormatter={(v: number) => `${v} %`} />
        <Tooltip formatter={(value) => formatPercent(Number(value))} />
        <Line
          type="monotone"
          dataKey="availability"
          name="Availability"
          stroke="#4a3aa7"
          strokeWidth={2}
          dot={(props: { cx?: number; cy?: number; index?: number; payload?: { partial: boolean } }) =>
            // A partial month is a hollow point: a figure so far, not a whole month.
            props.cy === undefined || props.cy === null || Number.isNaN(props.cy) ? (
              <g key={props.index} />
            ) : (
              <circle
                key={props.index}
                cx={props.cx}
                cy={props.cy}
                r={4}
                fill={props.payload?.partial ? '#ffffff' : '#4a3aa7'}
                stroke="#4a3aa7"
                strokeWidth={2}
                data-partial={props.payload?.partial ? 'true' : 'false'}
                className="availability-dot"
              />
            )
          }
          connectNulls
          isAnimationActive={false}
        />
      </LineChart>
      <figcaption className="text-xs text-muted">
        Availability per calendar month (UTC). * and a hollow point: a month only partly inside the period (the current month so far). A
        month without operations time has no point.
      </figcaption>
    </figure>
  );
}
