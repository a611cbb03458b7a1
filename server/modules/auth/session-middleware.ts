import session from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import crypto from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import type { Sequelize } from 'sequelize';
import type { Config } from '../../config';
import { findAccountById, type Person } from '../users/user-directory';
import type { AuthUser } from '../../lib/http';
import { AppError } from '../../lib/errors';
import { securityLog, type Logger } from '../../lib/logger';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
    /** When the user signed in: the absolute lifetime counts from here (express-session has none). */
    signedInAt?: number;
    lastSeenAt?: number;
  }
}

export const SESSION_COOKIE = 'faultline.sid';
/** Holds a signed-out visitor's CSRF nonce, so that no session row is needed before sign-in. */
export const CSRF_COOKIE = 'faultline.csrf';

export function toAuthUser(u: Pick<Person, 'id' | 'email' | 'name' | 'role'>): AuthUser {
  return { id: u.id, email: u.email, name: u.name, role: u.role };
}

/**
 * Sessions live in MariaDB (table sessions), never in process memory. A row is written only
 * when there is something to keep (saveUninitialized: false; signed-out visitors get their
 * CSRF token from a cookie), and a signed-in session is written at most about once a minute:
 * no touch on every request (disableTouch, rolling off); sessionLifetime refreshes lastSeenAt
 * once a minute, and that save moves the row's and the cookie's expiry on.
 */
export function createSessionMiddleware(config: Config, sequelize: Sequelize) {
  const SequelizeStore = connectSessionSequelize(session.Store);
  const options = {
    db: sequelize,
    table: 'Session',
    // user_id lets "end every session of this user" be a single DELETE.
    extendDefaultFields: (defaults: { data: string; expires: Date }, s: { passport?: { user?: number } }) => ({
      data: defaults.data,
      expires: defaults.expires,
      userId: s.passport?.user ?? null,
    }),
    checkExpirationInterval: 15 * 60 * 1000,
    expiration: config.SESSION_IDLE_MINUTES * 60 * 1000,
    // No UPDATE of every unchanged session on every request (the store's option; its typings lack it).
    disableTouch: true,
  };
  const store = new SequelizeStore(options);
  const middleware = session({
    name: SESSION_COOKIE,
    secret: config.SESSION_SECRET,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: false,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.cookieSecure,
      maxAge: config.SESSION_IDLE_MINUTES * 60 * 1000,
      path: '/',
    },
  });
  return { middleware, store };
}

export function configurePassport() {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (_e, _p, done) => {
      // Sign-in runs through auth.service and startSession below; this
      // strategy exists so passport's session support has its usual shape.
      done(null, false);
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as AuthUser).id));
  passport.deserializeUser((id: number, done) => {
    findAccountById(id)
      // A disabled or deleted user's session no longer signs anyone in.
      .then((u) => done(null, u && u.active ? toAuthUser(u) : false))
      .catch((error) => done(error));
  });
  return passport;
}

/** Starts a session for a user whose sign-in was checked: a brand-new session id (the old one is dead). */
export async function startSession(
  req: Request,
  user: AuthUser,
  method: 'password' | 'mailed_link',
  log: Logger,
): Promise<{ user: AuthUser; csrfToken: string }> {
  // passport 0.7 regenerates the session inside req.login: a new id, the old one destroyed.
  await new Promise<void>((resolve, reject) => req.login(user, (error) => (error ? reject(error) : resolve())));
  const now = Date.now();
  const csrfToken = newCsrfToken();
  req.session.csrfToken = csrfToken;
  req.session.signedInAt = now;
  req.session.lastSeenAt = now;
  await new Promise<void>((resolve, reject) => req.session.save((error) => (error ? reject(error) : resolve())));
  securityLog(log, req, 'sign_in_succeeded', { method });
  return { user, csrfToken };
}

/** Ends the session on the server and returns its id; the caller disconnects its sockets. */
export async function endSession(req: Request, log: Logger): Promise<string> {
  const sid = req.sessionID;
  securityLog(log, req, 'signed_out');
  await new Promise<void>((resolve, reject) => req.logout({ keepSessionInfo: false }, (error) => (error ? reject(error) : resolve())));
  await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
  return sid;
}

/** How often a busy session's last-seen time (and so its row) is written: at most once a minute. */
export function sessionTouchMs(config: Config) {
  return Math.min(60_000, (config.SESSION_IDLE_MINUTES * 60_000) / 4);
}

/** Whether a signed-in session is past its idle or absolute lifetime (requests and sockets alike). */
export function sessionExpired(config: Config, s: { signedInAt?: number; lastSeenAt?: number }, now = Date.now()): boolean {
  const idleMs = config.SESSION_IDLE_MINUTES * 60_000;
  const absoluteMs = config.SESSION_ABSOLUTE_HOURS * 3_600_000;
  return Boolean((s.signedInAt && now - s.signedInAt > absoluteMs) || (s.lastSeenAt && now - s.lastSeenAt > idleMs));
}

/**
 * Idle and absolute lifetimes, checked on the server on every request. lastSeenAt is moved on
 * only when it is older than the touch interval, so the idle timeout may end a session up to
 * that much early, never late.
 */
export function sessionLifetime(config: Config, log: Logger): RequestHandler {
  const touchMs = sessionTouchMs(config);
  return (req, _res, next) => {
    const s = req.session;
    if (!req.user || !s) return next();
    const now = Date.now();
    if (sessionExpired(config, s, now)) {
      securityLog(log, req, 'session_expired');
      return s.destroy(() => next(new AppError(401, 'session_expired', 'Your session has ended. Please sign in again.')));
    }
    if (!s.lastSeenAt || now - s.lastSeenAt >= touchMs) s.lastSeenAt = now;
    next();
  };
}

export function newCsrfToken() {
  return crypto.randomBytes(32).toString('base64url');
}

function readCookie(req: Request, name: string): string | undefined {
  for (const part of (req.get('cookie') ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return undefined;
}

const NONCE = /^[A-Za-z0-9_-]{43}$/;

/** The signed-out visitor's token: an HMAC of the nonce in their cookie (signed double submit). */
function anonymousToken(config: Config, nonce: string) {
  return crypto.createHmac('sha256', config.SESSION_SECRET).update(`csrf:${nonce}`).digest('base64url');
}

/**
 * The CSRF token for this visitor: the session's token once signed in; before that, one
 * derived from a random nonce in an HttpOnly cookie (set here when missing). Another site can
 * neither read the cookie nor compute the HMAC, and no session row is stored for it.
 */
export function csrfTokenFor(config: Config, req: Request, res: Response): string {
  if (req.session?.csrfToken) return req.session.csrfToken;
  let nonce = readCookie(req, CSRF_COOKIE);
  if (!nonce || !NONCE.test(nonce)) {
    nonce = newCsrfToken();
    res.cookie(CSRF_COOKIE, nonce, { httpOnly: true, sameSite: 'strict', secure: config.cookieSecure, path: '/api' });
  }
  return anonymousToken(config, nonce);
}

function expectedCsrfToken(config: Config, req: Request): string | undefined {
  if (req.session?.csrfToken) return req.session.csrfToken;
  const nonce = readCookie(req, CSRF_COOKIE);
  return nonce && NONCE.test(nonce) ? anonymousToken(config, nonce) : undefined;
}

function sameToken(a: string, b: string) {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && crypto.timingSafeEqual(x, y);
}

/**
 * CSRF defence for every state-changing request: the token (the session's, or before sign-in
 * the cookie-bound one) in the X-CSRF-Token header, plus Origin and Fetch-Metadata checks
 * against cross-site calls. Only the configured public origin is accepted: the Host header is
 * the client's to choose, so it proves nothing.
 */
export function csrfProtection(config: Config, log: Logger): RequestHandler {
  const allowedOrigin = new URL(config.publicUrl).origin;
  return (req, _res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
    const refuse = (why: string) => {
      securityLog(log, req, 'csrf_refused', { why });
      next(new AppError(403, 'csrf_failed', 'This request could not be verified. Reload the page and try again.'));
    };
    if (req.get('sec-fetch-site') === 'cross-site') return refuse('fetch-metadata');
    const origin = req.get('origin');
    if (origin && origin !== allowedOrigin) return refuse('origin');
    const expected = expectedCsrfToken(config, req);
    const sent = req.get('x-csrf-token');
    if (!expected || !sent || !sameToken(expected, sent)) return refuse('token');
    next();
  };
}
