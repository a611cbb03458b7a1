import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useUpdatePlan } from '@/features/maintenance/api/update-plan';
import type { PlanView } from '@/features/maintenance/api/types';

/** Inline editing of a plan's interval, lead, grace and duration; every change is recorded. */
export function PlanEdit({ plan, onDone }: { plan: PlanView; onDone: () => void }) {
  const update = useUpdatePlan(plan.id);
  const [f, setF] = useState({
    everyDays: plan.everyDays?.toString() ?? '',
    everyUnits: plan.everyUnits?.toString() ?? '',
    graceFactor: String(plan.graceFactor),
    estimatedMinutes: String(plan.estimatedMinutes),
  });
  const fields = isApiError(update.error) ? (update.error.fields ?? {}) : {};
  const num = (v: string) => (v.trim() === '' ? null : Number(v));
  const input = 'min-h-11 w-24 rounded-lg border border-control bg-card px-2 font-normal';
  const box = (k: keyof typeof f, label: string) => (
    <label className="flex flex-col gap-1 text-xs font-semibold">
      {label}
      <input value={f[k]} onChange={(e) => setF({ ...f, [k]: e.target.value })} className={input} aria-invalid={Boolean(fields[k])} />
      {fields[k] && <span className="font-medium text-alert-danger-ink">{fields[k].join(' ')}</span>}
    </label>
  );
  return (
    <div className="flex flex-wrap items-end gap-3 py-2">
      {box('everyDays', 'Every N days')}
      {plan.counterName && box('everyUnits', `Every N ${plan.counterName}`)}
      {box('graceFactor', 'Grace factor')}
      {box('estimatedMinutes', 'Minutes')}
      <Button
        busy={update.isPending}
        onClick={() =>
          update.mutate(
            {
              version: plan.version,
              everyDays: num(f.everyDays),
              ...(plan.counterName ? { everyUnits: num(f.everyUnits) } : {}),
              graceFactor: Number(f.graceFactor),
              estimatedMinutes: Number(f.estimatedMinutes),
            },
            { onSuccess: onDone },
          )
        }
      >
        Save
      </Button>
      <Button variant="ghost" onClick={onDone}>
        Cancel
      </Button>
      {update.isError && !Object.keys(fields).length && <p className="text-sm font-medium text-alert-danger-ink">{update.error.message}</p>}
    </div>
  );
}
