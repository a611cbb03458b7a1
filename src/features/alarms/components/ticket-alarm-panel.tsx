import { Link } from 'react-router';
import { ALARM_CATEGORY_LABELS } from '@shared/alarms';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { formatExact } from '@/lib/time';
import { useTicketAlarm } from '@/features/alarms/api/get-ticket-alarm';
import { ChatteringMark } from '@/features/alarms/components/alarm-marks';

/** On a ticket opened by a tool's alarm: how often that alarm set, and the tickets it made before. */
export function TicketAlarmPanel({ ticketId, enabled }: { ticketId: number; enabled: boolean }) {
  const q = useTicketAlarm(ticketId, enabled);
  const a = q.data?.alarm;
  if (!a) return null;
  const earlier = a.earlierTickets.length;
  return (
    <Card as="section" title="The tool’s alarm" data-testid="ticket-alarm">
      <p className="font-mono text-sm font-semibold text-ink">
        {a.alarmId} {a.text}
      </p>
      {a.category !== null && <p className="text-xs text-muted">{ALARM_CATEGORY_LABELS[a.category]}</p>}
      <p className="mt-2 flex flex-wrap items-center gap-2 text-sm text-ink">
        {a.count > 1 ? (
          <span data-testid="ticket-alarm-count">
            Set {a.count} times on this ticket since {formatExact(new Date(a.firstSetAt))}
          </span>
        ) : (
          <span data-testid="ticket-alarm-count">Set once for this ticket</span>
        )}
        {a.active ? (
          <span className="font-semibold">· set now</span>
        ) : (
          <span className="text-muted">· cleared (the tool returns to service only when a person says so)</span>
        )}
        {a.chattering && <ChatteringMark />}
      </p>
      <p className="mt-2 text-sm text-ink" data-testid="ticket-alarm-history">
        This alarm has set {a.setsIn90Days} {a.setsIn90Days === 1 ? 'time' : 'times'} on this tool in 90 days; {earlier} earlier{' '}
        {earlier === 1 ? 'ticket' : 'tickets'}
        {earlier > 0 && ': '}
        {a.earlierTickets.slice(0, 10).map((id, i) => (
          <span key={id}>
            {i > 0 && ', '}
            <Link to={`/tickets/${id}`}>#{id}</Link>
          </span>
        ))}
        .
      </p>
      <details className="mt-3">
        <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-accent">
          Its sets in the last 90 days
        </summary>
        <ul className="text-sm">
          {a.occurrences.slice(0, 30).map((o) => (
            <li key={o.id} className="flex flex-wrap justify-between gap-x-3 border-b border-line py-1 last:border-0">
              <RelativeTime value={o.setAt} />
              <span className="text-muted">
                {o.clearedAt ? 'cleared' : 'set now'}
                {o.ticketId && o.ticketId !== ticketId ? (
                  <>
                    {' · '}
                    <Link to={`/tickets/${o.ticketId}`}>#{o.ticketId}</Link>
                  </>
                ) : null}
              </span>
            </li>
          ))}
        </ul>
      </details>
    </Card>
  );
}
