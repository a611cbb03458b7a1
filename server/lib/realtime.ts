import type { Server as HttpServer, IncomingMessage, ServerResponse } from 'node:http';
import { Server, type ServerOptions, type Socket } from 'socket.io';
import type { RequestHandler } from 'express';
import type { PassportStatic } from 'passport';
import { isStaff } from '../../shared/roles';
import { ticketRoom, type ClientToServerEvents, type ServerToClientEvents } from '../../shared/events';
import type { Audience, DomainEvent, DomainEvents } from './events';
import type { Logger } from './logger';
import type { AuthUser } from './http';

/**
 * The one place that maps domain events to socket rooms:
 *   all         every signed-in user and every lobby display (board entries, board changes)
 *   staff       technicians, managers, admins (staff lists, internal notes, triage changes)
 *   ticket:<id> sockets whose page shows that ticket (joined on request, access checked)
 *   user:<id>   one person (their notices); session:<sid> one browser session (sign-out)
 *   display:<id> one lobby display link (revocation)
 * Which rooms a socket is in is decided only by `roomsOf`, from a checked identity: on a new
 * connection and on a recovered one alike.
 */
export interface SocketData {
  displayLinkId?: number;
  userId?: number;
}
export type RealtimeServer = Server<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>;
type RealtimeSocket = Socket<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>;

let io: RealtimeServer | null = null;

export function roomsFor(audience: Audience): string[] {
  if (audience === 'all') return ['all'];
  if (audience === 'staff') return ['staff'];
  if ('ticket' in audience) return audience.staffOnly ? ['staff'] : ['staff', ticketRoom(audience.ticket)];
  return audience.users.map((id) => `user:${id}`);
}

type Req = IncomingMessage & {
  user?: AuthUser;
  sessionID?: string;
  session?: { signedInAt?: number; lastSeenAt?: number };
  _query?: Record<string, string>;
};

export interface RealtimeOptions {
  allowedOrigins: string[];
  session: RequestHandler;
  passport: PassportStatic;
  events: DomainEvents;
  log: Logger;
  /** Resolves a lobby display key to its link id, or null when unknown or revoked. */
  verifyDisplayKey: (key: string) => Promise<number | null>;
  /** False when the handshake's session is past its idle or absolute lifetime. */
  sessionCurrent: (session: { signedInAt?: number; lastSeenAt?: number }) => boolean;
  /** Whether this user may see that ticket (its page, and so its room). */
  mayWatchTicket: (user: AuthUser, ticketId: number) => Promise<boolean>;
  /** socket.io's Redis adapter when several processes share the sockets (REDIS_URL). */
  adapter?: ServerOptions['adapter'];
}

/** Who is on the other end, decided from this handshake only (never from a restored session). */
type Identity = { kind: 'user'; user: AuthUser; sessionId: string | undefined } | { kind: 'display'; linkId: number };

function roomsOf(identity: Identity): string[] {
  if (identity.kind === 'display') return ['all', `display:${identity.linkId}`];
  const rooms = ['all', `user:${identity.user.id}`];
  if (identity.sessionId) rooms.push(`session:${identity.sessionId}`);
  if (isStaff(identity.user.role)) rooms.push('staff');
  return rooms;
}

export function attachRealtime(server: HttpServer, opts: RealtimeOptions): RealtimeServer {
  const instance: RealtimeServer = new Server(server, {
    path: '/socket.io',
    serveClient: false,
    // Only our own pages may open a socket (the handshake carries the session cookie).
    allowRequest: (req, callback) => {
      const origin = req.headers.origin;
      callback(null, !origin || opts.allowedOrigins.includes(origin));
    },
    // A short network drop keeps the socket's id and the events it missed, but a recovered
    // socket is checked like a new one: the middleware below runs again (socket.io skips it by
    // default), and the missed events are held back until the check has passed.
    connectionStateRecovery: { maxDisconnectionDuration: 2 * 60_000, skipMiddlewares: false },
    ...(opts.adapter ? { adapter: opts.adapter } : {}),
  });
  const onlyForHandshake = (middleware: RequestHandler) => (req: Req, res: ServerResponse, next: (err?: unknown) => void) => {
    if (req._query?.sid === undefined)
      (middleware as unknown as (a: Req, b: ServerResponse, c: (err?: unknown) => void) => void)(req, res, next);
    else next();
  };
  instance.engine.use(onlyForHandshake(opts.session));
  instance.engine.use(onlyForHandshake(opts.passport.session() as RequestHandler));

  // Missed events of a recovered socket, keyed by its id, with the rooms they were chosen for.
  const heldBack = new Map<string, { rooms: Set<string>; packets: unknown[][] }>();
  const adapter = instance.of('/').adapter;
  const restoreSession = adapter.restoreSession.bind(adapter);
  adapter.restoreSession = async (pid, offset) => {
    const session = await restoreSession(pid, offset);
    if (!session) return session;
    heldBack.set(session.sid, { rooms: new Set(session.rooms), packets: session.missedPackets });
    // Dropped unless the socket reaches the connection handler (a refused socket never does).
    setTimeout(() => heldBack.delete(session.sid), 30_000).unref();
    return { ...session, missedPackets: [] };
  };

  const identities = new WeakMap<RealtimeSocket, Identity>();
  instance.use(async (socket, next) => {
    const req = socket.request as Req;
    if (req.user && req.session && opts.sessionCurrent(req.session)) {
      identities.set(socket, { kind: 'user', user: req.user, sessionId: req.sessionID });
      return next();
    }
    const key = typeof socket.handshake.auth?.displayKey === 'string' ? socket.handshake.auth.displayKey : null;
    if (key) {
      try {
        const linkId = await opts.verifyDisplayKey(key);
        if (linkId) {
          identities.set(socket, { kind: 'display', linkId });
          return next();
        }
      } catch (error) {
        opts.log.warn({ err: String(error) }, 'display key check failed');
      }
    }
    heldBack.delete(socket.id);
    if (socket.recovered) opts.log.info({ socket: socket.id }, 'recovered socket refused: no valid session or display key');
    next(new Error('unauthorized'));
  });

  instance.on('connection', async (socket) => {
    const identity = identities.get(socket);
    if (!identity) {
      // Never happens while the middleware runs for every socket; refuse rather than trust.
      socket.disconnect(true);
      return;
    }
    socket.data = identity.kind === 'user' ? { userId: identity.user.id } : { displayLinkId: identity.linkId };
    if (identity.kind === 'user') {
      socket.on('ticket.watch', async (ticketId, ack) => {
        const ok = Number.isInteger(ticketId) && ticketId > 0 && (await opts.mayWatchTicket(identity.user, ticketId).catch(() => false));
        if (ok && socket.connected) socket.join(ticketRoom(ticketId));
        if (typeof ack === 'function') ack({ ok });
      });
      socket.on('ticket.unwatch', (ticketId) => {
        if (Number.isInteger(ticketId)) socket.leave(ticketRoom(ticketId));
      });
    }

    const rooms = new Set(roomsOf(identity));
    const held = heldBack.get(socket.id);
    heldBack.delete(socket.id);
    if (socket.recovered) {
      // Rooms restored from before the drop are re-decided. Leave them all at once, before
      // anything asynchronous, so no broadcast reaches the socket meanwhile; a ticket room is
      // joined again only if this user may still see the ticket.
      const restored = [...socket.rooms].filter((room) => room !== socket.id && !rooms.has(room));
      for (const room of restored) socket.leave(room);
      if (identity.kind === 'user') {
        for (const room of restored) {
          const ticketId = room.startsWith('ticket:') ? Number(room.slice('ticket:'.length)) : NaN;
          if (Number.isInteger(ticketId) && (await opts.mayWatchTicket(identity.user, ticketId).catch(() => false))) rooms.add(room);
        }
      }
    }
    if (!socket.connected) return;
    socket.join([...rooms]);
    // Missed events were chosen for the old rooms; hand them over only when the socket may
    // still be in all of those rooms. Otherwise the client's refetch after a reconnect covers it.
    if (held && [...held.rooms].every((room) => room === socket.id || rooms.has(room))) {
      for (const [event, ...args] of held.packets as [string, ...unknown[]][]) {
        (socket.emit as (event: string, ...args: unknown[]) => boolean)(event, ...args);
      }
    }
  });

  const unsubscribe = opts.events.subscribe((event: DomainEvent) => {
    (instance.to(roomsFor(event.audience)).emit as (event: string, payload: unknown) => boolean)(event.type, event.payload);
  });
  instance.on('close', () => void unsubscribe());
  io = instance;
  return instance;
}

// These reach sockets on every process when the Redis adapter is in use.
export function disconnectSession(sid: string) {
  io?.in(`session:${sid}`).disconnectSockets(true);
}

export function disconnectUser(userId: number) {
  io?.in(`user:${userId}`).disconnectSockets(true);
}

export function disconnectDisplay(linkId: number) {
  io?.in(`display:${linkId}`).disconnectSockets(true);
}
