import type { ReactNode } from 'react';
import type { AnalyticsReport, MtbfFigure } from '@shared/schemas/analytics';
import { formatCount, formatHours, formatMinutes, formatPercent, formatShare } from '@/features/analytics/components/format';

interface FigureProps {
  id: string;
  label: string;
  value: string;
  /** The exact number behind the rounded one, for tests and for copying. */
  raw: number | null;
  children?: ReactNode;
}

function Figure({ id, label, value, raw, children }: FigureProps) {
  return (
    <div className="flex flex-col gap-1 rounded-xl border border-line bg-card p-4 shadow-sm break-inside-avoid amber:border-2 amber:shadow-none print:p-2 print:shadow-none">
      <dt className="text-sm font-semibold text-muted">{label}</dt>
      <dd
        className="text-3xl font-bold tracking-tight text-ink tabular-nums print:text-2xl"
        data-testid={`figure-${id}`}
        data-value={raw ?? ''}
      >
        {value}
      </dd>
      {children && <dd className="text-sm leading-snug text-muted">{children}</dd>}
    </div>
  );
}

/** The confidence interval in one plain sentence, as the figure needs it. */
export function mtbfSentence(mtbf: MtbfFigure): string {
  const pct = Math.round(mtbf.confidence * 100);
  if (mtbf.failures === 0) {
    if (mtbf.lower === null) return 'No uptime and no failures in this period, so there is nothing to estimate.';
    // Two-sided at 90 % leaves 5 % in each tail, so the lone lower limit is a 95 % one.
    const oneSided = Math.round((1 - (1 - mtbf.confidence) / 2) * 100);
    return `No failures in this period. With ${oneSided} % confidence the true MTBF is at least ${formatHours(mtbf.lower)}, assuming failures occur at a constant rate.`;
  }
  return `With ${pct} % confidence the true MTBF lies between ${formatHours(mtbf.lower)} and ${formatHours(mtbf.upper)}, assuming failures occur at a constant rate.`;
}

export function HeadlineFigures({ report }: { report: AnalyticsReport }) {
  const t = report.totals;
  const ack = report.response.overall;
  return (
    <dl className="grid grid-cols-1 gap-3 sm:grid-cols-2 xl:grid-cols-3 print:grid-cols-3 print:gap-2" aria-label="Headline figures">
      <Figure id="availability" label="Availability" value={formatPercent(t.availabilityPct)} raw={t.availabilityPct}>
        Uptime ÷ operations time (SEMI E10 operational uptime; non-scheduled time is left out).
      </Figure>
      <Figure
        id="unscheduled-hours"
        label="Unscheduled downtime"
        value={formatHours(t.hours.unscheduledDowntime)}
        raw={t.hours.unscheduledDowntime}
      >
        Scheduled downtime {formatHours(t.hours.scheduledDowntime)} · non-scheduled {formatHours(t.hours.nonScheduled)}.
      </Figure>
      <Figure id="failures" label="Failures" value={formatCount(t.failures)} raw={t.failures}>
        Each stretch of unscheduled downtime is one failure. Assists (cleared without repair): {formatCount(t.assists)}.
      </Figure>
      <Figure id="mtbf" label="MTBF over uptime" value={t.mtbf.point === null ? '—' : formatHours(t.mtbf.point)} raw={t.mtbf.point}>
        <span data-testid="mtbf-interval">{mtbfSentence(t.mtbf)}</span> Uptime (productive, standby and engineering hours) per failure:
        without a feed of run time, productive and idle time cannot be told apart.
      </Figure>
      <Figure id="mttr" label="MTTR (E10: repair only)" value={formatHours(t.mttrHours)} raw={t.mttrHours}>
        Repair, test and verification per failure, without waiting for parts, the vendor or the user. Down time per failure with the
        waiting: {formatHours(t.meanDownHoursPerFailure)}.
      </Figure>
      <Figure id="acknowledge" label="Time to acknowledge" value={formatMinutes(ack.ackMeanMinutes)} raw={ack.ackMeanMinutes}>
        Mean over the <span data-testid="ack-count">{formatCount(ack.acknowledged)}</span> acknowledged of the{' '}
        <span data-testid="ticket-count">{formatCount(ack.tickets)}</span> tickets reported in the period; 90 % within{' '}
        {formatMinutes(ack.ackP90Minutes)}.{' '}
        <span data-testid="ack-met">{formatShare(ack.ackMetShare)} acknowledged within their target</span>
        {ack.ackOverdue > 0 && (
          <>
            {' '}
            · <strong data-testid="ack-overdue">{formatCount(ack.ackOverdue)} open past the target</strong>
          </>
        )}
        .
      </Figure>
    </dl>
  );
}
