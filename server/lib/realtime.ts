import type { Server as HttpServer, IncomingMessage, ServerResponse } from 'node:http';
import { Server, type Socket } from 'socket.io';
import type { RequestHandler } from 'express';
import type { PassportStatic } from 'passport';
import { isStaff } from '../../shared/roles';
import type { DomainEvent, DomainEvents } from './events';
import type { Logger } from './logger';
import type { AuthUser } from './http';

/**
 * The one place that maps domain events to socket rooms:
 *   all       every signed-in user and every lobby display (board-level announcements)
 *   staff     technicians, managers, admins (internal notes and triage-only changes)
 *   user:<id> one person (their notices); session:<sid> one browser session (sign-out)
 * Sockets carry only "what changed" ids; clients refetch through the API and its rules.
 */
let io: Server | null = null;

export function roomsFor(event: DomainEvent): string[] {
  if (event.audience === 'all') return ['all'];
  if (event.audience === 'staff') return ['staff'];
  return event.audience.users.map((id) => `user:${id}`);
}

type Req = IncomingMessage & { user?: AuthUser; sessionID?: string; _query?: Record<string, string> };

export interface RealtimeOptions {
  allowedOrigins: string[];
  session: RequestHandler;
  passport: PassportStatic;
  events: DomainEvents;
  log: Logger;
  /** Resolves a lobby display key to its link id, or null when unknown or revoked. */
  verifyDisplayKey: (key: string) => Promise<number | null>;
}

export function attachRealtime(server: HttpServer, opts: RealtimeOptions) {
  const instance = new Server(server, {
    path: '/socket.io',
    serveClient: false,
    // Only our own pages may open a socket (the handshake carries the session cookie).
    allowRequest: (req, callback) => {
      const origin = req.headers.origin;
      callback(null, !origin || opts.allowedOrigins.includes(origin));
    },
    connectionStateRecovery: { maxDisconnectionDuration: 2 * 60_000 },
  });
  const onlyForHandshake = (middleware: RequestHandler) => (req: Req, res: ServerResponse, next: (err?: unknown) => void) => {
    if (req._query?.sid === undefined)
      (middleware as unknown as (a: Req, b: ServerResponse, c: (err?: unknown) => void) => void)(req, res, next);
    else next();
  };
  instance.engine.use(onlyForHandshake(opts.session));
  instance.engine.use(onlyForHandshake(opts.passport.session() as RequestHandler));

  instance.use(async (socket, next) => {
    const req = socket.request as Req;
    if (req.user) return next();
    const key = typeof socket.handshake.auth?.displayKey === 'string' ? socket.handshake.auth.displayKey : null;
    if (key) {
      try {
        const linkId = await opts.verifyDisplayKey(key);
        if (linkId) {
          socket.data.displayLinkId = linkId;
          return next();
        }
      } catch (error) {
        opts.log.warn({ err: String(error) }, 'display key check failed');
      }
    }
    next(new Error('unauthorized'));
  });

  instance.on('connection', (socket: Socket) => {
    const req = socket.request as Req;
    if (req.user) {
      socket.join(['all', `user:${req.user.id}`]);
      if (req.sessionID) socket.join(`session:${req.sessionID}`);
      if (isStaff(req.user.role)) socket.join('staff');
    } else if (socket.data.displayLinkId) {
      socket.join(['all', `display:${socket.data.displayLinkId}`]);
    }
  });

  const unsubscribe = opts.events.subscribe((event) => {
    instance.to(roomsFor(event)).emit(event.type, event.payload);
  });
  instance.on('close', unsubscribe);
  io = instance;
  return instance;
}

export function disconnectSession(sid: string) {
  io?.in(`session:${sid}`).disconnectSockets(true);
}

export function disconnectUser(userId: number) {
  io?.in(`user:${userId}`).disconnectSockets(true);
}

export function disconnectDisplay(linkId: number) {
  io?.in(`display:${linkId}`).disconnectSockets(true);
}
