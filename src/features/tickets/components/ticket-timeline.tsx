import { useState, type ReactNode } from 'react';
import { stateWords, type E10State, type StateReason } from '@shared/equipment-state';
import {
  CATEGORY_LABELS,
  FIX_KIND_LABELS,
  HAZARD_LABELS,
  IMPACT_LABELS,
  WAIT_REASON_LABELS,
  type FixKind,
  type Hazard,
  type Impact,
  type TicketCategory,
  type WaitReason,
} from '@shared/report-options';
import { STATUS_LABELS, type TicketStatus } from '@shared/ticket-workflow';
import { WAFER_RECOVERABLE_LABELS, type TicketEventView, type WaferRecoverable } from '@shared/schemas/tickets';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateName } from '@/components/ui/state-name';
import { cx } from '@/lib/cx';
import { useOlderTicketEvents } from '@/features/tickets/api/get-ticket-events';

type Data = Record<string, any>;

interface ModuleName {
  id: number;
  name: string;
}

function who(e: TicketEventView) {
  return e.actor?.name ?? 'Faultline';
}

function StateWord({ state, reason }: { state: E10State; reason?: StateReason }) {
  return <StateName state={state} reason={reason} />;
}

/** Label–value pairs under an event; nothing when there are none. */
function FactList({ rows }: { rows: [string, ReactNode][] }) {
  if (rows.length === 0) return null;
  return (
    <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-muted">{k}</dt>
          <dd className="text-ink">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function Facts({ data }: { data: Data }) {
  const rows: [string, ReactNode][] = [];
  if (data.category) rows.push(['Category', CATEGORY_LABELS[data.category as TicketCategory] ?? data.category]);
  if (data.impact) rows.push(['Impact', IMPACT_LABELS[data.impact as Impact]]);
  if (data.alarmText)
    rows.push([
      'Alarm text',
      <code key="a" className="rounded bg-sunken px-1.5 py-0.5 text-sm break-all">
        {data.alarmText}
      </code>,
    ]);
  if (Array.isArray(data.hazards) && data.hazards.length)
    rows.push(['Hazard', data.hazards.map((h: Hazard) => HAZARD_LABELS[h]).join(', ')]);
  if (data.wafersCount > 0) {
    const extra = [data.wafersOwner, data.wafersRecoverable ? WAFER_RECOVERABLE_LABELS[data.wafersRecoverable as WaferRecoverable] : null]
      .filter(Boolean)
      .join(' · ');
    rows.push(['Wafers left inside', `${data.wafersCount}${extra ? ` (${extra})` : ''}`]);
  }
  return <FactList rows={rows} />;
}

function FixFacts({ data }: { data: Data }) {
  const rows: [string, ReactNode][] = [];
  if (data.fixKind) rows.push(['Recorded as', FIX_KIND_LABELS[data.fixKind as FixKind]]);
  if (data.failureMode) rows.push(['Failure mode', data.failureMode]);
  if (data.cause) rows.push(['Cause', data.cause]);
  if (data.partsUsed) rows.push(['Parts used', data.partsUsed]);
  if (data.handsOnMinutes != null) rows.push(['Hands-on time', `${data.handsOnMinutes} min`]);
  if (data.wafersRecovered != null) rows.push(['Wafers recovered', String(data.wafersRecovered)]);
  if (data.wafersReturned != null) rows.push(['Wafers returned', String(data.wafersReturned)]);
  return <FactList rows={rows} />;
}

function headline(e: TicketEventView, modules: ModuleName[]): ReactNode {
  const d = (e.data ?? {}) as Data;
  const target = d.moduleId ? (modules.find((m) => m.id === d.moduleId)?.name ?? 'A module') : 'The tool';
  switch (e.kind) {
    case 'reported':
      return `${who(e)} reported the problem`;
    case 'added_report':
      return `${who(e)} saw it too and added a report`;
    case 'reply':
      return `${who(e)} replied`;
    case 'note':
      return `Internal note by ${who(e)}`;
    case 'status': {
      const to = STATUS_LABELS[d.to as TicketStatus] ?? d.to;
      if (d.action === 'reopen') return `${who(e)} reopened the ticket`;
      if (d.action === 'merge') return `${who(e)} merged this ticket into #${d.targetId}`;
      if (d.action === 'wait') return `${who(e)} set it waiting: ${WAIT_REASON_LABELS[d.waitReason as WaitReason] ?? ''}`;
      return `${who(e)} moved it to ${to}`;
    }
    case 'priority':
      return `${who(e)} changed the priority from ${d.from} to ${d.to}`;
    case 'assignment':
      if (!d.to) return `${who(e)} removed the assignee`;
      return d.automatic ? `Assigned to ${d.to.name}` : `${who(e)} assigned it to ${d.to.name}`;
    case 'tool_state':
      return (
        <span className="inline-flex flex-wrap items-center gap-x-2 gap-y-1">
          <span>
            {e.actor ? `${who(e)}: ` : ''}
            {target} went to
          </span>
          <StateWord state={d.to.state} reason={d.to.reason} />
          {d.source === 'user_report' && !d.confirmed && <span className="text-muted">(reported by a user, not yet confirmed)</span>}
        </span>
      );
    case 'tool_state_unchanged':
      return `${target} was already down; its state was left as it was`;
    case 'down_confirmed':
      return `${who(e)} confirmed the reported Down`;
    case 'facts_changed':
      return `The ticket now stands at ${d.to?.priority} (${IMPACT_LABELS[d.to?.impact as Impact] ?? ''})`;
    case 'alarm_reported':
      return `Reported by the tool: alarm ${d.alarmId}`;
    case 'alarm_repeat':
      return `Alarm ${d.alarmId} set again: ${d.count} times since ${new Date(d.since).toLocaleString()}${d.chattering ? ' (chattering)' : ''}`;
    case 'alarm_cleared':
      return d.by === 'person'
        ? `${who(e)} cleared alarm ${d.alarmId} by hand`
        : `Alarm ${d.alarmId} cleared on the tool (the tool is not returned to service by this)`;
    case 'merged_from':
      return `${who(e)} merged ticket #${d.sourceId} into this one`;
    case 'return_proof':
      return d.kind === 'override'
        ? `${who(e)} returned the tool to service by manager's override, without a passing requalification record`
        : `${who(e)} returned the tool to service with a passing requalification record`;
    default:
      return e.kind.replace(/_/g, ' ');
  }
}

function dotFor(kind: string, internal: boolean) {
  if (internal) return 'border-dashed border-ink bg-card';
  if (kind === 'reported' || kind === 'added_report') return 'border-accent bg-accent';
  if (kind === 'tool_state') return 'border-ink bg-card';
  return 'border-control bg-card';
}

export interface TicketTimelineProps {
  ticketId: number;
  /** The newest events, oldest first (a long timeline arrives a page at a time). */
  events: TicketEventView[];
  /** How many events come before the first one in `events`. */
  olderEvents: number;
  modules: ModuleName[];
}

/**
 * The whole story of a ticket, oldest first: who did what, when, and what changed. A long
 * timeline starts with its newest events; "Show older events" loads the earlier ones above.
 */
export function TicketTimeline({ ticketId, events, olderEvents, modules }: TicketTimelineProps) {
  const [asked, setAsked] = useState(false);
  const firstShownId = events[0]?.id ?? 0;
  const older = useOlderTicketEvents(ticketId, firstShownId, asked && olderEvents > 0);
  const pages = older.data?.pages ?? [];
  const loaded = [...pages].reverse().flatMap((p) => p.events);
  const remaining = pages.length > 0 ? pages[pages.length - 1].olderEvents : olderEvents;
  const all = loaded.length > 0 ? [...loaded, ...events] : events;
  const showOlder = () => {
    if (!asked) setAsked(true);
    else void older.fetchNextPage();
  };
  return (
    <div className="flex flex-col gap-3">
      {remaining > 0 && (
        <div className="flex flex-wrap items-center gap-3" data-testid="older-events">
          <Button variant="secondary" onClick={showOlder} disabled={older.isFetching}>
            {older.isFetching ? 'Loading older events…' : `Show ${remaining} older event${remaining === 1 ? '' : 's'}`}
          </Button>
          {older.isError && (
            <span role="alert" className="text-sm text-danger">
              The older events could not be loaded. Try again.
            </span>
          )}
        </div>
      )}
      <EventList events={all} modules={modules} />
    </div>
  );
}

/** The events as a list; the print sheet shows them with the photos loaded at once. */
export function EventList({ events, modules, eager = false }: { events: TicketEventView[]; modules: ModuleName[]; eager?: boolean }) {
  return (
    <ol className="relative flex flex-col gap-0" aria-label="Timeline" data-testid="timeline">
      {events.map((e, i) => {
        const d = (e.data ?? {}) as Data;
        const last = i === events.length - 1;
        return (
          <li key={e.id} data-event-kind={e.kind} className="relative flex gap-3 pb-5">
            <span className="relative flex w-4 shrink-0 justify-center" aria-hidden="true">
              <span className={cx('mt-1.5 size-3 rounded-full border-2', dotFor(e.kind, e.internal))} />
              {!last && <span className="absolute top-5 bottom-[-0.25rem] w-px bg-line" />}
            </span>
            <div className={cx('min-w-0 flex-1', e.internal && 'rounded-lg border-2 border-dashed border-control bg-sunken p-3')}>
              <p className="flex flex-wrap items-baseline gap-x-2 text-sm">
                {e.internal && <span className="rounded bg-ink px-1.5 py-0.5 text-xs font-bold text-card uppercase">Staff only</span>}
                <span className="font-semibold text-ink">{headline(e, modules)}</span>
                <span className="text-xs text-muted">
                  <RelativeTime value={e.createdAt} />
                </span>
                {e.fromTicketId && <span className="font-mono text-xs text-muted">from #{e.fromTicketId}</span>}
              </p>
              {e.body && <p className="mt-1 text-sm whitespace-pre-wrap text-ink">{e.body}</p>}
              {(e.kind === 'reported' || e.kind === 'added_report') && <Facts data={d} />}
              {e.kind === 'status' && d.action === 'fix' && <FixFacts data={d} />}
              {e.kind === 'priority' && null}
              {e.photos.length > 0 && (
                <ul className="mt-2 flex flex-wrap gap-2" aria-label="Photos">
                  {e.photos.map((p, n) => (
                    <li key={p.id}>
                      <a href={p.url} target="_blank" rel="noreferrer" className="block overflow-hidden rounded-lg border border-line">
                        <img
                          src={p.thumbUrl}
                          alt={`Photo ${n + 1} from ${p.uploader?.name ?? 'the reporter'}`}
                          width={Math.round((p.width / Math.max(p.width, p.height)) * 112)}
                          height={Math.round((p.height / Math.max(p.width, p.height)) * 112)}
                          className="h-28 w-auto object-cover"
                          loading={eager ? 'eager' : 'lazy'}
                        />
                      </a>
                    </li>
                  ))}
                </ul>
              )}
              {/* The expected return belongs to the new state, so it never sits on the "Before" line. */}
              {e.kind === 'tool_state' && d.expectedReturnAt && (
                <p className="mt-1 text-sm text-ink" data-testid="expected-back">
                  Expected back <RelativeTime value={d.expectedReturnAt} />
                </p>
              )}
              {e.kind === 'tool_state' && d.from && (
                <p className="mt-1 text-xs text-muted" data-testid="state-before">
                  Before: {stateWords(d.from.state as E10State)}
                </p>
              )}
            </div>
          </li>
        );
      })}
    </ol>
  );
}
