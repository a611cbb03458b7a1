import type { ReactNode } from 'react';
import { PRIORITY_LABELS } from '@shared/priority';
import { STATUS_LABELS } from '@shared/ticket-workflow';
import { WAIT_REASON_LABELS } from '@shared/report-options';
import type { TicketActionInput, TicketDetail } from '@shared/schemas/tickets';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

const FIELDS: { key: keyof TicketDetail; label: string; show: (t: TicketDetail) => ReactNode }[] = [
  { key: 'status', label: 'Status', show: (t) => STATUS_LABELS[t.status] },
  { key: 'priority', label: 'Priority', show: (t) => PRIORITY_LABELS[t.priority] },
  { key: 'assignee', label: 'Assigned to', show: (t) => t.assignee?.name ?? 'Nobody' },
  { key: 'waitReason', label: 'Waiting for', show: (t) => (t.waitReason ? WAIT_REASON_LABELS[t.waitReason] : '—') },
  { key: 'fixKind', label: 'Recorded as', show: (t) => t.fixKind ?? '—' },
  { key: 'mergedIntoId', label: 'Merged into', show: (t) => (t.mergedIntoId ? `#${t.mergedIntoId}` : '—') },
];

/** What differs between the ticket as the user saw it and as it is now. */
export function changedFields(before: TicketDetail, now: TicketDetail) {
  return FIELDS.filter((f) => JSON.stringify(before[f.key]) !== JSON.stringify(now[f.key]));
}

const ACTION_WORDS: Record<string, string> = {
  acknowledge: 'acknowledge',
  start_repair: 'start the repair',
  assign: 'change the assignee',
  set_priority: 'change the priority',
  set_state: 'set the tool state',
  confirm_down: 'confirm the Down',
  revert_down: 'revert the Down',
  wait: 'set it waiting',
  resume: 'resume the repair',
  fix: 'mark it fixed',
  close: 'close it',
  reopen: 'reopen it',
  no_fault_found: 'record no fault found',
  merge: 'merge it',
};

/**
 * Shown when a save met a newer version: the user sees what the other person changed and
 * decides whether their own change still makes sense, instead of overwriting it blindly.
 */
export function StaleConflict({
  before,
  current,
  attempted,
  busy,
  onReapply,
  onDiscard,
}: {
  before: TicketDetail;
  current: TicketDetail;
  attempted: TicketActionInput;
  busy: boolean;
  onReapply: () => void;
  onDiscard: () => void;
}) {
  const changes = changedFields(before, current);
  const newEvents = current.events.filter((e) => !before.events.some((b) => b.id === e.id));
  return (
    <Alert
      tone="warning"
      live
      title="Someone else changed this ticket while you had it open"
      actions={
        <>
          <Button onClick={onReapply} busy={busy}>
            Apply my change again
          </Button>
          <Button variant="secondary" onClick={onDiscard}>
            Keep their version
          </Button>
        </>
      }
    >
      <p>
        You tried to <strong>{ACTION_WORDS[attempted.action] ?? attempted.action}</strong>. Nothing of yours was saved yet.
      </p>
      {changes.length > 0 && (
        <table className="mt-2 text-sm" data-testid="stale-changes">
          <thead>
            <tr className="text-left">
              <th className="pr-4 font-semibold">What</th>
              <th className="pr-4 font-semibold">You saw</th>
              <th className="font-semibold">Now</th>
            </tr>
          </thead>
          <tbody>
            {changes.map((f) => (
              <tr key={f.key}>
                <td className="pr-4">{f.label}</td>
                <td className="pr-4">{f.show(before)}</td>
                <td className="font-semibold">{f.show(current)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {newEvents.length > 0 && (
        <p className="mt-2">
          {newEvents.length} new {newEvents.length === 1 ? 'entry' : 'entries'} in the timeline.
        </p>
      )}
    </Alert>
  );
}
