import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useCreatePlan } from '@/features/maintenance/api/create-plan';

// A new plan. Steps are typed one per line; a step that asks for a reading is written
// "text | unit | lowest | highest", e.g. "Spin motor current | A | 1.8 | 2.4".

function parseSteps(text: string) {
  return text
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .map((line) => {
      const [t, unit, min, max] = line.split('|').map((c) => c.trim());
      if (unit === undefined) return { text: t, asksValue: false };
      const n = (c: string | undefined) => (c === undefined || c === '' ? null : Number(c.replace(',', '.')));
      return { text: t, asksValue: true, unit: unit || null, min: n(min), max: n(max) };
    });
}

export function PlanForm() {
  const create = useCreatePlan();
  const [f, setF] = useState({
    toolCode: '',
    title: '',
    steps: '',
    estimatedMinutes: '60',
    everyDays: '90',
    everyUnits: '',
    counterName: '',
    leadDays: '7',
    leadUnits: '0',
    graceFactor: '1.25',
  });
  const fields = isApiError(create.error) ? (create.error.fields ?? {}) : {};
  const set = (k: keyof typeof f) => (e: { target: { value: string } }) => setF({ ...f, [k]: e.target.value });
  const num = (v: string) => (v.trim() === '' ? null : Number(v));
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate({
      toolCode: f.toolCode,
      body: {
        title: f.title,
        moduleId: null,
        checklist: parseSteps(f.steps) as never,
        estimatedMinutes: Number(f.estimatedMinutes),
        everyDays: num(f.everyDays),
        everyUnits: num(f.everyUnits),
        counterName: f.counterName.trim() || null,
        leadDays: Number(f.leadDays),
        leadUnits: Number(f.leadUnits),
        graceFactor: Number(f.graceFactor),
      },
    });
  };
  const input = 'min-h-11 rounded-lg border border-control bg-card px-2 font-normal';
  const err = (k: string) => fields[k] && <span className="font-medium text-alert-danger-ink">{fields[k].join(' ')}</span>;
  const box = (k: keyof typeof f, label: string, hint?: string, apiField: string = k) => (
    <label className="flex flex-col gap-1 text-sm font-semibold">
      {label}
      {hint && <span className="font-normal text-muted">{hint}</span>}
      <input value={f[k]} onChange={set(k)} className={input} aria-invalid={Boolean(fields[apiField])} />
      {err(apiField)}
    </label>
  );
  return (
    <form onSubmit={submit} className="flex flex-col gap-4 px-5 pb-5">
      <div className="grid gap-4 sm:grid-cols-2">
        {box('toolCode', 'Tool code', 'As on its label, e.g. TRACK-A', 'toolId')}
        {box('title', 'Title')}
      </div>
      <label className="flex flex-col gap-1 text-sm font-semibold">
        Checklist, one step per line
        <span className="font-normal text-muted">
          A step that asks for a reading: “text | unit | lowest | highest”, e.g. “Spin motor current | A | 1.8 | 2.4”.
        </span>
        <textarea value={f.steps} onChange={set('steps')} rows={5} className="rounded-lg border border-control bg-card p-2 font-normal" />
        {err('checklist')}
      </label>
      <div className="grid gap-4 sm:grid-cols-3">
        {box('everyDays', 'Every N days', 'From the last completion; empty for usage only')}
        {box('everyUnits', 'Or every N units', 'Whichever comes first')}
        {box('counterName', 'Counter', 'e.g. wafers or run hours')}
        {box('leadDays', 'Lead time (days)')}
        {box('leadUnits', 'Lead (units)')}
        {box('graceFactor', 'Grace factor', '× the interval (1.25 after the published precedent)')}
        {box('estimatedMinutes', 'Estimated duration (minutes)')}
      </div>
      {create.isError && !Object.keys(fields).length && <Alert tone="danger">{create.error.message}</Alert>}
      {create.isSuccess && (
        <Alert tone="success" live>
          The plan is saved; its work orders will be made ahead of each due date.
        </Alert>
      )}
      <div>
        <Button type="submit" busy={create.isPending}>
          Save the plan
        </Button>
      </div>
    </form>
  );
}
