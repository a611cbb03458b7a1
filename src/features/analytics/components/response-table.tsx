import { PRIORITY_LABELS } from '@shared/priority';
import type { ResponseRow } from '@shared/schemas/analytics';
import { formatCount, formatMinutes, formatShare } from '@/features/analytics/components/format';

/** Time to acknowledge and to restore per priority, against the service targets. */
export function ResponseTable({ rows, overall }: { rows: ResponseRow[]; overall: ResponseRow }) {
  const all = [...rows, overall];
  return (
    <div className="overflow-x-auto print:overflow-visible" tabIndex={0} role="region" aria-label="Response times (scrolls sideways)">
      <table
        className="w-full border-collapse text-left text-sm print:text-xs print:[&_td]:px-1.5 print:[&_th]:px-1.5"
        data-testid="response-table"
      >
        <caption className="sr-only">Response times per priority against the service targets</caption>
        <thead className="border-y border-line text-xs font-semibold tracking-wide text-muted uppercase">
          <tr>
            <th scope="col" className="px-4 py-2">
              Priority
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              Tickets
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              To acknowledge: mean / 90 %
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              Target · met
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              To restore: mean / 90 %
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              Target · met
            </th>
          </tr>
        </thead>
        <tbody>
          {all.map((r) => (
            <tr key={r.priority} className={r.priority === 'all' ? 'font-semibold' : 'border-b border-line'}>
              <th scope="row" className="px-4 py-2 text-left font-semibold whitespace-nowrap">
                {r.priority === 'all' ? 'All priorities' : PRIORITY_LABELS[r.priority]}
              </th>
              <td className="px-4 py-2 text-right tabular-nums">{formatCount(r.tickets)}</td>
              <td className="px-4 py-2 text-right tabular-nums whitespace-nowrap">
                {formatMinutes(r.ackMeanMinutes)} / {formatMinutes(r.ackP90Minutes)}
              </td>
              <td className="px-4 py-2 text-right tabular-nums whitespace-nowrap">
                {r.ackTargetMinutes === null ? '' : `${formatMinutes(r.ackTargetMinutes)} · `}
                {formatShare(r.ackMetShare)}
                {r.ackOverdue > 0 && <span className="block text-xs font-semibold">{formatCount(r.ackOverdue)} open late</span>}
              </td>
              <td className="px-4 py-2 text-right tabular-nums whitespace-nowrap">
                {formatMinutes(r.restoreMeanMinutes)} / {formatMinutes(r.restoreP90Minutes)}
              </td>
              <td className="px-4 py-2 text-right tabular-nums whitespace-nowrap">
                {r.restoreTargetMinutes === null ? '' : `${formatMinutes(r.restoreTargetMinutes)} · `}
                {formatShare(r.restoreMetShare)}
                {r.restoreOverdue > 0 && <span className="block text-xs font-semibold">{formatCount(r.restoreOverdue)} open late</span>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="px-5 pt-3 text-xs text-muted">
        Tickets reported in the period, merged duplicates left out. Time to restore runs to the moment the ticket was marked fixed (or found
        to have no fault). “Met” counts a ticket still open past its target as missed, also one reported before the period, so a share never
        reads 100 % while such a ticket is open.
      </p>
    </div>
  );
}
