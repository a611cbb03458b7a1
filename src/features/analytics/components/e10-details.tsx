import type { AnalyticsAreaRow, ReliabilityFigures } from '@shared/schemas/analytics';
import { formatCount, formatHours, formatPercent } from '@/features/analytics/components/format';

function Row({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <tr className="border-b border-line last:border-0">
      <th scope="row" className="py-1.5 pr-3 text-left font-normal">
        {label}
        {note && <span className="block text-xs text-muted">{note}</span>}
      </th>
      <td className="py-1.5 text-right align-top font-semibold whitespace-nowrap tabular-nums">{value}</td>
    </tr>
  );
}

/** The rest of the SEMI E10 figures, and where the downtime hours went by sub-reason. */
export function E10Details({ figures }: { figures: ReliabilityFigures }) {
  const d = figures.downtime;
  return (
    <div className="grid grid-cols-1 gap-6 md:grid-cols-2">
      <table className="w-full text-sm">
        <caption className="pb-2 text-left text-sm font-semibold text-ink">Uptime figures</caption>
        <tbody>
          <Row label="Operational uptime (availability)" value={formatPercent(figures.availabilityPct)} note="uptime ÷ operations time" />
          <Row
            label="Equipment-dependent uptime"
            value={formatPercent(figures.equipmentDependentUptimePct)}
            note="leaves out all waiting, facilities and out-of-spec input"
          />
          <Row
            label="Supplier-dependent uptime"
            value={formatPercent(figures.supplierDependentUptimePct)}
            note="leaves out the user’s waiting, facilities and out-of-spec input"
          />
          <Row
            label="Mean time off-line (MTOL)"
            value={formatHours(figures.mtolHours)}
            note={`downtime per downtime event (${formatCount(figures.downtimeEvents)} events)`}
          />
          <Row
            label="Mean uptime between assists"
            value={formatHours(figures.mtbaHours)}
            note={`${formatCount(figures.assists)} assists`}
          />
        </tbody>
      </table>
      <table className="w-full text-sm">
        <caption className="pb-2 text-left text-sm font-semibold text-ink">Downtime by sub-reason</caption>
        <tbody>
          <Row label="Repair, test and verification" value={formatHours(d.repair)} />
          <Row label="Waiting for parts or the vendor" value={formatHours(d.maintenanceDelaySupplier)} />
          <Row label="Waiting on the user" value={formatHours(d.maintenanceDelayUser)} />
          <Row label="Facilities (gases, water, exhaust, power)" value={formatHours(d.facilitiesRelated)} />
          <Row label="Out-of-spec input material" value={formatHours(d.outOfSpecInput)} />
          <Row label="Uptime" value={formatHours(figures.uptimeHours)} note="productive + standby + engineering" />
        </tbody>
      </table>
    </div>
  );
}

export function AreaTable({ areas }: { areas: AnalyticsAreaRow[] }) {
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Time in each E10 state (scrolls sideways)">
      <table className="w-full border-collapse text-left text-sm" data-testid="area-table">
        <caption className="sr-only">Figures per area</caption>
        <thead className="border-y border-line text-xs font-semibold tracking-wide text-muted uppercase">
          <tr>
            <th scope="col" className="px-4 py-2">
              Area
            </th>
            <th scope="col" className="px-4 py-2 text-right">
              Tools
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
          </tr>
        </thead>
        <tbody>
          {areas.map((a) => (
            <tr key={a.id} className="border-b border-line last:border-0">
              <th scope="row" className="px-4 py-2 font-semibold">
                {a.name}
              </th>
              <td className="px-4 py-2 text-right tabular-nums">{formatCount(a.toolCount)}</td>
              <td className="px-4 py-2 text-right tabular-nums">{formatPercent(a.figures.availabilityPct)}</td>
              <td className="px-4 py-2 text-right tabular-nums">{formatHours(a.figures.hours.unscheduledDowntime)}</td>
              <td className="px-4 py-2 text-right tabular-nums">{formatCount(a.figures.failures)}</td>
              <td className="px-4 py-2 text-right tabular-nums">{formatHours(a.figures.mtbf.point)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
