import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router';
import { TICKET_LIST_STATUSES, type TicketListQuery, type TicketListStatus } from '@shared/schemas/tickets';

export const QUEUE_TOGGLES = ['mine', 'myTools', 'unassigned', 'hazard', 'waiting'] as const;
export type QueueToggle = (typeof QUEUE_TOGGLES)[number];

export const TOGGLE_LABELS: Record<QueueToggle, string> = {
  mine: 'Assigned to me',
  myTools: 'My tools',
  unassigned: 'Unassigned',
  hazard: 'Hazard',
  waiting: 'Waiting',
};

export const QUEUE_PAGE_SIZE = 25;

/** The queue's filters live in the address, so a filtered queue can be bookmarked and shared. */
export function useQueueFilters() {
  const [params, setParams] = useSearchParams();

  const filters = useMemo<TicketListQuery>(() => {
    const status = params.get('status');
    const f: TicketListQuery = {
      status: status && (TICKET_LIST_STATUSES as readonly string[]).includes(status) ? (status as TicketListStatus) : 'open',
      sort: 'queue',
      limit: QUEUE_PAGE_SIZE,
      offset: Math.max(0, Number(params.get('offset')) || 0),
    };
    for (const t of QUEUE_TOGGLES) if (params.get(t) === 'true') f[t] = 'true';
    const toolId = Number(params.get('toolId'));
    if (toolId > 0) f.toolId = toolId;
    const areaId = Number(params.get('areaId'));
    if (areaId > 0) f.areaId = areaId;
    return f;
  }, [params]);

  const update = useCallback(
    (change: Record<string, string | null>) => {
      setParams(
        (old) => {
          const next = new URLSearchParams(old);
          for (const [k, v] of Object.entries(change)) {
            if (v === null || v === '') next.delete(k);
            else next.set(k, v);
          }
          // Any change of filter starts again at the first page.
          if (!('offset' in change)) next.delete('offset');
          return next;
        },
        { replace: true },
      );
    },
    [setParams],
  );

  return { filters, update, clear: () => setParams(new URLSearchParams(), { replace: true }) };
}
