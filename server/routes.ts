import type { RouteSpec } from './lib/http';
import type { Logger } from './lib/logger';
import type { MailCatcher } from './lib/mail-catcher';
import { authRoutes } from './modules/auth/auth.routes';
import { mailRoutes } from './modules/mail/mail.routes';
import { usersRoutes } from './modules/users/users.routes';
import { facilityRoutes } from './modules/facility/facility.routes';
import { noticesRoutes } from './modules/notices/notices.routes';
import { ticketRoutes } from './modules/tickets/tickets.routes';
import { analyticsRoutes } from './modules/analytics/analytics.routes';
import { pushRoutes } from './modules/push/push.routes';

export interface RouteOptions {
  log: Logger;
  catcher: MailCatcher | null;
}

/** Every API route of the app (besides health, mounted first), under /api. One line per module. */
export function apiRoutes(opts: RouteOptions): RouteSpec[] {
  return [
    ...authRoutes(opts.log),
    ...mailRoutes(opts.catcher),
    ...usersRoutes(),
    ...facilityRoutes(opts),
    ...noticesRoutes(),
    ...ticketRoutes(opts.log),
    ...analyticsRoutes(),
    ...pushRoutes(),
  ];
}
