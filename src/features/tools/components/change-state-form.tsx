import { useId, useState, type FormEvent } from 'react';
import {
  BOARD_LABELS,
  E10_LABELS,
  REASONS_BY_STATE,
  REASON_LABELS,
  boardStatusOf,
  stateWords,
  type E10State,
  type StateReason,
} from '@shared/equipment-state';
import { stateChangeSchema, type BoardModule, type StateChangeInput } from '@shared/schemas/facility';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { StateBadge } from '@/components/ui/state-badge';
import { TextField } from '@/components/ui/text-field';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import { cx } from '@/lib/cx';
import { useChangeToolState } from '@/features/tools/api/change-state';

// The six E10 states in the order a technician thinks of them, each with what it means here.
const CHOICES: { state: E10State; hint: string }[] = [
  { state: 'productive', hint: 'In use, running wafers' },
  { state: 'standby', hint: 'Ready and idle' },
  { state: 'unscheduled_downtime', hint: 'Broken: repair, waiting for parts' },
  { state: 'scheduled_downtime', hint: 'Planned maintenance, consumables' },
  { state: 'engineering', hint: 'Qualification, process development' },
  { state: 'non_scheduled', hint: 'Not in use: shut down, not staffed' },
];

const RUNNING: readonly E10State[] = ['productive', 'standby'];

/** A date as the value of a datetime-local input, in the browser's time zone. */
function toLocalInput(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

function tomorrowAtNine(): Date {
  const d = new Date();
  d.setDate(d.getDate() + 1);
  d.setHours(9, 0, 0, 0);
  return d;
}

export interface ChangeStateFormProps {
  toolId: number;
  modules: BoardModule[];
  onDone?: () => void;
}

/** Technicians set the state of the tool or one module, with why and when it will be back. */
export function ChangeStateForm({ toolId, modules, onDone }: ChangeStateFormProps) {
  const ids = useId();
  const mutation = useChangeToolState(toolId);
  const [target, setTarget] = useState<string>('tool');
  const [state, setState] = useState<E10State>('unscheduled_downtime');
  const [reason, setReason] = useState<StateReason>(REASONS_BY_STATE.unscheduled_downtime[0]);
  const [note, setNote] = useState('');
  const [restriction, setRestriction] = useState('');
  const [returnAt, setReturnAt] = useState('');
  const [ticket, setTicket] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState<string | null>(null);

  const running = RUNNING.includes(state);

  const chooseState = (next: E10State) => {
    setState(next);
    setReason(REASONS_BY_STATE[next][0]);
    setErrors({});
  };

  const submit = (event: FormEvent) => {
    event.preventDefault();
    setDone(null);
    const input: StateChangeInput = {
      moduleId: target === 'tool' ? null : Number(target),
      state,
      reason,
      note: note.trim() || null,
      restriction: running ? restriction.trim() || null : null,
      expectedReturnAt: !running && returnAt ? new Date(returnAt).toISOString() : null,
      ticketId: ticket ? Number(ticket) : null,
    };
    const checked = stateChangeSchema.safeParse(input);
    if (!checked.success) {
      const fields: FieldErrors = {};
      for (const issue of checked.error.issues) (fields[issue.path.join('.')] ??= []).push(issue.message);
      setErrors(fields);
      return;
    }
    setErrors({});
    mutation.mutate(checked.data, {
      onSuccess: (answer) => {
        const what = target === 'tool' ? 'The tool' : (modules.find((m) => String(m.id) === target)?.name ?? 'The module');
        setDone(`${what} is now ${stateWords(state)}. The tool reads ${BOARD_LABELS[answer.tool.status]} on the board.`);
        setNote('');
        setRestriction('');
        setReturnAt('');
        setTicket('');
        onDone?.();
      },
      onError: (error) => {
        if (isApiError(error) && error.fields) setErrors(error.fields);
      },
    });
  };

  const fieldError = (name: string) => errors[name];

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-describedby={`${ids}-about`}>
      <p id={`${ids}-about`} className="text-sm text-muted">
        Everyone watching the board sees the change at once, and followers of the tool are told.
      </p>

      {modules.length > 0 && (
        <div className="flex flex-col gap-1.5">
          <label htmlFor={`${ids}-target`} className="text-sm font-semibold text-ink">
            What changes
          </label>
          <select
            id={`${ids}-target`}
            value={target}
            onChange={(e) => setTarget(e.target.value)}
            className="min-h-11 rounded-lg border border-control bg-card px-3 text-base text-ink amber:border-2"
          >
            <option value="tool">The whole tool</option>
            {modules.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name} ({m.code})
              </option>
            ))}
          </select>
        </div>
      )}

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1.5 text-sm font-semibold text-ink">New state</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {CHOICES.map((choice) => {
            const checked = state === choice.state;
            return (
              <label
                key={choice.state}
                className={cx(
                  'flex min-h-13 cursor-pointer items-center gap-3 rounded-lg border px-3 py-2 amber:border-2',
                  checked ? 'border-ink bg-sunken ring-2 ring-ink' : 'border-line bg-card hover:bg-sunken',
                )}
              >
                <input
                  type="radio"
                  name={`${ids}-state`}
                  value={choice.state}
                  checked={checked}
                  onChange={() => chooseState(choice.state)}
                  className="size-5 accent-[var(--color-accent)]"
                />
                <span className="flex min-w-0 flex-col gap-1">
                  <span className="flex flex-wrap items-center gap-2">
                    <StateBadge status={boardStatusOf(choice.state)} size="sm" />
                    <span className="text-sm font-semibold text-ink">{E10_LABELS[choice.state]}</span>
                  </span>
                  <span className="text-xs text-muted">{choice.hint}</span>
                </span>
              </label>
            );
          })}
        </div>
        {fieldError('state') && <p className="text-sm font-medium text-alert-danger-ink">{fieldError('state')!.join(' ')}</p>}
      </fieldset>

      {REASONS_BY_STATE[state].length > 1 && (
        <div className="flex flex-col gap-1.5">
          <label htmlFor={`${ids}-reason`} className="text-sm font-semibold text-ink">
            Reason
          </label>
          <select
            id={`${ids}-reason`}
            value={reason}
            onChange={(e) => setReason(e.target.value as StateReason)}
            className="min-h-11 rounded-lg border border-control bg-card px-3 text-base text-ink amber:border-2"
          >
            {REASONS_BY_STATE[state].map((r) => (
              <option key={r} value={r}>
                {REASON_LABELS[r]}
              </option>
            ))}
          </select>
          {fieldError('reason') && <p className="text-sm font-medium text-alert-danger-ink">{fieldError('reason')!.join(' ')}</p>}
        </div>
      )}

      <div className="flex flex-col gap-1.5">
        <label htmlFor={`${ids}-note`} className="text-sm font-semibold text-ink">
          What people should know{!running && <span className="font-normal text-muted"> (required)</span>}
        </label>
        <p id={`${ids}-note-hint`} className="text-sm text-muted">
          Shown on the board and the tool page, e.g. “Turbo pump replaced, leak check running”.
        </p>
        <textarea
          id={`${ids}-note`}
          value={note}
          maxLength={500}
          rows={3}
          onChange={(e) => setNote(e.target.value)}
          aria-describedby={`${ids}-note-hint`}
          aria-invalid={Boolean(fieldError('note')) || undefined}
          className={cx(
            'rounded-lg border bg-card px-3 py-2 text-base text-ink amber:border-2',
            fieldError('note') ? 'border-2 border-state-down-fill' : 'border-control',
          )}
        />
        {fieldError('note') && <p className="text-sm font-medium text-alert-danger-ink">{fieldError('note')!.join(' ')}</p>}
      </div>

      {running ? (
        <TextField
          label="Restriction in force (optional)"
          hint="Anything here makes the tool read Limited, e.g. “100 mm wafers only”."
          value={restriction}
          maxLength={200}
          onChange={(e) => setRestriction(e.target.value)}
          errors={fieldError('restriction')}
        />
      ) : (
        <div className="flex flex-col gap-2">
          <TextField
            label="Expected back (optional)"
            type="datetime-local"
            value={returnAt}
            min={toLocalInput(new Date())}
            onChange={(e) => setReturnAt(e.target.value)}
            errors={fieldError('expectedReturnAt')}
          />
          <div className="flex flex-wrap gap-2" role="group" aria-label="Quick choices for the expected return">
            <Button variant="secondary" onClick={() => setReturnAt(toLocalInput(new Date(Date.now() + 3_600_000)))}>
              In 1 hour
            </Button>
            <Button variant="secondary" onClick={() => setReturnAt(toLocalInput(new Date(Date.now() + 4 * 3_600_000)))}>
              In 4 hours
            </Button>
            <Button variant="secondary" onClick={() => setReturnAt(toLocalInput(tomorrowAtNine()))}>
              Tomorrow 09:00
            </Button>
          </div>
        </div>
      )}

      <TextField
        label="Ticket number (optional)"
        inputMode="numeric"
        pattern="[0-9]*"
        value={ticket}
        onChange={(e) => setTicket(e.target.value.replace(/\D/g, ''))}
        errors={fieldError('ticketId')}
        className="sm:w-60"
      />

      {mutation.isError && (
        <Alert tone="danger" live>
          {mutation.error.message}
        </Alert>
      )}
      {done && (
        <Alert tone="success" live>
          {done}
        </Alert>
      )}

      <div>
        <Button type="submit" size="lg" busy={mutation.isPending}>
          Set state
        </Button>
      </div>
    </form>
  );
}
