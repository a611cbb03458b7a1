import { Link } from 'react-router';
import { WORK_ORDER_STATUS_LABELS } from '@shared/schemas/maintenance';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { formatWindow } from '@/lib/maintenance-window';
import { useOverview } from '@/features/maintenance/api/get-overview';
import { usePlans } from '@/features/maintenance/api/get-plans';
import { PlanForm } from '@/features/maintenance/components/plan-form';
import { PlanEdit } from '@/features/maintenance/components/plan-edit';
import { useState } from 'react';

/** /maintenance — what is coming (open work orders, soonest first), what is overdue, and the plans. */
export function MaintenancePage() {
  const overview = useOverview();
  const plans = usePlans();
  const [editing, setEditing] = useState<number | null>(null);
  return (
    <>
      <title>Maintenance · Faultline</title>
      <PageHeader
        title="Maintenance"
        description="Work orders made by the plans ahead of their due dates, booked downtime windows, and plans past due."
        actions={
          <>
            <Link to="/maintenance/parts" className={buttonClasses({ variant: 'secondary' })}>
              Parts list
            </Link>
            <Link to="/calendar-feeds" className={buttonClasses({ variant: 'secondary' })}>
              Calendar feeds
            </Link>
          </>
        }
      />
      {overview.isPending && <PageSpinner label="Loading maintenance…" />}
      {overview.isError && (
        <Alert
          tone="danger"
          title="Maintenance could not be loaded"
          actions={<Button onClick={() => void overview.refetch()}>Try again</Button>}
        >
          {overview.error.message}
        </Alert>
      )}
      {overview.data && (
        <div className="flex flex-col gap-6">
          <Card
            as="section"
            title={`Overdue now (${overview.data.overdue.length})`}
            description="Past the due date or counter reading; “past grace” also past the grace window."
          >
            {overview.data.overdue.length === 0 ? (
              <p className="px-5 pb-5 text-sm text-muted">No plan is overdue.</p>
            ) : (
              <ul className="flex flex-col divide-y divide-line px-5 pb-3" data-testid="overdue-list">
                {overview.data.overdue.map((o) => (
                  <li key={o.planId} className="flex flex-wrap justify-between gap-2 py-2 text-sm">
                    <span>
                      <Link to={`/tools/${encodeURIComponent(o.toolCode)}`} className="font-semibold">
                        {o.toolName}
                      </Link>{' '}
                      — {o.title}
                    </span>
                    <span className={o.pastGrace ? 'font-bold text-alert-danger-ink' : 'text-ink'}>
                      {o.pastGrace ? '▲ past grace · ' : ''}
                      {o.dueAt ? `due ${new Date(o.dueAt).toLocaleDateString()}` : `due at ${o.dueAtCounter} (now ${o.counterNow})`}
                    </span>
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Card as="section" title={`Open work orders (${overview.data.open.length})`} flush>
            {overview.data.open.length === 0 ? (
              <p className="px-5 pb-5 text-sm text-muted">Nothing open.</p>
            ) : (
              <ul className="flex flex-col divide-y divide-line" data-testid="open-work-orders">
                {overview.data.open.map((o) => (
                  <li key={o.id}>
                    <Link
                      to={`/maintenance/work-orders/${o.id}`}
                      className="flex min-h-11 flex-wrap items-center justify-between gap-2 px-5 py-3 text-ink no-underline hover:bg-sunken"
                    >
                      <span>
                        <span className="font-semibold">{o.toolName}</span>{' '}
                        <span className="font-mono text-xs text-muted">{o.toolCode}</span>
                        <span className="block text-sm">{o.title}</span>
                      </span>
                      <span className="text-right text-sm">
                        <span className="block font-semibold">{WORK_ORDER_STATUS_LABELS[o.status]}</span>
                        {o.startsAt && o.endsAt ? (
                          <span className="block">{formatWindow(o.startsAt, o.endsAt)}</span>
                        ) : (
                          o.dueAt && (
                            <span className={o.late ? 'block font-semibold text-alert-danger-ink' : 'block text-muted'}>
                              {o.late ? '▲ late, was due ' : 'due '}
                              {new Date(o.dueAt).toLocaleDateString()}
                            </span>
                          )
                        )}
                      </span>
                    </Link>
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Card as="section" title="New plan">
            <PlanForm />
          </Card>
          <Card as="section" title={`Plans (${plans.data?.total ?? '…'})`} flush>
            <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Plans (scrolls sideways)">
              <table className="w-full text-sm">
                <caption className="sr-only">Maintenance plans with their next due point</caption>
                <thead>
                  <tr className="border-b border-line text-left text-muted">
                    <th className="px-5 py-2">Plan</th>
                    <th className="px-2 py-2">Every</th>
                    <th className="px-2 py-2">Last done</th>
                    <th className="px-5 py-2">Next due</th>
                    <th className="px-5 py-2">
                      <span className="sr-only">Edit</span>
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {plans.data?.items.map((p) => (
                    <tr key={p.id} className="border-b border-line">
                      <td className="px-5 py-2">{p.title}</td>
                      <td className="px-2 py-2">
                        {[p.everyDays && `${p.everyDays} d`, p.everyUnits && `${p.everyUnits} ${p.counterName}`]
                          .filter(Boolean)
                          .join(' or ')}
                      </td>
                      <td className="px-2 py-2">{p.lastDoneAt ? new Date(p.lastDoneAt).toLocaleDateString() : '—'}</td>
                      <td className={`px-5 py-2 ${p.overdue ? 'font-semibold text-alert-danger-ink' : ''}`}>
                        {p.overdue && '▲ '}
                        {[
                          p.due.dueAt && new Date(p.due.dueAt).toLocaleDateString(),
                          p.due.dueAtCounter !== null &&
                            `at ${p.due.dueAtCounter}${p.due.usedPct !== null ? ` (${p.due.usedPct.toFixed(0)} % used)` : ''}`,
                        ]
                          .filter(Boolean)
                          .join(' or ')}
                      </td>
                      <td className="px-5 py-2">
                        {editing === p.id ? (
                          <PlanEdit plan={p} onDone={() => setEditing(null)} />
                        ) : (
                          <Button variant="ghost" onClick={() => setEditing(p.id)}>
                            Edit
                          </Button>
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </Card>
        </div>
      )}
    </>
  );
}

export const Component = MaintenancePage;
