import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useCreateRecord } from '@/features/maintenance/api/requalification';
import type { RequalRecordView, RequalTemplateView } from '@/features/maintenance/api/types';

const fmt = (v: number | null, digits = 3) => (v === null ? '—' : Number(v.toFixed(digits)).toString());

function limitText(l: { min: number | null; max: number | null }) {
  if (l.min !== null && l.max !== null) return `${l.min} to ${l.max}`;
  return l.min !== null ? `at least ${l.min}` : `at most ${l.max}`;
}

/** One requalification record: type the values or paste a column from a metrology export. */
export function RequalEntry({
  template,
  workOrderId,
  ticketId,
}: {
  template: RequalTemplateView;
  workOrderId?: number;
  ticketId?: number;
}) {
  const [text, setText] = useState('');
  const [result, setResult] = useState<RequalRecordView | null>(null);
  const create = useCreateRecord(template.id);
  const errors = isApiError(create.error) ? create.error.fields : undefined;

  const submit = async () => {
    setResult(null);
    const r = await create.mutateAsync({ pasted: text, workOrderId: workOrderId ?? null, ticketId: ticketId ?? null }).catch(() => null);
    if (r) setResult(r);
  };

  return (
    <section className="flex flex-col gap-3" aria-label={`Requalification: ${template.name}`} data-testid={`requal-${template.id}`}>
      <div>
        <h3 className="font-semibold text-ink">{template.name}</h3>
        <p className="text-sm text-muted">
          {template.quantity} at {template.points} points, in {template.unit}
          {template.target !== null && `; target ${template.target} ${template.unit}`}
          {(template.lsl !== null || template.usl !== null) && `; spec ${template.lsl ?? '—'} to ${template.usl ?? '—'} ${template.unit}`}.
        </p>
        <ul className="mt-1 text-sm text-ink">
          {template.limits.map((l, i) => (
            <li key={i}>
              Limit on <strong>{l.label}</strong>: {limitText(l)}
            </li>
          ))}
        </ul>
      </div>
      <label className="flex flex-col gap-1.5 text-sm font-semibold text-ink">
        Measurements, one per line (paste a column from the metrology export)
        <textarea
          value={text}
          onChange={(e) => setText(e.target.value)}
          rows={Math.min(12, template.points + 1)}
          className="rounded-lg border border-control bg-card p-2 font-mono text-base font-normal"
          aria-invalid={Boolean(errors?.pasted)}
          data-testid="requal-values"
        />
      </label>
      {errors?.pasted && <p className="text-sm font-medium text-alert-danger-ink">{errors.pasted.join(' ')}</p>}
      {create.isError && !errors?.pasted && <Alert tone="danger">{create.error.message}</Alert>}
      <div>
        <Button onClick={() => void submit()} busy={create.isPending} disabled={text.trim() === ''}>
          Compute and record
        </Button>
      </div>
      {result && <RecordResult record={result} unit={template.unit} />}
    </section>
  );
}

export function RecordResult({ record, unit }: { record: RequalRecordView; unit: string }) {
  const s = record.summary;
  return (
    <div className="flex flex-col gap-2" data-testid="requal-result" data-passed={record.passed}>
      <Alert
        tone={record.passed ? 'success' : 'danger'}
        live
        title={record.passed ? 'Passed: every limit is met' : 'Failed: a limit is not met'}
      >
        <ul>
          {record.verdicts.map((v, i) => (
            <li key={i}>
              {v.pass ? '✔ Pass' : '✖ Fail'} — {v.label}: {fmt(v.value)} (limit {limitText(v)})
            </li>
          ))}
        </ul>
      </Alert>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
        {[
          ['n', String(s.n)],
          [`mean (${unit})`, fmt(s.mean)],
          [`min (${unit})`, fmt(s.min)],
          [`max (${unit})`, fmt(s.max)],
          [`range (${unit})`, fmt(s.range)],
          [`s, sample (${unit})`, fmt(s.stdDev)],
          ['half-range (± %)', fmt(s.halfRangePct, 4)],
          ['range (%)', fmt(s.rangePct, 4)],
          ['1σ (%)', fmt(s.sigmaPct, 4)],
          ['3σ (%)', fmt(s.threeSigmaPct, 4)],
          ['Cp', fmt(s.cp)],
          ['Cpk', fmt(s.cpk)],
        ].map(([k, v]) => (
          <div key={k} className="flex justify-between gap-2 border-b border-line py-1">
            <dt className="text-muted">{k}</dt>
            <dd className="font-mono text-ink">{v}</dd>
          </div>
        ))}
      </dl>
    </div>
  );
}
