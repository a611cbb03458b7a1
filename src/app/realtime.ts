import { useEffect } from 'react';
import { useQueryClient, type QueryClient, type QueryKey } from '@tanstack/react-query';
import type { BoardToolChange, ServerEventName, ServerEventPayload, ServerToClientEvents } from '@shared/events';
import type { BoardData, ToolDetail } from '@shared/schemas/facility';
import { openSocket, closeSocket, type RealtimeSocket } from '@/lib/socket';
import { boardKeys } from '@/features/board/api/get-board';
import { displayKeys } from '@/features/display/api/display-keys';
import { toolKeys } from '@/features/tools/api/tool-keys';
import { adminKeys } from '@/features/facility-admin/api/admin-keys';
import { noticeKeys } from '@/features/notices/api/notice-keys';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';

// The one table from server event to what it does to the caches (events: shared/events.ts).
// A board change carries the tool's new entry: it is written into the board, the lobby
// display's board and the tool page with setQueryData, so no client refetches for it. Every
// other event only announces a change; the queries it names are invalidated, which refetches
// only those on screen. Keys come from the features' key factories, never written by hand.

export interface RealtimeContext {
  queryClient: QueryClient;
  /** Invalidate these keys soon, folded with the other announcements of the same burst. */
  invalidate: (keys: QueryKey[]) => void;
}

type EventHandlers = { [E in ServerEventName]: (payload: ServerEventPayload<E>, ctx: RealtimeContext) => void };

/**
 * The board with one tool's new entry and the new counts; null when the entry does not fit
 * the cached board (a new tool, or one moved to another area): then the board is refetched.
 */
export function withBoardChange(board: BoardData, change: BoardToolChange): BoardData | null {
  let found = false;
  const areas = board.areas.map((area) => {
    const at = area.tools.findIndex((t) => t.id === change.tool.id);
    if (at < 0) return area;
    found = area.id === change.tool.areaId;
    const tools = [...area.tools];
    tools[at] = change.tool;
    return { ...area, tools };
  });
  if (!found) return null;
  return { ...board, areas, counts: change.counts, total: change.total };
}

function openTicketsBefore(queryClient: QueryClient, change: BoardToolChange): number | undefined {
  const board = queryClient.getQueryData<BoardData>(boardKeys.current());
  const onBoard = board?.areas.flatMap((a) => a.tools).find((t) => t.id === change.tool.id);
  return onBoard?.openTickets ?? queryClient.getQueryData<ToolDetail>(toolKeys.detail(change.tool.code))?.openTickets;
}

function applyBoardToolChange(change: BoardToolChange, { queryClient, invalidate }: RealtimeContext) {
  const ticketsBefore = openTicketsBefore(queryClient, change);
  for (const key of [boardKeys.current(), displayKeys.boards()]) {
    for (const [queryKey, board] of queryClient.getQueriesData<BoardData>({ queryKey: key })) {
      if (!board) continue;
      const next = withBoardChange(board, change);
      if (next) queryClient.setQueryData(queryKey, next);
      else invalidate([queryKey]);
    }
  }
  // The tool page is the board entry plus its own parts (engineers, 30-day availability…).
  queryClient.setQueryData<ToolDetail>(toolKeys.detail(change.tool.code), (page) =>
    page ? { ...page, ...change.tool, setBy: change.stateSetBy === undefined ? page.setBy : change.stateSetBy } : page,
  );
  if (change.stateSetBy !== undefined) {
    // Lists that show the change itself: the tool's state log, and ticket pages showing its state.
    invalidate([toolKeys.historiesOf(change.tool.id), ticketKeys.details()]);
    // The 30-day availability moved a little: fresh on the next visit, no request now.
    void queryClient.invalidateQueries({ queryKey: toolKeys.detail(change.tool.code), refetchType: 'none' });
  }
  if (ticketsBefore !== undefined && ticketsBefore !== change.tool.openTickets) invalidate([ticketKeys.lists()]);
}

export const REALTIME_EVENTS: EventHandlers = {
  'board.tool_changed': applyBoardToolChange,
  'facility.updated': (_p, { invalidate }) => invalidate([boardKeys.all, displayKeys.boards(), toolKeys.all, adminKeys.all]),
  'ticket.created': (_p, { invalidate }) => invalidate([ticketKeys.lists()]),
  'ticket.updated': (p, { invalidate }) => invalidate([ticketKeys.detail(p.id), ticketKeys.lists()]),
  'notice.created': (_p, { invalidate }) => invalidate([noticeKeys.all]),
  'notice.read': (_p, { invalidate }) => invalidate([noticeKeys.all]),
  'service_targets.updated': (_p, { invalidate }) => invalidate([ticketKeys.all]),
  // Tool pages and ticket alarm panels; the board's alarm line came with 'board.tool_changed'.
  'alarm.changed': (_p, { invalidate }) => invalidate([alarmKeys.all]),
  'maintenance.changed': (_p, { invalidate }) => invalidate([maintenanceKeys.all]),
  'maintenance.window_changed': (_p, { invalidate }) => invalidate([maintenanceKeys.all]),
};

// A burst of announcements (a facility-wide power dip) is folded into one round of refetches.
const BATCH_MS = 150;

function createBatcher(queryClient: QueryClient) {
  const pending = new Map<string, QueryKey>();
  let timer: ReturnType<typeof setTimeout> | null = null;
  return {
    add(keys: QueryKey[]) {
      for (const key of keys) pending.set(JSON.stringify(key), key);
      timer ??= setTimeout(() => {
        timer = null;
        const keysNow = [...pending.values()];
        pending.clear();
        for (const queryKey of keysNow) void queryClient.invalidateQueries({ queryKey });
      }, BATCH_MS);
    },
    cancel() {
      if (timer) clearTimeout(timer);
      timer = null;
      pending.clear();
    },
  };
}

function listenTo<E extends ServerEventName>(socket: RealtimeSocket, event: E, ctx: RealtimeContext) {
  const handler = ((payload: ServerEventPayload<E>) => REALTIME_EVENTS[event](payload, ctx)) as ServerToClientEvents[E];
  // socket.io's typed on/off cannot follow a generic event name; the table's type checks it.
  const untyped = socket as unknown as { on(e: string, h: unknown): void; off(e: string, h: unknown): void };
  untyped.on(event, handler);
  return () => untyped.off(event, handler);
}

function listen(socket: RealtimeSocket, ctx: RealtimeContext) {
  const offs = (Object.keys(REALTIME_EVENTS) as ServerEventName[]).map((event) => listenTo(socket, event, ctx));
  return () => offs.forEach((off) => off());
}

export interface RealtimeOptions {
  /** A lobby display's key: its socket is identified by the key instead of a session. */
  displayKey?: string;
  /** The server cut the socket off or refused it: check whether the session (or key) still holds. */
  onRefused: () => void;
  enabled?: boolean;
}

/**
 * Mount once per page (the signed-in layout, the lobby display). Opens the socket, applies
 * every event through the table above, and after a reconnect refetches what is on screen
 * once, since events sent while the connection was down may have been missed.
 */
export function useRealtime({ displayKey, onRefused, enabled = true }: RealtimeOptions): void {
  const queryClient = useQueryClient();

  useEffect(() => {
    if (!enabled) return;
    const socket = openSocket({ displayKey });
    const batcher = createBatcher(queryClient);
    const stopListening = listen(socket, { queryClient, invalidate: (keys) => batcher.add(keys) });

    let connectedBefore = socket.connected;
    let retry: ReturnType<typeof setTimeout> | null = null;
    const onConnect = () => {
      if (connectedBefore) void queryClient.invalidateQueries();
      connectedBefore = true;
    };
    const onDisconnect = (reason: string) => {
      if (reason === 'io server disconnect') onRefused();
    };
    const onConnectError = () => {
      if (socket.active) return;
      onRefused();
      // A refused handshake is not retried by socket.io. A wall screen tries again later (its
      // key may be fine and the server only restarting); a person's page goes to sign-in.
      if (displayKey && !retry) {
        retry = setTimeout(() => {
          retry = null;
          socket.connect();
        }, 15_000);
      }
    };
    socket.on('connect', onConnect);
    socket.on('disconnect', onDisconnect);
    socket.on('connect_error', onConnectError);
    return () => {
      if (retry) clearTimeout(retry);
      batcher.cancel();
      stopListening();
      closeSocket();
    };
  }, [queryClient, displayKey, onRefused, enabled]);
}

/** While a ticket's page is open, its socket receives that ticket's changes (room ticket:<id>). */
export function useTicketRoom(ticketId: number): void {
  useEffect(() => {
    if (!Number.isInteger(ticketId) || ticketId <= 0) return;
    const socket = openSocket();
    // A new connection (after a drop the server could not recover) starts without the room.
    const watch = () => socket.emit('ticket.watch', ticketId);
    if (socket.connected) watch();
    socket.on('connect', watch);
    return () => {
      socket.off('connect', watch);
      socket.emit('ticket.unwatch', ticketId);
    };
  }, [ticketId]);
}
