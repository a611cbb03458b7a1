import { ALARM_CATEGORY_LABELS, SAFETY_CATEGORIES } from '@shared/alarms';
import type { AlarmOccurrenceView } from '@shared/schemas/alarms';
import { Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { Spinner } from '@/components/ui/spinner';
import { formatDuration } from '@/lib/time';
import { useToolAlarms } from '@/features/alarms/api/get-tool-alarms';
import { useClearAlarm } from '@/features/alarms/api/clear-alarm';
import { ChatteringMark, SafetyMark, StaleMark } from '@/features/alarms/components/alarm-marks';

function AlarmLabel({ o }: { o: AlarmOccurrenceView }) {
  return (
    <span className="min-w-0">
      <span className="font-mono text-sm font-semibold text-ink">{o.alarmId}</span>{' '}
      <span className="font-mono text-sm text-ink">{o.text}</span>
      {o.category !== null && <span className="block text-xs text-muted">{ALARM_CATEGORY_LABELS[o.category]}</span>}
    </span>
  );
}

function ActiveAlarm({ o, staff }: { o: AlarmOccurrenceView; staff: boolean }) {
  const clear = useClearAlarm();
  return (
    <li className="flex flex-col gap-2 border-b border-line py-3 last:border-0" data-testid={`active-alarm-${o.alarmId}`}>
      <div className="flex flex-wrap items-start justify-between gap-2">
        <AlarmLabel o={o} />
        <span className="flex flex-wrap gap-1">
          {o.category !== null && SAFETY_CATEGORIES.includes(o.category) && <SafetyMark />}
          {o.chattering && <ChatteringMark />}
          {o.stale && <StaleMark />}
        </span>
      </div>
      <p className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm text-muted">
        <RelativeTime value={o.setAt} mode="elapsed" prefix="set for" />
        {o.ticketId && <Link to={`/tickets/${o.ticketId}`}>Ticket #{o.ticketId}</Link>}
        {staff && (
          <Button variant="secondary" size="md" busy={clear.isPending} onClick={() => clear.mutate(o.id)}>
            Clear by hand
          </Button>
        )}
      </p>
    </li>
  );
}

/** Alarms the tool reports: what is set now, the last 30 days, and the most frequent ones. */
export function ToolAlarmsPanel({ code, staff }: { code: string; staff: boolean }) {
  const alarms = useToolAlarms(code);
  if (alarms.isPending)
    return (
      <Card as="section" title="Alarms from the tool">
        <Spinner label="Loading alarms…" />
      </Card>
    );
  if (alarms.isError)
    return (
      <Card as="section" title="Alarms from the tool">
        <Alert tone="warning">The alarms could not be loaded: {alarms.error.message}</Alert>
      </Card>
    );
  const a = alarms.data;
  const cleared = a.history.filter((o) => o.clearedAt);
  return (
    <Card
      as="section"
      title="Alarms from the tool"
      description="What the tool itself reports. Faultline records alarms; it does not replace the tool’s interlocks or the facility’s alarm systems."
      data-testid="tool-alarms"
    >
      {a.flood && (
        <Alert tone="warning" className="mb-3" title="Alarm flood">
          More than 10 alarms in 10 minutes since <RelativeTime value={a.flood.since} />. Alarms are recorded; notices are held until it
          calms down.
        </Alert>
      )}
      {a.chatteringAlarms.length > 0 && (
        <p className="mb-3 flex flex-wrap items-center gap-2 text-sm text-ink" data-testid="chattering-alarms">
          <ChatteringMark />{' '}
          <span>
            Alarm {a.chatteringAlarms.join(', ')} set and cleared again and again; its notices are held until it stays clear for 10 minutes.
          </span>
        </p>
      )}
      <h3 className="text-sm font-semibold text-ink">Set now</h3>
      {a.active.length === 0 ? (
        <p className="py-2 text-sm text-muted">No alarm is set.</p>
      ) : (
        <ul data-testid="active-alarms">
          {a.active.map((o) => (
            <ActiveAlarm key={o.id} o={o} staff={staff} />
          ))}
        </ul>
      )}

      {a.frequent.length > 0 && (
        <>
          <h3 className="mt-4 text-sm font-semibold text-ink">Most frequent, last 30 days</h3>
          <ol className="mt-1 flex flex-col gap-1 text-sm" data-testid="frequent-alarms">
            {a.frequent.map((f) => (
              <li key={f.alarmId} className="flex justify-between gap-3">
                <span className="min-w-0 truncate font-mono">
                  {f.alarmId} {f.text}
                </span>
                <span className="tabular-nums text-muted">{f.count}×</span>
              </li>
            ))}
          </ol>
        </>
      )}

      <details className="mt-4">
        <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-accent">
          History, last 30 days ({a.historyTotal} {a.historyTotal === 1 ? 'alarm' : 'alarms'})
        </summary>
        <ul className="text-sm">
          {cleared.slice(0, 50).map((o) => (
            <li key={o.id} className="flex flex-wrap justify-between gap-x-3 border-b border-line py-1.5 last:border-0">
              <span className="min-w-0 font-mono">
                {o.alarmId} {o.text} {o.chattering && <ChatteringMark className="ml-1" />}
              </span>
              <span className="tabular-nums text-muted">
                <RelativeTime value={o.setAt} /> · {formatDuration(new Date(o.clearedAt!).getTime() - new Date(o.setAt).getTime())}
                {o.clearedBy === 'person' ? ' · cleared by hand' : ''}
              </span>
            </li>
          ))}
        </ul>
      </details>
    </Card>
  );
}
