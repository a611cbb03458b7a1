import { E10_LABELS, E10_STATES, boardStatusOf, type E10State } from '@shared/equipment-state';
import type { AvailabilityFigure } from '@shared/schemas/facility';
import { StateBadge } from '@/components/ui/state-badge';
import { cx } from '@/lib/cx';

const FILL: Record<E10State, string> = {
  productive: 'bg-state-running-fill',
  standby: 'bg-state-running-tint',
  engineering: 'bg-state-engineering-fill',
  scheduled_downtime: 'bg-state-maintenance-fill',
  unscheduled_downtime: 'bg-state-down-fill',
  non_scheduled: 'bg-state-offline-fill',
};

const hours = (ms: number) => (ms / 3_600_000).toFixed(ms < 36_000_000 ? 1 : 0);

/**
 * Availability over the last 30 days: the share of the time not in scheduled or unscheduled
 * downtime or non-scheduled time. The bar shows the split; the table beside it says it in words.
 */
export function AvailabilityPanel({ figure }: { figure: AvailabilityFigure }) {
  if (figure.availability === null) return <p className="text-sm text-muted">No time recorded in the last 30 days.</p>;
  const percent = (figure.availability * 100).toFixed(1);
  return (
    <div className="flex flex-col gap-3">
      <p>
        <span className="text-4xl font-bold tabular-nums text-ink" data-testid="availability">
          {percent} %
        </span>
        <span className="ml-2 text-sm text-muted">available</span>
      </p>
      <div className="flex h-4 w-full overflow-hidden rounded border border-line" aria-hidden="true">
        {E10_STATES.filter((s) => figure.byState[s] > 0).map((s) => (
          <span key={s} className={cx('h-full', FILL[s])} style={{ width: `${(figure.byState[s] / figure.coveredMs) * 100}%` }} />
        ))}
      </div>
      <table className="w-full text-sm">
        <caption className="sr-only">Hours in each state over the last 30 days</caption>
        <tbody>
          {E10_STATES.map((s) => (
            <tr key={s} className="border-b border-line last:border-0">
              <th scope="row" className="py-1 text-left font-normal">
                <span className="flex items-center gap-2">
                  <StateBadge status={boardStatusOf(s)} size="sm" label={E10_LABELS[s]} />
                </span>
              </th>
              <td className="py-1 text-right tabular-nums text-ink">{hours(figure.byState[s])} h</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
