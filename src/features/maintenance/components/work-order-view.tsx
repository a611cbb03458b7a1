import { useEffect, useState } from 'react';
import { Link } from 'react-router';
import { WORK_ORDER_STATUS_LABELS } from '@shared/schemas/maintenance';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { isApiError } from '@/lib/api-client';
import { formatWindow } from '@/lib/maintenance-window';
import { useParts } from '@/features/maintenance/api/parts';
import { useToolRequal } from '@/features/maintenance/api/requalification';
import { useWorkOrderStep, type WorkOrderStep } from '@/features/maintenance/api/work-order-steps';
import type { WorkOrderDetail } from '@/features/maintenance/api/types';
import { RequalEntry } from '@/features/maintenance/components/requal-entry';

// The work-order page: book the window, start, tick the checklist and enter readings
// (out-of-limit readings marked at once), parts used, hands-on time and notes, the
// requalification record, and completion with its proof.

function limits(step: { min: number | null; max: number | null; unit: string | null }) {
  const u = step.unit ? ` ${step.unit}` : '';
  if (step.min !== null && step.max !== null) return `${step.min}–${step.max}${u}`;
  if (step.min !== null) return `≥ ${step.min}${u}`;
  if (step.max !== null) return `≤ ${step.max}${u}`;
  return step.unit ?? '';
}

const isOut = (step: { min: number | null; max: number | null }, v: number | null) =>
  v !== null && ((step.min !== null && v < step.min) || (step.max !== null && v > step.max));

const toLocalInput = (d: Date) => new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);

export function WorkOrderView({ detail, canOverride }: { detail: WorkOrderDetail; canOverride: boolean }) {
  const wo = detail.workOrder;
  const step = useWorkOrderStep(wo.id);
  const parts = useParts({ toolId: wo.toolId });
  const requal = useToolRequal(wo.toolId);
  const [values, setValues] = useState<Record<number, string>>({});
  const [handsOn, setHandsOn] = useState(wo.handsOnMinutes?.toString() ?? '');
  const [notes, setNotes] = useState(wo.notes ?? '');
  const [override, setOverride] = useState('');
  const [skipReason, setSkipReason] = useState('');
  const [partId, setPartId] = useState('');
  const [freeText, setFreeText] = useState('');
  const [qty, setQty] = useState('1');
  const start = detail.window ? new Date(detail.window.startsAt) : new Date(Date.now() + 86400_000);
  const [winStart, setWinStart] = useState(toLocalInput(start));
  const [winEnd, setWinEnd] = useState(
    toLocalInput(detail.window ? new Date(detail.window.endsAt) : new Date(start.getTime() + (wo.estimatedMinutes ?? 120) * 60_000)),
  );

  useEffect(() => {
    setValues(Object.fromEntries(wo.results.filter((r) => r.value !== null).map((r) => [r.step, String(r.value)])));
  }, [wo.results]);

  const send = (s: WorkOrderStep) => step.mutate(s);
  const working = wo.status === 'in_progress';
  const closed = wo.status === 'done' || wo.status === 'skipped';
  const result = (i: number) => wo.results.find((r) => r.step === i);
  const error = step.error;
  const fields = isApiError(error) ? error.fields : undefined;

  const saveStep = (i: number, done: boolean) => {
    const raw = values[i];
    const value = raw === undefined || raw.trim() === '' ? null : Number(raw.replace(',', '.'));
    send({
      step: 'progress',
      body: { version: wo.version, results: [{ step: i, done, value: value !== null && Number.isFinite(value) ? value : null }] },
    });
  };

  return (
    <div className="flex flex-col gap-6">
      {error && (
        <Alert tone="danger" live title="That did not go through">
          {error.message}
          {fields && Object.values(fields).flat().length > 0 && ` ${Object.values(fields).flat().join(' ')}`}
        </Alert>
      )}

      <Card
        as="section"
        title="Status"
        description={`${WORK_ORDER_STATUS_LABELS[wo.status]}${wo.kind === 'corrective' ? ' · corrective work' : ' · preventive maintenance'}`}
      >
        <div className="flex flex-col gap-3 px-5 pb-5 text-sm">
          {wo.dueAt && (
            <p>
              Due {new Date(wo.dueAt).toLocaleString()}
              {wo.graceUntil && ` · latest ${new Date(wo.graceUntil).toLocaleString()} (grace window)`}
            </p>
          )}
          {wo.dueCounter !== null && (
            <p>
              Due at counter {wo.dueCounter}
              {wo.graceUntilCounter !== null && ` · latest ${wo.graceUntilCounter}`}
            </p>
          )}
          {detail.window && detail.window.status === 'booked' && (
            <p className="font-semibold" data-testid="wo-window">
              Downtime window: {formatWindow(detail.window.startsAt, detail.window.endsAt)}
            </p>
          )}
          {wo.skipReason && <p>Skipped: {wo.skipReason}</p>}
          {wo.returnProof && (
            <p data-testid="return-proof">
              Returned to service with{' '}
              {wo.returnProof.kind === 'record'
                ? 'a passing requalification record'
                : wo.returnProof.kind === 'override'
                  ? `a manager's override by ${wo.returnProof.byName}: “${wo.returnProof.reason}”`
                  : 'no requalification needed (no template)'}
            </p>
          )}
          {!closed && (
            <div className="flex flex-wrap items-end gap-3">
              <label className="flex flex-col gap-1 font-semibold">
                Window starts
                <input
                  type="datetime-local"
                  value={winStart}
                  onChange={(e) => setWinStart(e.target.value)}
                  className="min-h-11 rounded-lg border border-control bg-card px-2 font-normal"
                  data-testid="window-start"
                />
              </label>
              <label className="flex flex-col gap-1 font-semibold">
                Window ends
                <input
                  type="datetime-local"
                  value={winEnd}
                  onChange={(e) => setWinEnd(e.target.value)}
                  className="min-h-11 rounded-lg border border-control bg-card px-2 font-normal"
                  data-testid="window-end"
                />
              </label>
              {!working && (
                <Button
                  variant="secondary"
                  onClick={() =>
                    send({
                      step: 'window',
                      body: { version: wo.version, startsAt: new Date(winStart).toISOString(), endsAt: new Date(winEnd).toISOString() },
                    })
                  }
                  busy={step.isPending}
                >
                  {detail.window?.status === 'booked' ? 'Move the window' : 'Book the window'}
                </Button>
              )}
              {!working && (
                <Button onClick={() => send({ step: 'start', body: { version: wo.version } })} busy={step.isPending} data-testid="wo-start">
                  Start the work
                </Button>
              )}
            </div>
          )}
          {!closed && wo.kind === 'preventive' && !working && (
            <p className="text-muted">Starting puts the tool in scheduled downtime (preventive maintenance); the board shows it at once.</p>
          )}
          <p>
            <Link to={`/maintenance/work-orders/${wo.id}/print`} className={buttonClasses({ variant: 'secondary' })}>
              Printable sheet
            </Link>
          </p>
        </div>
      </Card>

      <Card as="section" title="Checklist" description="Tick each step as it is done; readings outside their limits are marked at once.">
        <ol className="flex flex-col divide-y divide-line px-5 pb-5">
          {wo.checklist.map((s, i) => {
            const r = result(i);
            const typed = values[i] === undefined || values[i] === '' ? null : Number(values[i].replace(',', '.'));
            const out = s.asksValue && (isOut(s, typed) || Boolean(r?.outOfLimit && typed === r.value));
            return (
              <li key={i} className="flex flex-wrap items-center gap-3 py-3" data-testid={`step-${i}`}>
                <label className="flex min-h-11 flex-1 basis-full items-center gap-3 sm:basis-0">
                  <input
                    type="checkbox"
                    className="size-6"
                    checked={r?.done ?? false}
                    disabled={!working || step.isPending}
                    onChange={(e) => saveStep(i, e.target.checked)}
                    aria-label={`Step ${i + 1} done`}
                  />
                  <span>
                    {i + 1}. {s.text}
                  </span>
                </label>
                {s.asksValue && (
                  <span className="flex items-center gap-2">
                    <input
                      inputMode="decimal"
                      value={values[i] ?? ''}
                      disabled={!working}
                      onChange={(e) => setValues({ ...values, [i]: e.target.value })}
                      // A ticked step saves a changed reading when the field is left; an unticked one saves it with the tick.
                      onBlur={() => r?.done && values[i] !== undefined && saveStep(i, true)}
                      aria-label={`Reading for step ${i + 1} (${limits(s)})`}
                      aria-invalid={out}
                      className={`min-h-11 w-24 rounded-lg border px-2 text-right font-mono ${out ? 'border-2 border-danger' : 'border-control'}`}
                      data-testid={`step-${i}-value`}
                    />
                    <span className="text-sm text-muted">{limits(s)}</span>
                    {out && (
                      <span className="text-sm font-bold text-alert-danger-ink" data-testid={`step-${i}-out`}>
                        ▲ out of limits
                      </span>
                    )}
                  </span>
                )}
              </li>
            );
          })}
        </ol>
      </Card>

      <Card as="section" title="Parts used">
        <div className="flex flex-col gap-3 px-5 pb-5">
          {detail.parts.length > 0 ? (
            <ul className="text-sm">
              {detail.parts.map((p) => (
                <li key={p.id}>
                  {p.quantity} × {p.name ? `${p.name} (${p.partNumber})` : p.freeText}
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm text-muted">None yet.</p>
          )}
          {!closed && (
            <div className="flex flex-wrap items-end gap-3">
              <label className="flex flex-col gap-1 text-sm font-semibold">
                From the parts list
                <select
                  value={partId}
                  onChange={(e) => setPartId(e.target.value)}
                  className="min-h-11 rounded-lg border border-control bg-card px-2 font-normal"
                  data-testid="part-pick"
                >
                  <option value="">— a part not in the list —</option>
                  {parts.data?.items.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name} ({p.partNumber}), {p.stock} in stock
                    </option>
                  ))}
                </select>
              </label>
              {partId === '' && (
                <label className="flex flex-col gap-1 text-sm font-semibold">
                  Or name it
                  <input
                    value={freeText}
                    onChange={(e) => setFreeText(e.target.value)}
                    className="min-h-11 rounded-lg border border-control px-2 font-normal"
                  />
                </label>
              )}
              <label className="flex flex-col gap-1 text-sm font-semibold">
                How many
                <input
                  inputMode="numeric"
                  value={qty}
                  onChange={(e) => setQty(e.target.value)}
                  className="min-h-11 w-20 rounded-lg border border-control px-2 font-normal"
                />
              </label>
              <Button
                variant="secondary"
                onClick={() =>
                  send({
                    step: 'part',
                    body: { partId: partId ? Number(partId) : null, freeText: partId ? null : freeText || null, quantity: Number(qty) },
                  })
                }
                data-testid="part-add"
              >
                Add the part
              </Button>
            </div>
          )}
        </div>
      </Card>

      <Card as="section" title="Time and notes">
        <div className="flex flex-col gap-3 px-5 pb-5">
          <label className="flex flex-col gap-1 text-sm font-semibold">
            Hands-on time (minutes)
            <input
              inputMode="numeric"
              value={handsOn}
              disabled={!working}
              onChange={(e) => setHandsOn(e.target.value)}
              className="min-h-11 w-32 rounded-lg border border-control px-2 font-normal"
              data-testid="hands-on"
            />
          </label>
          <label className="flex flex-col gap-1 text-sm font-semibold">
            Notes
            <textarea
              value={notes}
              disabled={!working}
              onChange={(e) => setNotes(e.target.value)}
              rows={3}
              className="rounded-lg border border-control p-2 font-normal"
            />
          </label>
          {working && (
            <div>
              <Button
                variant="secondary"
                onClick={() =>
                  send({
                    step: 'progress',
                    body: { version: wo.version, handsOnMinutes: handsOn ? Number(handsOn) : null, notes: notes || null },
                  })
                }
                data-testid="save-notes"
              >
                Save time and notes
              </Button>
            </div>
          )}
        </div>
      </Card>

      {!closed && requal.data && requal.data.length > 0 && (
        <Card
          as="section"
          title="Requalification"
          description="The tool returns to Running only with a passing record for each check, or a manager's override with a reason."
        >
          <div className="flex flex-col gap-6 px-5 pb-5">
            {requal.data.map((t) => (
              <RequalEntry key={t.template.id} template={t.template} workOrderId={wo.id} />
            ))}
          </div>
        </Card>
      )}

      {working && (
        <Card as="section" title="Finish">
          <div className="flex flex-col gap-3 px-5 pb-5">
            {canOverride && (
              <label className="flex flex-col gap-1 text-sm font-semibold">
                Manager&apos;s override (only when no passing record can be made now): the reason
                <input
                  value={override}
                  onChange={(e) => setOverride(e.target.value)}
                  className="min-h-11 rounded-lg border border-control px-2 font-normal"
                />
              </label>
            )}
            <div>
              <Button
                size="lg"
                onClick={() =>
                  send({ step: 'complete', body: { version: wo.version, ...(override.trim() ? { overrideReason: override.trim() } : {}) } })
                }
                busy={step.isPending}
                data-testid="wo-complete"
              >
                Complete and return to service
              </Button>
            </div>
          </div>
        </Card>
      )}

      {!closed && !working && (
        <Card as="section" title="Skip this time">
          <div className="flex flex-wrap items-end gap-3 px-5 pb-5">
            <label className="flex flex-1 flex-col gap-1 text-sm font-semibold">
              Why it is skipped (counts against PM compliance)
              <input
                value={skipReason}
                onChange={(e) => setSkipReason(e.target.value)}
                className="min-h-11 rounded-lg border border-control px-2 font-normal"
              />
            </label>
            <Button
              variant="danger"
              disabled={skipReason.trim() === ''}
              onClick={() => send({ step: 'skip', body: { version: wo.version, reason: skipReason.trim() } })}
            >
              Skip
            </Button>
          </div>
        </Card>
      )}
    </div>
  );
}
