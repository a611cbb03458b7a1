import { Link } from 'react-router';
import { boardStatusOf, BOARD_LABELS, E10_LABELS, REASON_LABELS } from '@shared/equipment-state';
import { CATEGORY_LABELS, FIX_KIND_LABELS, IMPACT_LABELS } from '@shared/report-options';
import { isOpenStatus } from '@shared/ticket-workflow';
import { WAFER_RECOVERABLE_LABELS, type TicketDetail, type ToolStateView } from '@shared/schemas/tickets';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateBadge } from '@/components/ui/state-badge';
import { buttonClasses } from '@/components/ui/button';
import { HazardChips, PriorityBadge, TicketStatusBadge } from '@/features/tickets/components/ticket-chips';
import { HazardCautions } from '@/components/hazard-cautions';
import { TargetClock } from '@/features/tickets/components/target-clock';
import { TicketTimeline } from '@/features/tickets/components/ticket-timeline';
import { TicketActions } from '@/features/tickets/components/ticket-actions';
import { CommentBox } from '@/features/tickets/components/comment-box';

function StateLine({ s, name, ticketId }: { s: ToolStateView; name: string; ticketId: number }) {
  const status = boardStatusOf(s.state);
  const unconfirmed = s.source === 'user_report' && !s.confirmed;
  return (
    <li className="flex flex-col gap-1" data-testid={s.moduleId ? `module-state-${s.moduleId}` : 'tool-state'}>
      <span className="text-sm font-semibold text-ink">{name}</span>
      <span className="flex flex-wrap items-center gap-2">
        <StateBadge status={status} size="lg" label={unconfirmed ? `${BOARD_LABELS[status]} (reported by a user)` : undefined} />
        <span className="text-sm text-muted">
          <RelativeTime value={s.since} mode="elapsed" prefix="for" />
        </span>
      </span>
      <span className="text-xs text-muted">
        {E10_LABELS[s.state]}
        {s.reason !== 'none' ? ` · ${REASON_LABELS[s.reason]}` : ''}
        {s.ticketId === ticketId ? ' · set by this ticket' : s.ticketId ? ` · set by ticket #${s.ticketId}` : ''}
        {unconfirmed ? ' · not yet confirmed by staff' : ''}
      </span>
      {s.expectedReturnAt && (
        <span className="text-xs text-muted">
          Expected back <RelativeTime value={s.expectedReturnAt} />
        </span>
      )}
    </li>
  );
}

export function TicketView({ ticket }: { ticket: TicketDetail }) {
  const own = ticket.toolStates.find((s) => s.moduleId === null);
  const moduleStates = ticket.toolStates.filter(
    (s) => s.moduleId !== null && (s.moduleId === ticket.module?.id || s.ticketId === ticket.id || boardStatusOf(s.state) !== 'running'),
  );
  const staff = ticket.viewer.role !== 'member';
  const open = isOpenStatus(ticket.status);

  return (
    <div className="flex flex-col gap-6" data-testid="ticket-view" data-ticket-status={ticket.status} data-version={ticket.version}>
      <header className="flex flex-col gap-3">
        <p className="font-mono text-sm text-muted">Ticket #{ticket.id}</p>
        <h1 className="text-2xl font-bold tracking-tight text-ink sm:text-3xl">{ticket.title}</h1>
        <div className="flex flex-wrap items-center gap-2">
          <PriorityBadge priority={ticket.priority} long />
          <TicketStatusBadge status={ticket.status} />
          <HazardChips hazards={ticket.hazards} />
        </div>
        <p className="text-sm text-muted">
          <Link to={`/tools/${encodeURIComponent(ticket.tool.code)}`} className="underline" data-testid="ticket-tool-link">
            <span className="font-mono">{ticket.tool.code}</span> · {ticket.tool.name}
          </Link>
          {ticket.module ? ` · ${ticket.module.name}` : ''}
          {ticket.tool.areaName ? ` · ${ticket.tool.areaName}` : ''} · reported by{' '}
          {ticket.reporter?.name ?? (ticket.events.some((e) => e.kind === 'alarm_reported') ? 'the tool' : 'someone')}{' '}
          <RelativeTime value={ticket.createdAt} />
        </p>
        {ticket.priorityReasons.length > 0 && <p className="text-xs text-muted">Priority because: {ticket.priorityReasons.join('; ')}.</p>}
      </header>

      {ticket.status === 'merged' && ticket.mergedIntoId && (
        <Alert tone="info" title={`Merged into ticket #${ticket.mergedIntoId}`}>
          This report is kept with the ticket it was merged into.{' '}
          <Link to={`/tickets/${ticket.mergedIntoId}`}>Go to #{ticket.mergedIntoId}</Link>.
        </Alert>
      )}

      {ticket.hazards.length > 0 && <HazardCautions hazards={ticket.hazards} />}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="order-2 flex min-w-0 flex-col gap-6 lg:order-1">
          <Card as="section" title="The problem" headingLevel={2}>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2 text-sm">
              <dt className="text-muted">Category</dt>
              <dd>{CATEGORY_LABELS[ticket.category]}</dd>
              <dt className="text-muted">Impact</dt>
              <dd>{IMPACT_LABELS[ticket.impact]}</dd>
              {ticket.alarmText && (
                <>
                  <dt className="text-muted">Alarm text</dt>
                  <dd>
                    <code className="rounded bg-sunken px-1.5 py-0.5 break-all">{ticket.alarmText}</code>
                  </dd>
                </>
              )}
              {ticket.wafersCount > 0 && (
                <>
                  <dt className="text-muted">Wafers inside</dt>
                  <dd>
                    {ticket.wafersCount}
                    {ticket.wafersOwner ? ` · ${ticket.wafersOwner}` : ''}
                    {ticket.wafersRecoverable ? ` · ${WAFER_RECOVERABLE_LABELS[ticket.wafersRecoverable]}` : ''}
                  </dd>
                </>
              )}
              {ticket.fixKind && (
                <>
                  <dt className="text-muted">Recorded as</dt>
                  <dd>
                    {FIX_KIND_LABELS[ticket.fixKind]}
                    {ticket.failureMode ? ` · ${ticket.failureMode}` : ''}
                  </dd>
                </>
              )}
            </dl>
          </Card>

          <Card as="section" title="Timeline" headingLevel={2} description="Every report, reply and change, oldest first.">
            <TicketTimeline ticketId={ticket.id} events={ticket.events} olderEvents={ticket.olderEvents} modules={ticket.modules} />
          </Card>

          {ticket.allowedActions.includes('comment') && (
            <CommentBox ticketId={ticket.id} canNote={ticket.allowedActions.includes('note')} />
          )}
        </div>

        <aside className="order-1 flex flex-col gap-6 lg:order-2">
          <Card as="section" title="Tool state now" headingLevel={2}>
            <ul className="flex flex-col gap-4">
              {own && <StateLine s={own} name={ticket.tool.name} ticketId={ticket.id} />}
              {moduleStates.map((s) => (
                <StateLine
                  key={s.moduleId}
                  s={s}
                  name={ticket.modules.find((m) => m.id === s.moduleId)?.name ?? 'Module'}
                  ticketId={ticket.id}
                />
              ))}
            </ul>
          </Card>

          {(open || ticket.status === 'fixed') && (
            <Card as="section" title="Service targets" headingLevel={2}>
              <div className="flex flex-col items-start gap-2">
                <TargetClock label="Acknowledge" clock={ticket.targets.acknowledge} createdAt={ticket.createdAt} />
                <TargetClock label="Restore" clock={ticket.targets.restore} createdAt={ticket.createdAt} />
              </div>
            </Card>
          )}

          <Card as="section" title="People" headingLevel={2}>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-2 text-sm">
              <dt className="text-muted">Reported by</dt>
              <dd>{ticket.reporter?.name ?? '—'}</dd>
              <dt className="text-muted">Assigned to</dt>
              <dd>{ticket.assignee?.name ?? 'Nobody yet'}</dd>
            </dl>
          </Card>

          <TicketActions ticket={ticket} />

          {ticket.allowedActions.includes('add_report') && !staff && (
            <Link
              to={`/report?tool=${encodeURIComponent(ticket.tool.code)}&to=${ticket.id}`}
              className={buttonClasses({ variant: 'secondary', size: 'lg' })}
            >
              I see it too — add my report
            </Link>
          )}
        </aside>
      </div>
    </div>
  );
}
