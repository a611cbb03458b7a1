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

/** The address parameters that say which page is shown (cleared when a filter changes). */
export const PAGE_PARAMS = ['offset', 'after', 'before', 'last'] as const;

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
    // Next and Previous go "after" or "before" a ticket (keyset paging), Last reads from the end;
    // `offset` then only tells the page's position, and is absent when it is not known.
    const after = Number(params.get('after'));
    const before = Number(params.get('before'));
    if (after > 0) f.after = after;
    else if (before > 0) f.before = before;
    else if (params.get('last') === 'true') f.last = 'true';
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
          if (!PAGE_PARAMS.some((p) => p in change)) for (const p of PAGE_PARAMS) next.delete(p);
          return next;
        },
        { replace: true },
      );
    },
    [setParams],
  );

  /** Whether the address says where the page is (after Last on a capped list it does not). */
  const positionKnown = params.has('offset') || !(filters.after || filters.before || filters.last);
  return { filters, positionKnown, update, clear: () => setParams(new URLSearchParams(), { replace: true }) };
}
