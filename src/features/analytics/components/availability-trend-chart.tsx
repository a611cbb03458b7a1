import { CartesianGrid, Line, LineChart, Tooltip, XAxis, YAxis } from 'recharts';
import type { AnalyticsMonthRow } from '@shared/schemas/analytics';
import { formatMonth, formatPercent } from '@/features/analytics/components/format';

/** Availability (E10 operational uptime) per month. */
export function AvailabilityTrendChart({ months }: { months: AnalyticsMonthRow[] }) {
  const data = months.map((m) => ({ label: `${formatMonth(m.month)}${m.partial ? '*' : ''}`, availability: m.availabilityPct }));
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
          dot={{ r: 4, fill: '#4a3aa7' }}
          connectNulls
          isAnimationActive={false}
        />
      </LineChart>
      <figcaption className="text-xs text-muted">
        Availability per calendar month (UTC). * A month only partly inside the period.
      </figcaption>
    </figure>
  );
}
