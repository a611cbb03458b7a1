import { useSyncExternalStore } from 'react';
import { io, type Socket } from 'socket.io-client';
import type { ClientToServerEvents, ServerToClientEvents } from '@shared/events';

// The page's one socket: a signed-in user's (session cookie) or a lobby display's (its key).
// Typed by the event catalogue in shared/events.ts. What each event does to the caches is
// decided in src/app/realtime.ts; this file only connects and reports the connection's state.

export type RealtimeSocket = Socket<ServerToClientEvents, ClientToServerEvents>;
export type RealtimeStatus = 'off' | 'connecting' | 'live' | 'reconnecting';

let socket: RealtimeSocket | null = null;
let status: RealtimeStatus = 'off';
const statusListeners = new Set<() => void>();

function setStatus(next: RealtimeStatus): void {
  if (next === status) return;
  status = next;
  for (const listener of statusListeners) listener();
}

/** The page's socket, created on first use; `displayKey` makes it a lobby display's. */
export function openSocket(opts: { displayKey?: string } = {}): RealtimeSocket {
  if (socket) return socket;
  const s: RealtimeSocket = io({
    path: '/socket.io',
    withCredentials: true,
    autoConnect: false,
    // A fresh manager per sign-in, so nothing of a previous user's connection is reused.
    forceNew: true,
    ...(opts.displayKey ? { auth: { displayKey: opts.displayKey } } : {}),
  });
  socket = s;
  setStatus('connecting');
  s.on('connect', () => setStatus('live'));
  s.on('disconnect', () => setStatus(s.active ? 'reconnecting' : 'off'));
  s.on('connect_error', () => setStatus(s.active ? 'reconnecting' : 'off'));
  s.connect();
  return s;
}

/** Closes the socket; called at sign-out and when the page that opened it goes away. */
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
