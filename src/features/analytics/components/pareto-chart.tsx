import { Bar, BarChart, CartesianGrid, LabelList, Tooltip, XAxis, YAxis } from 'recharts';
import { CATEGORY_LABELS, type TicketCategory } from '@shared/report-options';
import type { ParetoRow } from '@shared/schemas/analytics';
import { formatHours, formatShare } from '@/features/analytics/components/format';

/** Most bars a Pareto shows before folding the rest into "All others". */
const MAX_BARS = 8;

export function paretoLabel(row: ParetoRow, kind: 'mode' | 'category'): string {
  if (row.kind === 'no_ticket') return 'No ticket linked';
  if (row.kind === 'not_recorded') return 'Failure mode not recorded';
  if (kind === 'category') {
    const label = CATEGORY_LABELS[row.key as TicketCategory] ?? row.key ?? '';
    // The form's long labels carry examples in brackets; the chart needs the short name.
    return label.replace(/\s*\(.*\)$/, '');
  }
  return row.key ?? '';
}

interface Bar {
  label: string;
  hours: number;
  tickets: number;
  cumulative: number;
}

function bars(rows: ParetoRow[], kind: 'mode' | 'category'): Bar[] {
  const head = rows
    .slice(0, MAX_BARS)
    .map((r) => ({ label: paretoLabel(r, kind), hours: r.hours, tickets: r.tickets, cumulative: r.cumulativeShare }));
  const rest = rows.slice(MAX_BARS);
  if (rest.length > 0) {
    head.push({
      label: `All others (${rest.length})`,
      hours: rest.reduce((s, r) => s + r.hours, 0),
      tickets: rest.reduce((s, r) => s + r.tickets, 0),
      cumulative: 1,
    });
  }
  return head;
}

/**
 * A Pareto of unscheduled downtime hours: largest first, each bar labelled with its hours and
 * the running share of all downtime, so "the few modes that cost the most" reads at a glance.
 */
export function ParetoChart({ rows, kind, testId }: { rows: ParetoRow[]; kind: 'mode' | 'category'; testId: string }) {
  if (rows.length === 0) return <p className="text-sm text-muted">No unscheduled downtime in this period.</p>;
  const data = bars(rows, kind).map((b) => ({ ...b, note: `${formatHours(b.hours)} · ${formatShare(b.cumulative)}` }));
  return (
    <figure className="flex flex-col gap-2" data-testid={testId}>
      <BarChart
        responsive
        layout="vertical"
        style={{ width: '100%', height: 40 + data.length * 36 }}
        data={data}
        margin={{ top: 4, right: 88, bottom: 4, left: 4 }}
      >
        <CartesianGrid strokeDasharray="3 3" horizontal={false} />
        <XAxis type="number" tick={{ fontSize: 12 }} tickFormatter={(v: number) => `${Math.round(v)} h`} />
        <YAxis type="category" dataKey="label" width={124} tick={{ fontSize: 12 }} interval={0} />
        <Tooltip formatter={(value) => formatHours(Number(value))} />
        <Bar dataKey="hours" name="Unscheduled downtime" fill="url(#analytics-hatch-down)" stroke="#c42a25" isAnimationActive={false}>
          <LabelList dataKey="note" position="right" fontSize={12} fill="#1b1d21" />
        </Bar>
      </BarChart>
      <figcaption className="text-xs text-muted">
        Bars: hours. Labels: the hours, then the cumulative share of all unscheduled downtime in the period.
      </figcaption>
    </figure>
  );
}
