import { io, type Socket } from 'socket.io-client';
import type { ClientToServerEvents, ServerToClientEvents } from '../../shared/events';

export type TestSocket = Socket<ServerToClientEvents, ClientToServerEvents>;

export interface Heard {
  event: string;
  args: unknown[];
}

/**
 * A real socket.io client, by session cookie or display key. `packets` records every event
 * packet that reached this client, also those that arrived before (or without) a successful
 * connect, so a test sees what travelled over the wire, not only what the client accepted.
 */
export function openTestSocket(
  url: string,
  opts: { cookie?: string; displayKey?: string; recovery?: Recovery; reconnection?: boolean } = {},
) {
  const socket: TestSocket = io(url, {
    path: '/socket.io',
    transports: ['websocket'],
    forceNew: true,
    reconnection: opts.reconnection ?? false,
    ...(opts.cookie ? { extraHeaders: { cookie: opts.cookie } } : {}),
    ...(opts.displayKey ? { auth: { displayKey: opts.displayKey } } : {}),
  });
  // What socket.io-client itself sends when it reconnects after a drop (its CONNECT packet
  // carries the previous session's id and the offset of the last event it received).
  if (opts.recovery) Object.assign(socket, { _pid: opts.recovery.pid, _lastOffset: opts.recovery.offset });
  const packets: Heard[] = [];
  socket.io.on('packet', (packet: { type: number; data?: unknown[] }) => {
    if (packet.type === 2 && Array.isArray(packet.data)) packets.push({ event: String(packet.data[0]), args: packet.data.slice(1) });
  });
  return { socket, packets };
}

export function connected(socket: TestSocket): Promise<void> {
  return new Promise((resolve, reject) => {
    if (socket.connected) return resolve();
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });
}

/** Polls until `check` holds; a deadline, not a duration assertion. */
export async function waitUntil(check: () => boolean | Promise<boolean>, ms = 3000, what = 'the condition') {
  const end = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** The connection-state recovery id and offset the client would send after a short drop. */
export interface Recovery {
  pid: string;
  offset: string;
}

export function recoveryOf(socket: TestSocket): Recovery {
  const s = socket as unknown as { _pid?: string; _lastOffset?: string };
  if (!s._pid || !s._lastOffset) throw new Error('the socket has no recovery state yet (it needs to have received an event)');
  return { pid: s._pid, offset: s._lastOffset };
}

/** Drops the connection as a network failure would (the server keeps the state for recovery). */
export function dropConnection(socket: TestSocket) {
  (socket.io.engine as unknown as { close(): void }).close();
}
