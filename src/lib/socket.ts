import { useEffect, useSyncExternalStore } from 'react';
import { io, type Socket } from 'socket.io-client';
import { useQueryClient, type QueryClient, type QueryKey } from '@tanstack/react-query';
import { reportSessionMayHaveEnded } from '@/lib/api-client';
import { boardKeys } from '@/features/board/api/get-board';
import { toolKeys } from '@/features/tools/api/tool-keys';
import { adminKeys } from '@/features/facility-admin/api/admin-keys';
import { noticeKeys } from '@/features/notices/api/notice-keys';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

// The socket only announces that something changed; screens refetch what they show.
// That keeps permission checks in one place (the API) and avoids a second data path.

/** What the server sends with every event: the id of what changed, and perhaps more. */
export type RealtimePayload = { id: number | string } & Record<string, unknown>;

type Invalidation = (payload: RealtimePayload) => QueryKey[];

/**
 * The one table from server event to the queries it makes stale. Add a line per event a
 * feature cares about, using that feature's key factory, e.g.
 *   'ticket.updated': (p) => [ticketKeys.detail(p.id), ticketKeys.lists()],
 */
export const REALTIME_INVALIDATIONS: Record<string, Invalidation> = {
  'notice.created': () => [['notices']],
  'notice.read': () => [noticeKeys.all],
  // Ticket pages show the tool's state too.
  'tool.state_changed': () => [boardKeys.all, toolKeys.all, ticketKeys.details()],
  'facility.updated': () => [boardKeys.all, toolKeys.all, adminKeys.all],
  // The board and tool pages count open tickets.
  'ticket.created': () => [ticketKeys.lists(), boardKeys.all, toolKeys.all],
  'ticket.updated': (p) => [ticketKeys.detail(Number(p.id)), ticketKeys.lists(), boardKeys.all, toolKeys.all],
  'service_targets.updated': () => [ticketKeys.all],
};

export type RealtimeStatus = 'off' | 'connecting' | 'live' | 'reconnecting';

let socket: Socket | null = null;
let status: RealtimeStatus = 'off';
const statusListeners = new Set<() => void>();

function setStatus(next: RealtimeStatus): void {
  if (next === status) return;
  status = next;
  for (const listener of statusListeners) listener();
}

/** The socket of the signed-in user, created on first use. */
export function openSocket(): Socket {
  if (socket) return socket;
  socket = io({
    path: '/socket.io',
    withCredentials: true,
    autoConnect: false,
    // A fresh manager per sign-in, so nothing of a previous user's connection is reused.
    forceNew: true,
  });
  setStatus('connecting');
  socket.on('connect', () => setStatus('live'));
  socket.on('disconnect', () => setStatus(socket?.active ? 'reconnecting' : 'off'));
  socket.on('connect_error', () => setStatus(socket?.active ? 'reconnecting' : 'off'));
  socket.connect();
  return socket;
}

/** Closes the socket; called at sign-out and when the protected layout goes away. */
export function closeSocket(): void {
  if (!socket) return;
  socket.removeAllListeners();
  socket.io.removeAllListeners();
  socket.disconnect();
  socket = null;
  setStatus('off');
}

function subscribeStatus(listener: () => void): () => void {
  statusListeners.add(listener);
  return () => statusListeners.delete(listener);
}

/** Whether live updates are flowing, for a small indicator in the layout. */
export function useRealtimeStatus(): RealtimeStatus {
  return useSyncExternalStore(
    subscribeStatus,
    () => status,
    () => 'off',
  );
}

// A burst of events (a facility-wide power dip changes dozens of tools at once) is folded
// into one round of invalidations instead of one refetch per event.
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

/**
 * Mount once, inside the signed-in part of the app. Opens the socket, turns server events
 * into query invalidations, and after a reconnect refetches everything on screen, since
 * events sent while the connection was down are lost.
 */
export function useRealtimeInvalidation(): void {
  const queryClient = useQueryClient();

  useEffect(() => {
    const s = openSocket();
    const batcher = createBatcher(queryClient);

    const handlers = Object.entries(REALTIME_INVALIDATIONS).map(([event, toKeys]) => {
      const handler = (payload: RealtimePayload) => batcher.add(toKeys(payload));
      s.on(event, handler);
      return [event, handler] as const;
    });

    const onReconnect = () => void queryClient.invalidateQueries();
    s.io.on('reconnect', onReconnect);

    // The server cut us off on purpose (session ended, account disabled) or refused the
    // handshake: ask the API who we are; if nobody, the router goes to sign-in.
    const onDisconnect = (reason: Socket.DisconnectReason) => {
      if (reason === 'io server disconnect') reportSessionMayHaveEnded();
    };
    const onConnectError = () => {
      if (!s.active) reportSessionMayHaveEnded();
    };
    s.on('disconnect', onDisconnect);
    s.on('connect_error', onConnectError);

    return () => {
      batcher.cancel();
      for (const [event, handler] of handlers) s.off(event, handler);
      s.io.off('reconnect', onReconnect);
      s.off('disconnect', onDisconnect);
      s.off('connect_error', onConnectError);
      closeSocket();
    };
  }, [queryClient]);
}
