import { BOARD_STATUSES, type BoardStatus } from '@shared/equipment-state';
import { StateBadge } from '@/components/ui/state-badge';

const MEANINGS: Record<BoardStatus, string> = {
  running: 'Working normally.',
  limited: 'Works, but some modules are down or a restriction is in force: read the reason first.',
  down: 'Stopped by a fault and waiting for repair. Do not use.',
  maintenance: 'Planned maintenance. Back at the time shown.',
  engineering: 'Staff are qualifying it or developing a process. Ask before use.',
  offline: 'Not scheduled for use: shut down or not staffed.',
};

/** How to read a tool's state: every state's badge and what it means for the person at the tool. */
export function StateLegend() {
  return (
    <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-2">
      {BOARD_STATUSES.map((status) => (
        <div key={status} className="flex items-start gap-3">
          <dt className="w-36 shrink-0">
            <StateBadge status={status} />
          </dt>
          <dd className="pt-1.5 text-sm text-muted">{MEANINGS[status]}</dd>
        </div>
      ))}
    </dl>
  );
}
