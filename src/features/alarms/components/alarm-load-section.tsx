import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useAlarmLoad, type AlarmLoad, type AlarmLoadFigures } from '@/features/alarms/api/get-alarm-load';

const n1 = (v: number) => v.toLocaleString(undefined, { maximumFractionDigits: 1 });
const n2 = (v: number) => v.toLocaleString(undefined, { maximumFractionDigits: 2 });

function Verdict({ ok }: { ok: boolean }) {
  return (
    <span className="inline-flex items-center gap-1 text-xs font-semibold" data-ok={ok}>
      <span aria-hidden="true">{ok ? '●' : '▲'}</span>
      {ok ? 'within the target' : 'above the target'}
    </span>
  );
}

/** One figure against its common-practice target, with a plain sentence on what the target means. */
function Figure({ label, value, ok, meaning }: { label: string; value: string; ok: boolean; meaning: string }) {
  return (
    <div className="flex flex-col gap-1 rounded-lg border border-line p-3">
      <span className="text-sm text-muted">{label}</span>
      <span className="text-2xl font-semibold tabular-nums text-ink">{value}</span>
      <Verdict ok={ok} />
      <p className="text-xs text-muted">{meaning}</p>
    </div>
  );
}

function FacilityFigures({ f, t }: { f: AlarmLoadFigures; t: AlarmLoad['targets'] }) {
  return (
    <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3" data-testid="alarm-load-figures">
      <Figure
        label="Alarms per day"
        value={n1(f.perDay)}
        ok={f.perDay <= t.acceptablePerDay}
        meaning={`About ${t.acceptablePerDay} a day (one per 10 minutes) is what one person can act on; ${t.manageablePerDay} a day is the most that stays manageable.`}
      />
      <Figure
        label="Alarms per 10 minutes"
        value={n2(f.per10Min)}
        ok={f.per10Min <= 1}
        meaning="One alarm per 10 minutes on average leaves time to respond to each one."
      />
      <Figure
        label="10-minute periods in flood"
        value={`${n2(f.floodPct)} %`}
        ok={f.floodPct < t.floodPctMax}
        meaning={`A flood is more than 10 alarms in 10 minutes, when people stop reading them; keep it under ${t.floodPctMax} % of the time.`}
      />
      <Figure
        label="Chattering alarms"
        value={String(f.chattering)}
        ok={f.chattering <= t.chatteringMax}
        meaning="An alarm that sets three or more times in a minute teaches people to ignore it; the aim is none."
      />
      <Figure
        label="Stale alarms (set over 24 h)"
        value={String(f.stale)}
        ok={f.stale <= t.staleMax}
        meaning="An alarm left standing for a day is no longer news; fix the cause or change the alarm."
      />
      <Figure
        label="Share of the ten most frequent"
        value={`${n1(f.topTenSharePct)} %`}
        ok={f.topTenSharePct <= t.topTenSharePctMax}
        meaning="When a few alarms make most of the noise, fixing those few quiets the desk the most."
      />
    </div>
  );
}

/** Alarm load for the facility and per tool over the last 30 days (managers). */
export function AlarmLoadSection() {
  const load = useAlarmLoad({});
  return (
    <Card
      as="section"
      title="Alarm load, last 30 days"
      description="Alarms the tools reported, against common practice in alarm management (ISA-18.2 / IEC 62682 guidance, as targets, not rules)."
      data-testid="alarm-load"
    >
      {load.isPending && <Spinner label="Counting alarms…" />}
      {load.isError && <Alert tone="warning">The alarm load could not be loaded: {load.error.message}</Alert>}
      {load.data && (
        <>
          <p className="mb-3 text-sm text-ink" data-testid="alarm-load-count">
            {load.data.facility.count.toLocaleString()} alarms from {load.data.tools.length} tools.
          </p>
          <FacilityFigures f={load.data.facility} t={load.data.targets} />
          <div className="mt-4 overflow-x-auto" tabIndex={0} role="region" aria-label="Alarm load per tool (scrolls sideways)">
            <table className="w-full border-collapse text-left text-sm" data-testid="alarm-load-tools">
              <caption className="sr-only">Alarm load per tool</caption>
              <thead className="border-y border-line text-xs font-semibold text-muted">
                <tr>
                  <th scope="col" className="px-2 py-2">
                    Tool
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    Alarms
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    Per day
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    In flood
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    Chattering
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    Stale
                  </th>
                  <th scope="col" className="px-2 py-2 text-right">
                    Top ten share
                  </th>
                </tr>
              </thead>
              <tbody>
                {load.data.tools.slice(0, 20).map((r) => (
                  <tr key={r.toolId} className="border-b border-line">
                    <td className="px-2 py-1.5">
                      <span className="font-mono">{r.toolCode}</span> <span className="text-muted">{r.toolName}</span>
                    </td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{r.count}</td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{n1(r.perDay)}</td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{n2(r.floodPct)} %</td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{r.chattering}</td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{r.stale}</td>
                    <td className="px-2 py-1.5 text-right tabular-nums">{n1(r.topTenSharePct)} %</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {load.data.topTen.length > 0 && (
            <details className="mt-3">
              <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-accent">
                The ten most frequent alarms
              </summary>
              <ol className="text-sm">
                {load.data.topTen.map((a) => (
                  <li key={`${a.toolCode}-${a.alarmId}`} className="flex justify-between gap-3 border-b border-line py-1">
                    <span className="min-w-0 truncate font-mono">
                      {a.toolCode} {a.alarmId} {a.text}
                    </span>
                    <span className="tabular-nums text-muted">
                      {a.count} · {n1(a.sharePct)} %
                    </span>
                  </li>
                ))}
              </ol>
            </details>
          )}
        </>
      )}
    </Card>
  );
}
