import { Link } from 'react-router';
import type { TicketSummary } from '@shared/schemas/tickets';
import { WAIT_REASON_LABELS } from '@shared/report-options';
import { isOpenStatus } from '@shared/ticket-workflow';
import type { BoardStatus, E10State } from '@shared/equipment-state';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateName } from '@/components/ui/state-name';
import { HazardChips, PriorityBadge, TicketStatusBadge } from '@/features/tickets/components/ticket-chips';
import { TargetClock } from '@/features/tickets/components/target-clock';

export interface TicketTableProps {
  items: TicketSummary[];
  caption: string;
  /** Hide the tool column where every row is about the same tool. */
  showTool?: boolean;
  /** Show the service-target timers (the queue); lists of past tickets leave them out. */
  showTargets?: boolean;
  /** The tool's current state per tool id, where the page knows it (the queue reads the board). */
  toolStates?: ReadonlyMap<number, { status: BoardStatus; state: E10State }>;
}

function TicketLink({ t }: { t: TicketSummary }) {
  return (
    <Link to={`/tickets/${t.id}`} className="group inline-flex min-h-11 flex-col justify-center no-underline">
      <span className="font-mono text-xs text-muted">#{t.id}</span>
      <span className="font-semibold text-ink group-hover:underline">{t.title}</span>
    </Link>
  );
}

function Targets({ t }: { t: TicketSummary }) {
  if (!isOpenStatus(t.status) && t.status !== 'fixed') return <span className="text-xs text-muted">—</span>;
  return (
    <span className="flex flex-col items-start gap-1">
      <TargetClock label="Acknowledge" clock={t.targets.acknowledge} createdAt={t.createdAt} />
      <TargetClock label="Restore" clock={t.targets.restore} createdAt={t.createdAt} />
    </span>
  );
}

function ToolState({ t, toolStates }: { t: TicketSummary; toolStates?: TicketTableProps['toolStates'] }) {
  const s = toolStates?.get(t.tool.id);
  if (!s) return null;
  return <StateName state={s.state} status={s.status} className="mt-1" />;
}

/**
 * Tickets as a table on wide screens and as stacked cards on phones: the same rows, the
 * same order, the ticket link always the first thing to tap.
 */
export function TicketTable({ items, caption, showTool = true, showTargets = false, toolStates }: TicketTableProps) {
  return (
    <>
      <table className="hidden w-full border-collapse text-left text-sm md:table" data-testid="ticket-table">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-line text-xs font-semibold tracking-wide text-muted uppercase">
          <tr>
            <th scope="col" className="px-3 py-2">
              Priority
            </th>
            <th scope="col" className="px-3 py-2">
              Ticket
            </th>
            {showTool && (
              <th scope="col" className="px-3 py-2">
                Tool
              </th>
            )}
            <th scope="col" className="px-3 py-2">
              Status
            </th>
            <th scope="col" className="px-3 py-2">
              Assigned
            </th>
            <th scope="col" className="px-3 py-2">
              Reported
            </th>
            {showTargets && (
              <th scope="col" className="px-3 py-2">
                Targets
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {items.map((t) => (
            <tr key={t.id} data-ticket-id={t.id} className="border-b border-line align-top last:border-b-0">
              <td className="px-3 py-3">
                <PriorityBadge priority={t.priority} />
              </td>
              <td className="max-w-md px-3 py-1">
                <TicketLink t={t} />
                <HazardChips hazards={t.hazards} className="mb-2" />
              </td>
              {showTool && (
                <td className="px-3 py-3">
                  <span className="block font-mono text-xs text-muted">{t.tool.code}</span>
                  <span className="block text-ink">{t.tool.name}</span>
                  {t.module && <span className="block text-xs text-muted">{t.module.name}</span>}
                  <ToolState t={t} toolStates={toolStates} />
                </td>
              )}
              <td className="px-3 py-3">
                <TicketStatusBadge status={t.status} />
                {t.status === 'waiting' && t.waitReason && (
                  <span className="mt-1 block text-xs text-muted">{WAIT_REASON_LABELS[t.waitReason]}</span>
                )}
              </td>
              <td className="px-3 py-3 text-ink">{t.assignee?.name ?? <span className="text-muted">Nobody yet</span>}</td>
              <td className="px-3 py-3 whitespace-nowrap text-muted">
                <RelativeTime value={t.createdAt} />
              </td>
              {showTargets && (
                <td className="px-3 py-3">
                  <Targets t={t} />
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>

      <ul className="flex flex-col divide-y divide-line md:hidden" aria-label={caption}>
        {items.map((t) => (
          <li key={t.id} data-ticket-id={t.id} className="flex flex-col gap-2 px-4 py-3">
            <div className="flex flex-wrap items-center gap-2">
              <PriorityBadge priority={t.priority} />
              <TicketStatusBadge status={t.status} />
              <span className="ml-auto text-xs text-muted">
                <RelativeTime value={t.createdAt} />
              </span>
            </div>
            <TicketLink t={t} />
            <HazardChips hazards={t.hazards} />
            {showTool && (
              <p className="text-sm text-muted">
                <span className="font-mono">{t.tool.code}</span> · {t.tool.name}
                {t.module && ` · ${t.module.name}`}
              </p>
            )}
            {showTool && <ToolState t={t} toolStates={toolStates} />}
            <p className="text-sm text-muted">
              {t.assignee ? `Assigned to ${t.assignee.name}` : 'Not assigned yet'}
              {t.status === 'waiting' && t.waitReason ? ` · ${WAIT_REASON_LABELS[t.waitReason]}` : ''}
            </p>
            {showTargets && <Targets t={t} />}
          </li>
        ))}
      </ul>
    </>
  );
}
