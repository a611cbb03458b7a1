import { useState, type FormEvent, type ReactNode } from 'react';
import { ACTIONS, type TicketAction } from '@shared/ticket-workflow';
import { PRIORITIES, PRIORITY_LABELS } from '@shared/priority';
import {
  FIX_KINDS,
  FIX_KIND_HELP,
  FIX_KIND_LABELS,
  WAIT_REASONS,
  WAIT_REASON_LABELS,
  type FixKind,
  type WaitReason,
} from '@shared/report-options';
import {
  BOARD_LABELS,
  E10_LABELS,
  E10_STATES,
  REASONS_BY_STATE,
  REASON_LABELS,
  boardStatusOf,
  type E10State,
  type StateReason,
} from '@shared/equipment-state';
import { ticketActionSchema, type TicketActionInput, type TicketDetail } from '@shared/schemas/tickets';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-client';
import { StaleTicket, useTicketAction } from '@/features/tickets/api/ticket-action';
import { useAssignees } from '@/features/tickets/api/get-assignees';
import { ticketsQueryOptions } from '@/features/tickets/api/get-tickets';
import { useQuery } from '@tanstack/react-query';
import { SelectField, TextAreaField } from '@/features/tickets/components/field-controls';
import { StaleConflict } from '@/features/tickets/components/stale-conflict';

type FormName = 'wait' | 'fix' | 'priority' | 'assign' | 'state' | 'merge' | 'no_fault_found' | 'reopen';
type Input = TicketActionInput;
type Without<T> = T extends unknown ? Omit<T, 'version'> : never;
type Body = Without<Input>;

interface Conflict {
  before: TicketDetail;
  current: TicketDetail;
  attempted: Body;
}

const ONE_CLICK: TicketAction[] = ['acknowledge', 'start_repair', 'resume', 'close'];

// The one or two steps the workflow expects next from each status; every other action
// allowed is offered in a quieter group below them.
const NEXT_STEPS: Partial<Record<TicketDetail['status'], readonly string[]>> = {
  reported: ['confirm_down', 'acknowledge'],
  acknowledged: ['start_repair', 'fix'],
  in_repair: ['fix', 'wait'],
  waiting: ['resume'],
  fixed: ['close'],
};

const DONE_WORDS: Partial<Record<string, string>> = {
  acknowledge: 'Acknowledged.',
  start_repair: 'Repair started.',
  resume: 'Repair resumed.',
  close: 'Ticket closed.',
  confirm_down: 'Confirmed: the tool state is as reported.',
  revert_down: 'Reverted: the tool is back in the state it had before.',
};

/**
 * Every change a viewer may make, as buttons that follow the shared workflow table. A form
 * remembers the ticket as it was when the form opened; saving sends that version, so a
 * change someone else made meanwhile is never silently overwritten.
 */
export function TicketActions({ ticket }: { ticket: TicketDetail }) {
  const action = useTicketAction(ticket.id);
  const [open, setOpen] = useState<{ form: FormName; seen: TicketDetail } | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [error, setError] = useState<{ message: string; fields?: Record<string, string[]> } | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const allowed = new Set(ticket.allowedActions);
  const next = new Set(NEXT_STEPS[ticket.status] ?? []);

  const send = (body: Body, seen: TicketDetail) => {
    setError(null);
    setDone(null);
    const input = { ...body, version: seen.version } as Input;
    const parsed = ticketActionSchema.safeParse(input);
    if (!parsed.success) {
      const fields: Record<string, string[]> = {};
      for (const issue of parsed.error.issues) (fields[issue.path.join('.')] ??= []).push(issue.message);
      setError({ message: 'Some fields need attention.', fields });
      return;
    }
    action.mutate(input, {
      onSuccess: () => {
        setOpen(null);
        setConflict(null);
        setDone(DONE_WORDS[body.action] ?? 'Saved.');
      },
      onError: (e) => {
        if (e instanceof StaleTicket) setConflict({ before: seen, current: e.current, attempted: body });
        else setError({ message: e.message, fields: isApiError(e) ? e.fields : undefined });
      },
    });
  };

  const openForm = (form: FormName) => {
    setError(null);
    setOpen({ form, seen: ticket });
  };

  const buttons: ReactNode[] = [];
  const others: ReactNode[] = [];
  if (allowed.has('confirm_down')) {
    // A "tool limited" report holds a restriction on a running tool rather than a Down.
    const held = ticket.toolStates.find((s) => s.ticketId === ticket.id && s.source === 'user_report' && !s.confirmed);
    const word = held && held.state !== 'unscheduled_downtime' ? 'Limited' : 'Down';
    buttons.push(
      <Button
        key="confirm_down"
        size="lg"
        variant="danger"
        busy={action.isPending && action.variables?.action === 'confirm_down'}
        onClick={() => send({ action: 'confirm_down' }, ticket)}
      >
        Confirm it is {word}
      </Button>,
      <Button
        key="revert_down"
        size="lg"
        variant="secondary"
        busy={action.isPending && action.variables?.action === 'revert_down'}
        onClick={() => send({ action: 'revert_down', note: null }, ticket)}
      >
        Not {word.toLowerCase()}: revert
      </Button>,
    );
  }
  for (const a of ONE_CLICK) {
    if (allowed.has(a)) {
      (next.has(a) ? buttons : others).push(
        <Button
          key={a}
          size="lg"
          variant={next.has(a) ? 'primary' : 'secondary'}
          busy={action.isPending && action.variables?.action === a}
          onClick={() => send({ action: a } as Body, ticket)}
        >
          {ACTIONS[a].label}
        </Button>,
      );
    }
  }
  const formButton = (form: FormName, label: string, when: boolean) =>
    when &&
    (next.has(form) ? buttons : others).push(
      <Button
        key={form}
        size="lg"
        variant={next.has(form) ? 'primary' : 'secondary'}
        aria-expanded={open?.form === form}
        onClick={() => (open?.form === form ? setOpen(null) : openForm(form))}
      >
        {label}
      </Button>,
    );
  formButton('fix', ACTIONS.fix.label, allowed.has('fix'));
  formButton('wait', ACTIONS.wait.label, allowed.has('wait'));
  formButton('state', 'Set tool state', allowed.has('set_state'));
  formButton('assign', 'Assign', allowed.has('assign'));
  formButton('priority', 'Change priority', allowed.has('set_priority'));
  formButton('merge', 'Merge into…', allowed.has('merge'));
  formButton('no_fault_found', ACTIONS.no_fault_found.label, allowed.has('no_fault_found'));
  formButton('reopen', ACTIONS.reopen.label, allowed.has('reopen'));

  if (buttons.length === 0 && others.length === 0 && !conflict) return null;

  return (
    <section aria-labelledby="ticket-actions-title" className="flex flex-col gap-4" data-testid="ticket-actions">
      <h2 id="ticket-actions-title" className="text-lg font-semibold text-ink">
        What next
      </h2>
      {conflict && (
        <StaleConflict
          before={conflict.before}
          current={conflict.current}
          attempted={{ ...conflict.attempted, version: conflict.current.version } as Input}
          busy={action.isPending}
          onReapply={() => send(conflict.attempted, conflict.current)}
          onDiscard={() => {
            setConflict(null);
            setOpen(null);
          }}
        />
      )}
      {buttons.length > 0 && (
        <div className="flex flex-wrap gap-2" data-testid="next-steps">
          {buttons}
        </div>
      )}
      {others.length > 0 && (
        <div className="flex flex-col gap-2" data-testid="other-actions">
          <p className="text-sm font-semibold text-muted">Other actions</p>
          <div className="flex flex-wrap gap-2">{others}</div>
        </div>
      )}
      {done && !error && (
        <Alert tone="success" live title={done}>
          The timeline below shows the step.
        </Alert>
      )}
      {error && (
        <Alert tone="danger" live title="That did not work">
          {error.message}
          {error.fields && (
            <ul className="mt-1 list-disc pl-5">
              {Object.entries(error.fields).map(([k, v]) => (
                <li key={k}>{v.join(' ')}</li>
              ))}
            </ul>
          )}
        </Alert>
      )}
      {open && !conflict && (
        <div className="rounded-xl border border-line bg-card p-4 amber:border-2">
          <ActionForm
            form={open.form}
            seen={open.seen}
            busy={action.isPending}
            onSubmit={(body) => send(body, open.seen)}
            onCancel={() => setOpen(null)}
          />
        </div>
      )}
    </section>
  );
}

function FormButtons({ busy, label, onCancel }: { busy: boolean; label: string; onCancel: () => void }) {
  return (
    <div className="flex flex-wrap gap-2">
      <Button type="submit" size="lg" busy={busy}>
        {label}
      </Button>
      <Button size="lg" variant="secondary" onClick={onCancel}>
        Cancel
      </Button>
    </div>
  );
}

const toLocalInput = (d: Date) => new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);

function ActionForm({
  form,
  seen,
  busy,
  onSubmit,
  onCancel,
}: {
  form: FormName;
  seen: TicketDetail;
  busy: boolean;
  onSubmit: (body: Body) => void;
  onCancel: () => void;
}) {
  const [values, setValues] = useState<Record<string, string | boolean>>(() => ({
    waitReason: 'parts',
    fixKind: 'failure',
    // Returning the tool to service and the wafer outcomes are answers, never assumptions.
    returnToService: false,
    priority: seen.priority,
    assigneeId: seen.assignee ? String(seen.assignee.id) : '',
    state: 'unscheduled_downtime',
    moduleId: seen.module ? String(seen.module.id) : '',
    reason: '',
    wafersRecovered: '',
    wafersReturned: '',
  }));
  const v = (k: string) => String(values[k] ?? '');
  const set = (k: string) => (e: { target: { value: string } }) => setValues((old) => ({ ...old, [k]: e.target.value }));
  const num = (k: string) => (v(k).trim() === '' ? null : Number(v(k)));
  const text = (k: string) => (v(k).trim() === '' ? null : v(k).trim());
  const assignees = useAssignees(form === 'assign');
  const openOnTool = useQuery({
    ...ticketsQueryOptions({ toolId: seen.tool.id, status: 'open', sort: 'newest', limit: 50 }),
    enabled: form === 'merge',
  });

  const submit = (e: FormEvent) => {
    e.preventDefault();
    switch (form) {
      case 'wait':
        return onSubmit({
          action: 'wait',
          waitReason: v('waitReason') as WaitReason,
          note: text('note'),
          expectedReturnAt: v('expectedReturnAt') ? new Date(v('expectedReturnAt')).toISOString() : null,
        });
      case 'fix':
        return onSubmit({
          action: 'fix',
          fixKind: v('fixKind') as FixKind,
          failureMode: text('failureMode'),
          cause: text('cause'),
          workDone: v('workDone').trim(),
          partsUsed: text('partsUsed'),
          handsOnMinutes: num('handsOnMinutes'),
          wafersRecovered: seen.wafersCount ? num('wafersRecovered') : null,
          wafersReturned: seen.wafersCount ? num('wafersReturned') : null,
          returnToService: values.returnToService === true,
          ...(values.returnToService === true && text('returnOverrideReason')
            ? { returnOverrideReason: text('returnOverrideReason')! }
            : {}),
        });
      case 'priority':
        return onSubmit({ action: 'set_priority', priority: v('priority') as TicketDetail['priority'], reason: v('reason').trim() });
      case 'assign':
        return onSubmit({ action: 'assign', assigneeId: v('assigneeId') ? Number(v('assigneeId')) : null });
      case 'state': {
        const state = v('state') as E10State;
        return onSubmit({
          action: 'set_state',
          moduleId: v('moduleId') ? Number(v('moduleId')) : null,
          state,
          reason: (v('stateReason') || REASONS_BY_STATE[state][0]) as StateReason,
          note: text('note'),
          expectedReturnAt: v('expectedReturnAt') ? new Date(v('expectedReturnAt')).toISOString() : null,
        });
      }
      case 'merge':
        return onSubmit({ action: 'merge', targetId: Number(v('targetId')) });
      case 'no_fault_found':
        return onSubmit({ action: 'no_fault_found', note: text('note') });
      case 'reopen':
        return onSubmit({ action: 'reopen', reason: text('note') });
    }
  };

  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label={form === 'fix' ? 'Mark fixed' : undefined}>
      {form === 'wait' && (
        <>
          <SelectField label="Waiting for" value={v('waitReason')} onChange={set('waitReason')}>
            {WAIT_REASONS.map((r) => (
              <option key={r} value={r}>
                {WAIT_REASON_LABELS[r]}
              </option>
            ))}
          </SelectField>
          <TextAreaField
            label="Note for the reporter"
            hint="What you are waiting for. It shows on the board while the tool waits."
            value={v('note')}
            onChange={set('note')}
          />
          <TextField
            label="Expected back"
            hint="When the parts, the vendor or the answer should be here; the board shows it."
            type="datetime-local"
            min={toLocalInput(new Date())}
            value={v('expectedReturnAt')}
            onChange={set('expectedReturnAt')}
          />
          <FormButtons busy={busy} label="Set waiting" onCancel={onCancel} />
        </>
      )}
      {form === 'fix' && (
        <>
          <fieldset className="flex flex-col gap-2">
            <legend className="mb-1 text-sm font-semibold text-ink">What was it?</legend>
            {FIX_KINDS.map((k) => (
              <label
                key={k}
                className="flex min-h-11 cursor-pointer items-start gap-3 rounded-lg border border-control p-3 has-[:checked]:border-2 has-[:checked]:border-accent"
              >
                <input
                  type="radio"
                  name="fixKind"
                  value={k}
                  checked={v('fixKind') === k}
                  onChange={set('fixKind')}
                  className="mt-1 size-5"
                />
                <span>
                  <span className="block font-semibold">{FIX_KIND_LABELS[k]}</span>
                  <span className="block text-sm text-muted">{FIX_KIND_HELP[k]}</span>
                </span>
              </label>
            ))}
          </fieldset>
          <TextAreaField label="What was done" required value={v('workDone')} onChange={set('workDone')} />
          <div className="grid gap-4">
            <TextField
              label="Failure mode"
              hint="A short name used in the analytics, e.g. “RF generator fault”."
              value={v('failureMode')}
              onChange={set('failureMode')}
              maxLength={120}
            />
            <TextField
              label="Hands-on time (minutes)"
              type="number"
              inputMode="numeric"
              min={0}
              value={v('handsOnMinutes')}
              onChange={set('handsOnMinutes')}
            />
          </div>
          <TextAreaField label="Cause" value={v('cause')} onChange={set('cause')} />
          <TextAreaField label="Parts used" value={v('partsUsed')} onChange={set('partsUsed')} rows={2} />
          {seen.wafersCount > 0 && (
            <div className="grid gap-4">
              <TextField label="Wafers recovered" type="number" min={0} value={v('wafersRecovered')} onChange={set('wafersRecovered')} />
              <TextField
                label="Wafers returned to their owner"
                type="number"
                min={0}
                value={v('wafersReturned')}
                onChange={set('wafersReturned')}
              />
            </div>
          )}
          <label className="flex min-h-11 items-center gap-3 text-sm font-semibold">
            <input
              type="checkbox"
              className="size-5"
              checked={values.returnToService === true}
              onChange={(e) => setValues((o) => ({ ...o, returnToService: e.target.checked }))}
            />
            Return the tool to service now (back to Running)
          </label>
          {values.returnToService === true && (
            <TextField
              label="Manager's override (only if the tool has a requalification check without a passing record): the reason"
              value={v('returnOverrideReason')}
              onChange={set('returnOverrideReason')}
              maxLength={1000}
            />
          )}
          <FormButtons busy={busy} label="Mark fixed" onCancel={onCancel} />
        </>
      )}
      {form === 'priority' && (
        <>
          <SelectField label="Priority" value={v('priority')} onChange={set('priority')}>
            {PRIORITIES.map((p) => (
              <option key={p} value={p}>
                {PRIORITY_LABELS[p]}
              </option>
            ))}
          </SelectField>
          <TextAreaField
            label="Why"
            required
            hint="Kept in the timeline; the automatic priority will not override yours afterwards."
            value={v('reason')}
            onChange={set('reason')}
          />
          <FormButtons busy={busy} label="Change priority" onCancel={onCancel} />
        </>
      )}
      {form === 'assign' && (
        <>
          <SelectField label="Assign to" value={v('assigneeId')} onChange={set('assigneeId')} disabled={assignees.isPending}>
            <option value="">Nobody</option>
            {assignees.data?.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </SelectField>
          <FormButtons busy={busy} label="Assign" onCancel={onCancel} />
        </>
      )}
      {form === 'state' && (
        <>
          {seen.modules.length > 0 && (
            <SelectField label="Which part" value={v('moduleId')} onChange={set('moduleId')}>
              <option value="">The whole tool</option>
              {seen.modules.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.name}
                </option>
              ))}
            </SelectField>
          )}
          <SelectField
            label="State"
            value={v('state')}
            onChange={(e) => setValues((o) => ({ ...o, state: e.target.value, stateReason: '' }))}
          >
            {E10_STATES.map((s) => (
              <option key={s} value={s}>
                {/* The board's word first, the E10 state beside it: one vocabulary everywhere. */}
                {BOARD_LABELS[boardStatusOf(s)]} ({E10_LABELS[s]})
              </option>
            ))}
          </SelectField>
          <SelectField label="Reason" value={v('stateReason')} onChange={set('stateReason')}>
            {REASONS_BY_STATE[v('state') as E10State].map((r) => (
              <option key={r} value={r}>
                {REASON_LABELS[r]}
              </option>
            ))}
          </SelectField>
          <TextField
            label="Expected back"
            type="datetime-local"
            min={toLocalInput(new Date())}
            value={v('expectedReturnAt')}
            onChange={set('expectedReturnAt')}
          />
          <TextAreaField label="Note for people at the tool" value={v('note')} onChange={set('note')} rows={2} maxLength={500} />
          <FormButtons busy={busy} label="Set state" onCancel={onCancel} />
        </>
      )}
      {form === 'merge' && (
        <>
          <SelectField
            label="Merge this ticket into"
            hint="Both reporters keep their reports and photos; news goes to both."
            value={v('targetId')}
            onChange={set('targetId')}
            required
          >
            <option value="">Choose an open ticket on this tool</option>
            {openOnTool.data?.items
              .filter((t) => t.id !== seen.id)
              .map((t) => (
                <option key={t.id} value={t.id}>
                  #{t.id} · {t.title}
                </option>
              ))}
          </SelectField>
          <FormButtons busy={busy} label="Merge" onCancel={onCancel} />
        </>
      )}
      {(form === 'no_fault_found' || form === 'reopen') && (
        <>
          <TextAreaField label={form === 'reopen' ? 'What is wrong again?' : 'What was checked'} value={v('note')} onChange={set('note')} />
          <FormButtons busy={busy} label={form === 'reopen' ? 'Reopen' : 'No fault found'} onCancel={onCancel} />
        </>
      )}
    </form>
  );
}
