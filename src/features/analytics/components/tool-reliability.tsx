import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { useToolReliability } from '@/features/analytics/api/get-tool-reliability';
import { formatCount, formatHours, formatPercent } from '@/features/analytics/components/format';

// No chart library here: this panel sits on the tool page, which everyone opens on a phone.

/** Availability, MTBF and MTTR of one tool over the last 30 and 365 days. */
export function ToolReliability({ toolId }: { toolId: number }) {
  const figures = useToolReliability(toolId);
  if (figures.isPending) return <Spinner label="Loading the reliability figures…" showLabel />;
  if (figures.isError) {
    return (
      <div className="flex flex-col items-start gap-2 text-sm">
        <p className="text-alert-danger-ink">The reliability figures could not be loaded: {figures.error.message}</p>
        <Button variant="secondary" onClick={() => void figures.refetch()}>
          Try again
        </Button>
      </div>
    );
  }
  const windows = figures.data.windows;
  return (
    <div className="flex flex-col gap-3" data-testid="tool-reliability">
      <table className="w-full text-sm">
        <caption className="sr-only">Reliability over the last 30 and 365 days</caption>
        <thead>
          <tr className="border-b border-line text-xs font-semibold text-muted">
            <td />
            {windows.map((w) => (
              <th key={w.days} scope="col" className="py-1 pl-2 text-right whitespace-nowrap">
                {w.days} days
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr className="border-b border-line">
            <th scope="row" className="py-1.5 text-left font-normal">
              Availability <span className="block text-xs text-muted">E10: uptime ÷ time not non-scheduled</span>
            </th>
            {windows.map((w) => (
              <td
                key={w.days}
                className="py-1.5 pl-2 text-right font-semibold whitespace-nowrap tabular-nums"
                data-testid={`reliability-availability-${w.days}`}
              >
                {formatPercent(w.availabilityPct)}
              </td>
            ))}
          </tr>
          <tr className="border-b border-line">
            <th scope="row" className="py-1.5 text-left font-normal">
              Failures
            </th>
            {windows.map((w) => (
              <td key={w.days} className="py-1.5 pl-2 text-right font-semibold whitespace-nowrap tabular-nums">
                {formatCount(w.failures)}
              </td>
            ))}
          </tr>
          <tr className="border-b border-line">
            <th scope="row" className="py-1.5 text-left font-normal">
              MTBF <span className="block text-xs text-muted">uptime per failure</span>
            </th>
            {windows.map((w) => (
              <td key={w.days} className="py-1.5 pl-2 text-right font-semibold whitespace-nowrap tabular-nums">
                {w.failures === 0 ? 'no failures' : formatHours(w.mtbfHours)}
              </td>
            ))}
          </tr>
          <tr>
            <th scope="row" className="py-1.5 text-left font-normal">
              MTTR <span className="block text-xs text-muted">E10: repair only, without waiting</span>
            </th>
            {windows.map((w) => (
              <td key={w.days} className="py-1.5 pl-2 text-right font-semibold whitespace-nowrap tabular-nums">
                {formatHours(w.mttrHours)}
              </td>
            ))}
          </tr>
        </tbody>
      </table>
      <p className="text-xs text-muted">
        Non-scheduled time is left out of this availability, so it can differ from the figure above. A failure is one stretch of unscheduled
        downtime.
      </p>
    </div>
  );
}
