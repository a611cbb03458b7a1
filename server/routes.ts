import type { RouteSpec } from './lib/http';
import type { Logger } from './lib/logger';
import type { MailCatcher } from './lib/mail-catcher';
import type { Config } from './config';
import type { SmsFake } from './lib/sms-fake';
import type { SmsMode } from './lib/sms';
import { authRoutes } from './modules/auth/auth.routes';
import { mailRoutes } from './modules/mail/mail.routes';
import { usersRoutes } from './modules/users/users.routes';
import { facilityRoutes } from './modules/facility/facility.routes';
import { noticesRoutes } from './modules/notices/notices.routes';
import { ticketRoutes } from './modules/tickets/tickets.routes';
import { analyticsRoutes } from './modules/analytics/analytics.routes';
import { alarmRoutes } from './modules/alarms/alarms.routes';
import { maintenanceRoutes } from './modules/maintenance/maintenance.routes';
import { settingsRoutes } from './modules/settings/settings.routes';
import { pushRoutes } from './modules/push/push.routes';
import { oncallRoutes } from './modules/oncall/oncall.routes';

export interface RouteOptions {
  log: Logger;
  catcher: MailCatcher | null;
  config: Config;
  smsFake: SmsFake | null;
  smsMode: () => SmsMode;
}

/** Every API route of the app (besides health, mounted first), under /api. One line per module. */
export function apiRoutes(opts: RouteOptions): RouteSpec[] {
  return [
    ...authRoutes(opts.log),
    ...mailRoutes(opts.catcher),
    ...usersRoutes(),
    ...facilityRoutes(opts),
    ...noticesRoutes(),
    ...ticketRoutes(opts.log, opts.config),
    ...analyticsRoutes(),
    ...alarmRoutes(),
    ...maintenanceRoutes(),
    ...settingsRoutes(),
    ...pushRoutes(),
    ...oncallRoutes(opts),
  ];
}
