import { useState, type FormEvent } from 'react';
import { PRIORITY_LABELS, TARGET_WARNING_FRACTION } from '@shared/priority';
import { serviceTargetInputSchema, type ServiceTargetView } from '@shared/schemas/tickets';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextField } from '@/components/ui/text-field';
import { PageSpinner } from '@/components/ui/spinner';
import { formatDuration } from '@/lib/time';
import { useServiceTargets } from '@/features/tickets/api/get-service-targets';
import { useUpdateServiceTarget } from '@/features/tickets/api/update-service-target';
import { PriorityBadge } from '@/features/tickets/components/ticket-chips';

// Targets are kept in minutes; people think of them in minutes, hours or days.
const UNITS = { minutes: 1, hours: 60, days: 24 * 60 } as const;
type Unit = keyof typeof UNITS;

/** The largest unit that states the minutes exactly (10 days, not 14,400 minutes). */
function inBestUnit(minutes: number): Duration {
  const unit: Unit = minutes % UNITS.days === 0 ? 'days' : minutes % UNITS.hours === 0 ? 'hours' : 'minutes';
  return { amount: String(minutes / UNITS[unit]), unit };
}
interface Duration {
  amount: string;
  unit: Unit;
}
/** Whole minutes, or NaN for an amount that is not a number (the schema then says so). */
const toMinutes = (d: Duration) => (d.amount.trim() === '' ? NaN : Math.round(Number(d.amount) * UNITS[d.unit]));

function DurationField({
  label,
  value,
  onChange,
  errors,
}: {
  label: string;
  value: Duration;
  onChange: (d: Duration) => void;
  errors?: string[];
}) {
  const minutes = toMinutes(value);
  return (
    <div className="flex items-end gap-2">
      <TextField
        className="flex-1"
        label={label}
        hint={Number.isFinite(minutes) ? formatDuration(minutes * 60_000) : undefined}
        type="number"
        inputMode="decimal"
        min={0}
        step="any"
        value={value.amount}
        onChange={(e) => onChange({ ...value, amount: e.target.value })}
        errors={errors}
      />
      <select
        aria-label={`${label}: unit`}
        value={value.unit}
        onChange={(e) => onChange({ ...value, unit: e.target.value as Unit })}
        className="mb-px min-h-11 rounded-lg border border-control bg-card px-2 text-base text-ink amber:border-2"
      >
        {(Object.keys(UNITS) as Unit[]).map((u) => (
          <option key={u} value={u}>
            {u}
          </option>
        ))}
      </select>
    </div>
  );
}

function Row({ target }: { target: ServiceTargetView }) {
  const [ack, setAck] = useState(() => inBestUnit(target.acknowledgeMinutes));
  const [restore, setRestore] = useState(() => inBestUnit(target.restoreMinutes));
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const update = useUpdateServiceTarget();
  const dirty = toMinutes(ack) !== target.acknowledgeMinutes || toMinutes(restore) !== target.restoreMinutes;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = serviceTargetInputSchema.safeParse({ acknowledgeMinutes: toMinutes(ack), restoreMinutes: toMinutes(restore) });
    if (!parsed.success) {
      const f: Record<string, string[]> = {};
      for (const i of parsed.error.issues) (f[String(i.path[0] ?? '')] ??= []).push(i.message);
      setErrors(f);
      return;
    }
    setErrors({});
    update.mutate({ priority: target.priority, input: parsed.data });
  };

  return (
    <form
      onSubmit={submit}
      className="flex flex-col gap-3 border-b border-line py-4 last:border-b-0"
      aria-label={`Targets for ${PRIORITY_LABELS[target.priority]}`}
    >
      <div className="flex items-center gap-2">
        <PriorityBadge priority={target.priority} long />
      </div>
      <div className="grid items-start gap-3 sm:grid-cols-[1fr_1fr_auto]">
        <DurationField label="Acknowledge within" value={ack} onChange={setAck} errors={errors.acknowledgeMinutes} />
        <DurationField label="Restore within" value={restore} onChange={setRestore} errors={errors.restoreMinutes} />
        <Button type="submit" className="sm:mt-7" disabled={!dirty} busy={update.isPending}>
          Save {target.priority}
        </Button>
      </div>
      {update.isError && (
        <Alert tone="danger" live>
          {update.error.message}
        </Alert>
      )}
      {update.isSuccess && !dirty && <p className="text-sm text-alert-success-ink">Saved. Open tickets’ timers use the new targets.</p>}
    </form>
  );
}

export function ServiceTargetsEditor() {
  const targets = useServiceTargets();
  if (targets.isPending) return <PageSpinner label="Loading the targets…" />;
  if (targets.isError)
    return (
      <Alert tone="danger" live title="The targets could not be loaded">
        {targets.error.message}
      </Alert>
    );
  return (
    <Card
      as="section"
      title="Targets per priority"
      description={`Clock time from the report. A timer turns to a warning at ${Math.round(TARGET_WARNING_FRACTION * 100)} % of its target and counts as missed after it.`}
    >
      {targets.data.map((t) => (
        <Row key={`${t.priority}-${t.updatedAt}`} target={t} />
      ))}
    </Card>
  );
}
