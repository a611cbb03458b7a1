import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import { z, type ZodType } from 'zod';
import type { Sequelize } from 'sequelize';
import { hasRole, type Role } from '../../shared/roles';
import { AppError, unauthorized, forbidden, badRequest, zodFields } from './errors';
import { securityLog, type Logger } from './logger';
import type { Config } from '../config';
import type { DomainEvents } from './events';
import type { PhotoStore } from './storage/photo-store';

/** What every handler and service may need; built once in createServer. */
export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  log: Logger;
  events: DomainEvents;
  /** Where photos are kept (local folder or bucket). */
  photos: PhotoStore;
}

/**
 * Who may call a route. Deny by default: a route without an access rule cannot be declared.
 * - 'public': anyone (health, session, password reset)
 * - a role: signed in with at least that role (member < technician < manager < admin)
 * - 'display': a signed-in member OR a lobby display key (read-only board data)
 * - 'tool': a tool's API key (Authorization: Bearer); only the ingest API uses it
 */
export type Access = 'public' | 'display' | 'tool' | Role;

export interface AuthUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends AuthUser {}
    interface Request {
      /** Set by the display-key middleware when a lobby display calls. */
      displayLinkId?: number;
      /** Set by the tool-key middleware on the ingest API. */
      toolKey?: { id: number; toolId: number };
    }
  }
}

type Infer<T> = T extends ZodType ? z.output<T> : undefined;

export interface HandlerContext<B, Q, P> {
  body: B;
  query: Q;
  params: P;
  /** The signed-in user; null only on 'public' and 'display' routes. */
  user: AuthUser | null;
  req: Request;
  res: Response;
  deps: AppDeps;
}

export interface RouteSpec<
  B extends ZodType | undefined = ZodType | undefined,
  Q extends ZodType | undefined = ZodType | undefined,
  P extends ZodType | undefined = ZodType | undefined,
> {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  access: Access;
  summary?: string;
  body?: B;
  query?: Q;
  params?: P;
  /** Status for a successful response with a body (default 200; 204 when the handler returns undefined). */
  status?: number;
  /** Middleware run after access and CSRF checks, before validation (e.g. multer for uploads). */
  before?: RequestHandler[];
  handle: (ctx: HandlerContext<Infer<B>, Infer<Q>, Infer<P>>) => Promise<unknown> | unknown;
}

/** Declares a route with its access rule and input schemas; types flow from the schemas. */
export function route<
  B extends ZodType | undefined = undefined,
  Q extends ZodType | undefined = undefined,
  P extends ZodType | undefined = undefined,
>(spec: RouteSpec<B, Q, P>): RouteSpec {
  return spec as unknown as RouteSpec;
}

export interface RegisteredRoute {
  method: RouteSpec['method'];
  path: string;
  access: Access;
  hasBody: boolean;
  hasParams: boolean;
  /** The input schemas, so tests can walk every route's fields (bad-input and fuzz tests). */
  schemas: { body?: ZodType; query?: ZodType; params?: ZodType };
}

export function requireAccess(access: Access, log: Logger): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (access === 'tool') {
      if (req.toolKey) return next();
      securityLog(log, req, 'unauthenticated');
      return next(unauthorized('Send the tool’s key: Authorization: Bearer <key>.'));
    }
    if (access === 'display' && (req.user || req.displayLinkId)) return next();
    if (!req.user) {
      securityLog(log, req, 'unauthenticated');
      return next(unauthorized());
    }
    if (access !== 'display' && !hasRole(req.user.role, access)) {
      securityLog(log, req, 'access_denied', { needed: access });
      return next(forbidden());
    }
    next();
  };
}

function parsePart(schema: ZodType | undefined, value: unknown, where: 'body' | 'query' | 'params') {
  if (!schema) {
    // No schema means the route takes no input there; anything sent is refused, not ignored.
    const empty = value == null || (typeof value === 'object' && Object.keys(value as object).length === 0);
    if (empty) return undefined;
    throw badRequest('This request takes no input there.', { [where]: ['No input is accepted here.'] });
  }
  const result = schema.safeParse(value ?? (where === 'body' ? {} : {}));
  if (!result.success) {
    throw badRequest('Some fields need attention.', zodFields(result.error, where === 'body' ? undefined : where));
  }
  return result.data;
}

/** Whether the request carries a body at all (chunked or a non-zero length). */
function sentBody(req: Request) {
  const length = req.headers['content-length'];
  return req.headers['transfer-encoding'] !== undefined || (length !== undefined && length !== '0');
}

/** Mounts declared routes and records each in `registry` (the access-rule test walks it). */
export function mountRoutes(router: Router, prefix: string, routes: RouteSpec[], deps: AppDeps, registry: RegisteredRoute[]) {
  for (const spec of routes) {
    const full = `${prefix}${spec.path === '/' ? '' : spec.path}` || '/';
    registry.push({
      method: spec.method,
      path: full,
      access: spec.access,
      hasBody: !!spec.body,
      hasParams: !!spec.params,
      schemas: { body: spec.body, query: spec.query, params: spec.params },
    });
    const run: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
      try {
        // A body no parser read (e.g. multipart sent to a JSON route) is refused, not taken as {}.
        if (spec.body && req.body === undefined && sentBody(req)) {
          throw new AppError(415, 'unsupported_media_type', 'Send this request as JSON.');
        }
        const body = parsePart(spec.body, req.body, 'body');
        const query = parsePart(spec.query, req.query, 'query');
        const params = parsePart(spec.params, req.params, 'params');
        const result = await spec.handle({ body, query, params, user: req.user ?? null, req, res, deps } as HandlerContext<
          never,
          never,
          never
        >);
        if (res.headersSent) return;
        if (result === undefined) res.status(204).end();
        else res.status(spec.status ?? 200).json(result);
      } catch (error) {
        if (error instanceof AppError && error.code === 'validation_failed') {
          securityLog(deps.log, req, 'validation_failed', { fields: Object.keys(error.fields ?? {}) });
        }
        next(error);
      }
    };
    router[spec.method](full, requireAccess(spec.access, deps.log), ...(spec.before ?? []), run);
  }
}

/** Common params schema: a positive integer id in the URL. */
export const idParams = z.strictObject({ id: z.coerce.number().int().positive() });
