import type { ReactNode } from 'react';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner, Spinner } from '@/components/ui/spinner';
import { csvUrl, useReport } from '@/features/analytics/api/get-report';
import { useScopes } from '@/features/analytics/api/get-scopes';
import { AvailabilityTrendChart } from '@/features/analytics/components/availability-trend-chart';
import { ChartPatterns } from '@/features/analytics/components/chart-patterns';
import { AreaTable, E10Details } from '@/features/analytics/components/e10-details';
import {
  formatCount,
  formatDay,
  formatHours,
  formatPercent,
  formatPeriod,
  formatMonth,
  STATE_SERIES,
} from '@/features/analytics/components/format';
import { HeadlineFigures } from '@/features/analytics/components/headline-figures';
import { ParetoChart } from '@/features/analytics/components/pareto-chart';
import { ReportControls } from '@/features/analytics/components/report-controls';
import { ResponseTable } from '@/features/analytics/components/response-table';
import { StateHoursChart } from '@/features/analytics/components/state-hours-chart';
import { ToolRanking } from '@/features/analytics/components/tool-ranking';
import { useAnalyticsSelection } from '@/features/analytics/hooks/use-analytics-selection';
import type { AnalyticsMonthRow, AnalyticsReport } from '@shared/schemas/analytics';
import { cx } from '@/lib/cx';
import { AlarmLoadSection } from '@/features/alarms/components/alarm-load-section';

// The printed report: one A4 page per scope. Rendered with the page, so it is gone again
// when the page is left; the app's bar, menu and footer are hidden only while a report is on
// screen.
const PRINT_CSS = `
@media print {
  @page { size: A4 portrait; margin: 9mm; }
  html, body { background: #fff !important; }
  body:has([data-analytics-report]) > * header,
  body:has([data-analytics-report]) > * footer,
  body:has([data-analytics-report]) nav,
  body:has([data-analytics-report]) .skip-link { display: none !important; }
  body:has([data-analytics-report]) main { max-width: none !important; padding: 0 !important; }
  [data-analytics-report] { zoom: 0.52; -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  [data-analytics-report] .recharts-wrapper, [data-analytics-report] svg.recharts-surface { max-width: 100% !important; }
  [data-analytics-report] section, [data-analytics-report] figure { break-inside: avoid; }
}
`;

function MonthTable({ months }: { months: AnalyticsMonthRow[] }) {
  return (
    <details className="mt-3 print:hidden">
      <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-accent">
        The numbers per month
      </summary>
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Hours per month (scrolls sideways)">
        <table className="w-full border-collapse text-left text-sm" data-testid="month-table">
          <caption className="sr-only">Hours in each E10 state, availability and failures per month</caption>
          <thead className="border-y border-line text-xs font-semibold text-muted">
            <tr>
              <th scope="col" className="px-2 py-2">
                Month (UTC)
              </th>
              {STATE_SERIES.map((s) => (
                <th key={s.key} scope="col" className="px-2 py-2 text-right">
                  {s.label}
                </th>
              ))}
              <th scope="col" className="px-2 py-2 text-right">
                Availability
              </th>
              <th scope="col" className="px-2 py-2 text-right">
                Failures
              </th>
            </tr>
          </thead>
          <tbody>
            {months.map((m) => (
              <tr key={m.month} className="border-b border-line">
                <th scope="row" className="px-2 py-1.5 font-semibold whitespace-nowrap">
                  {formatMonth(m.month)}
                  {m.partial ? '*' : ''}
                </th>
                {STATE_SERIES.map((s) => (
                  <td key={s.key} className="px-2 py-1.5 text-right tabular-nums">
                    {formatHours(m.hours[s.key])}
                  </td>
                ))}
                <td className="px-2 py-1.5 text-right tabular-nums">{formatPercent(m.availabilityPct)}</td>
                <td className="px-2 py-1.5 text-right tabular-nums">{formatCount(m.failures)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}

function Section({
  title,
  description,
  children,
  flush,
  testId,
  className,
}: {
  title: string;
  description?: ReactNode;
  children: ReactNode;
  flush?: boolean;
  testId?: string;
  className?: string;
}) {
  return (
    <Card
      as="section"
      title={title}
      description={description}
      flush={flush}
      className={cx('min-w-0 break-inside-avoid print:shadow-none', className)}
      data-testid={testId}
    >
      {children}
    </Card>
  );
}

function Report({ report }: { report: AnalyticsReport }) {
  const scopeWord = report.scope.kind === 'facility' ? 'the facility' : report.scope.name;
  // One tool reads as one tool: "LPCVD-3 · LPCVD tube 3", never "every tool in".
  const oneTool = report.scope.kind === 'tool';
  // On paper the report is one A4 page: the sections that matter most, in a two-column grid
  // (print:contents lifts the screen's row wrappers out of the way, print:order places them).
  return (
    <div className="flex flex-col gap-6 print:grid print:grid-cols-2 print:gap-3">
      <div className="print:order-1 print:col-span-2">
        <HeadlineFigures report={report} />
      </div>

      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2 print:contents">
        <Section
          title="Hours in each state per month"
          description={oneTool ? `Time of ${scopeWord}, by SEMI E10 state.` : `Time of every tool in ${scopeWord}, by SEMI E10 state.`}
          testId="section-state-hours"
          className="print:order-2"
        >
          {report.months.length > 0 ? (
            <StateHoursChart months={report.months} />
          ) : (
            <p className="text-sm text-muted">The period has no time in it yet.</p>
          )}
          <MonthTable months={report.months} />
        </Section>
        <Section
          title="Availability per month"
          description="Uptime ÷ operations time, month by month."
          testId="section-availability"
          className="print:order-3"
        >
          {report.months.length > 0 ? (
            <AvailabilityTrendChart months={report.months} />
          ) : (
            <p className="text-sm text-muted">The period has no time in it yet.</p>
          )}
        </Section>
      </div>

      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2 print:contents">
        <Section title="Downtime by failure mode" description={report.notes.pareto} testId="section-pareto-mode" className="print:order-4">
          <ParetoChart rows={report.pareto.byFailureMode} kind="mode" testId="chart-pareto-mode" />
        </Section>
        <Section
          title="Downtime by category"
          description="The same hours by the category of the report."
          testId="section-pareto-category"
          className="print:hidden"
        >
          <ParetoChart rows={report.pareto.byCategory} kind="category" testId="chart-pareto-category" />
        </Section>
      </div>

      <Section
        title={oneTool ? 'This tool' : 'Tools'}
        description={
          oneTool
            ? 'Its figures and whether it is getting worse. Open it for its history and tickets.'
            : 'Ranked by availability, downtime or whether they are getting worse. Open a tool for its history and tickets.'
        }
        flush
        testId="section-tools"
        className="print:order-6 print:col-span-2"
      >
        <ToolRanking tools={report.tools} single={oneTool} />
      </Section>

      <Section
        title="Response to tickets"
        description="Against the service targets of each priority."
        flush
        testId="section-response"
        className="print:order-5"
      >
        <ResponseTable rows={report.response.byPriority} overall={report.response.overall} />
      </Section>

      <Section title="More SEMI E10 figures" testId="section-e10" className="print:hidden">
        <E10Details figures={report.totals} />
      </Section>

      {report.scope.kind === 'facility' && report.areas.length > 1 && (
        <Section title="Areas" flush testId="section-areas" className="print:hidden">
          <AreaTable areas={report.areas} />
        </Section>
      )}

      <Section title="How these figures are counted" testId="section-notes" className="print:hidden">
        <ul className="flex list-disc flex-col gap-1.5 pl-5 text-sm text-muted">
          <li>{report.notes.mtbf}</li>
          <li>{report.notes.mttr}</li>
          <li>
            Failures: each stretch of unscheduled downtime counts once, in the period in which it starts. Only the tool’s own state counts;
            a module’s state only makes the tool Limited on the board.
          </li>
          <li>{report.notes.trend}</li>
          <li>{report.notes.months}</li>
        </ul>
      </Section>
      <p className="hidden text-xs text-muted print:order-7 print:col-span-2 print:block">
        {report.notes.mtbf} {report.notes.mttr} {report.notes.months} The full tool table, the monthly hours and more SEMI E10 figures are
        on the screen and in the CSV exports.
      </p>
    </div>
  );
}

export function AnalyticsPage() {
  const { selection, params, problem, update, refresh } = useAnalyticsSelection();
  const scopes = useScopes();
  const report = useReport(params);
  const data = params ? report.data : undefined;
  const updating = report.isFetching && !report.isPending;

  return (
    <div data-analytics-report="" className="flex flex-col gap-6 print:gap-3">
      <title>Analytics · Faultline</title>
      <style>{PRINT_CSS}</style>
      <ChartPatterns />
      <PageHeader
        title="Downtime and reliability"
        description={
          data ? (
            <span data-testid="report-subtitle">
              {data.scope.name} · {formatPeriod(data.period.from, data.period.to)}
              <span className="hidden print:inline"> · made {formatDay(data.generatedAt)} by Faultline</span>
            </span>
          ) : (
            'Availability, failures, MTBF and MTTR over a period, for the facility, an area or a tool.'
          )
        }
        actions={
          <div className="flex flex-wrap items-center gap-2 print:hidden">
            {updating && <Spinner size="sm" label="Updating the report…" />}
            <Button variant="secondary" onClick={refresh} disabled={!params}>
              Refresh
            </Button>
            {params && (
              <>
                <a href={csvUrl('tools', params)} download className={buttonClasses({ variant: 'secondary' })} data-testid="csv-tools">
                  Tools CSV
                </a>
                <a href={csvUrl('months', params)} download className={buttonClasses({ variant: 'secondary' })} data-testid="csv-months">
                  Months CSV
                </a>
                <Button variant="secondary" onClick={() => window.print()} disabled={!data}>
                  Print
                </Button>
              </>
            )}
          </div>
        }
      />

      <Card as="section" title="Period and scope" className="print:hidden">
        <ReportControls selection={selection} update={update} options={scopes.data} />
        {scopes.isError && (
          <Alert tone="warning" className="mt-4" title="The list of areas and tools could not be loaded">
            {scopes.error.message}
          </Alert>
        )}
      </Card>

      {problem && <Alert tone="info">{problem}</Alert>}
      {params && report.isPending && <PageSpinner label="Adding up the state log…" />}
      {params && report.isError && (
        <Alert
          tone="danger"
          live
          title="The report could not be made"
          actions={
            <Button variant="secondary" onClick={() => void report.refetch()}>
              Try again
            </Button>
          }
        >
          {report.error.message}
        </Alert>
      )}
      {data && <Report report={data} />}
      {/* The alarm load is the whole facility's last 30 days, whatever the chosen scope and
          period, so it stays off the printed page of the scope's report. */}
      <div className="print:hidden">
        <AlarmLoadSection />
      </div>
    </div>
  );
}

export { AnalyticsPage as Component };
