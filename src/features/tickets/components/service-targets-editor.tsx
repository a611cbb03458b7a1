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

function Row({ target }: { target: ServiceTargetView }) {
  const [ack, setAck] = useState(String(target.acknowledgeMinutes));
  const [restore, setRestore] = useState(String(target.restoreMinutes));
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const update = useUpdateServiceTarget();
  const dirty = ack !== String(target.acknowledgeMinutes) || restore !== String(target.restoreMinutes);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = serviceTargetInputSchema.safeParse({ acknowledgeMinutes: Number(ack), restoreMinutes: Number(restore) });
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
        <TextField
          label="Acknowledge within (minutes)"
          hint={formatDuration(Number(ack) * 60_000)}
          type="number"
          inputMode="numeric"
          min={1}
          value={ack}
          onChange={(e) => setAck(e.target.value)}
          errors={errors.acknowledgeMinutes}
        />
        <TextField
          label="Restore within (minutes)"
          hint={formatDuration(Number(restore) * 60_000)}
          type="number"
          inputMode="numeric"
          min={1}
          value={restore}
          onChange={(e) => setRestore(e.target.value)}
          errors={errors.restoreMinutes}
        />
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
