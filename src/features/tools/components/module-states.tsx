import { REASON_LABELS } from '@shared/equipment-state';
import type { BoardModule } from '@shared/schemas/facility';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateBadge } from '@/components/ui/state-badge';

/** The state of each module (chamber, bowl, tube); some down make the tool Limited. */
export function ModuleStates({ modules }: { modules: BoardModule[] }) {
  if (modules.length === 0) return <p className="text-sm text-muted">This tool has no separate modules.</p>;
  return (
    <ul className="divide-y divide-line">
      {modules.map((m) => (
        <li key={m.id} className="flex flex-wrap items-start justify-between gap-2 py-2.5" data-testid={`module-${m.code}`}>
          <div className="min-w-0">
            <p className="font-semibold text-ink">
              {m.name} <span className="font-mono text-xs font-normal text-muted">{m.code}</span>
            </p>
            {(m.note || m.reason !== 'none') && <p className="text-sm text-ink">{m.note ?? REASON_LABELS[m.reason]}</p>}
            <p className="text-xs text-muted">
              <RelativeTime value={m.since} mode="elapsed" prefix="for" />
              {m.expectedReturnAt && (
                <>
                  {' · expected back '}
                  <RelativeTime value={m.expectedReturnAt} />
                </>
              )}
            </p>
          </div>
          <StateBadge status={m.status} size="sm" />
        </li>
      ))}
    </ul>
  );
}
