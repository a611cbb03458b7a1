import type { RouteSpec } from './lib/http';
import type { Logger } from './lib/logger';
import type { MailCatcher } from './lib/mail-catcher';
import { healthRoutes } from './modules/health/health.routes';
import { authRoutes } from './modules/auth/auth.routes';
import { mailRoutes } from './modules/mail/mail.routes';

export interface RouteOptions {
  log: Logger;
  catcher: MailCatcher | null;
}

/** Every API route of the app, mounted under /api. One line per module. */
export function apiRoutes(opts: RouteOptions): RouteSpec[] {
  return [
    ...healthRoutes(),
    ...authRoutes(opts.log),
    ...mailRoutes(opts.catcher),
  ];
}
