import http from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Config } from './config';
import { acquireSequelize, releaseSequelize } from './db';
import { createLogger } from './lib/logger';
import { DomainEvents } from './lib/events';
import { createApp } from './app';
import { createSessionMiddleware, configurePassport, sessionExpired } from './modules/auth/session-middleware';
import { attachRealtime } from './lib/realtime';
import { createTransport, OutboxWorker } from './lib/mailer';
import { MailCatcher } from './lib/mail-catcher';
import { verifyDisplayKey } from './modules/facility/display-links.service';
import { AccountMailQueue } from './modules/auth/account-links.service';
import { mayViewTicket } from './modules/tickets/ticket-query.service';
import { connectRedisAdapter } from './lib/redis-adapter';
import { PushWorker } from './modules/push/push.service';
import { schedulePruning } from './modules/auth/sign-in-throttle';
import type { AppDeps } from './lib/http';
import { photoSweeper } from './modules/tickets/photo-sweep';
import { createPhotoStore } from './lib/storage/photo-store';
import { warnAdminsOfLateMail } from './modules/mail/mail.service';
import { AlarmSweeper } from './modules/alarms/sweep';
import { startScheduler } from './modules/maintenance/scheduler';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export interface StartOptions {
  /** Start the in-process SMTP catcher on SMTP_PORT (demo and development). */
  catcher?: MailCatcher | null;
  /** Run the outbox worker in this process (default true). */
  outboxWorker?: boolean;
  /** Answer "mail me a link" requests in the background (default true; tests may run passes by hand). */
  accountMailQueue?: boolean;
  serveClient?: boolean;
  /** The built client to serve (default dist/). */
  distDir?: string;
  /** Where log lines go (default stdout); tests capture them. */
  logDestination?: import('pino').DestinationStream;
}

/** Wires the whole server: database, app, sockets, mail worker. `close()` shuts it all down. */
export async function startServer(config: Config, opts: StartOptions = {}) {
  const log = createLogger(config.LOG_LEVEL, opts.logDestination);
  const sequelize = acquireSequelize(config);
  const events = new DomainEvents();
  const photos = createPhotoStore(config);
  const deps: AppDeps = { config, sequelize, log, events, photos };

  const catcher = opts.catcher ?? null;
  if (catcher) await catcher.start();

  const { middleware: session } = createSessionMiddleware(config, sequelize);
  const passport = configurePassport();
  const app = createApp(deps, {
    session,
    passport,
    catcher,
    distDir: opts.serveClient === false ? undefined : (opts.distDir ?? path.join(root, 'dist')),
  });
  const accountMail = new AccountMailQueue(deps);
  app.locals.accountMail = accountMail;
  if (opts.accountMailQueue !== false) accountMail.start();
  const stopPruning = schedulePruning(sequelize, config, log);
  const server = http.createServer(app);
  const allowedOrigins = [new URL(config.publicUrl).origin];
  // One process keeps its sockets to itself; with REDIS_URL, broadcasts reach every process.
  const redis = config.REDIS_URL ? await connectRedisAdapter(config.REDIS_URL, log) : null;
  const io = attachRealtime(server, {
    allowedOrigins,
    session,
    passport,
    events,
    log,
    verifyDisplayKey,
    mayWatchTicket: (user, ticketId) => mayViewTicket(deps, user, ticketId),
    sessionCurrent: (s) => !sessionExpired(config, s),
    adapter: redis?.adapter,
  });

  const worker = new OutboxWorker(createTransport(config), config, log, {
    pollMs: config.OUTBOX_POLL_MS,
    baseBackoffMs: config.OUTBOX_BASE_BACKOFF_MS,
    leaseMs: config.OUTBOX_LEASE_MS,
    afterPass: () => warnAdminsOfLateMail(deps),
  });
  const pushWorker = new PushWorker(deps, config, log);
  if (opts.outboxWorker !== false) {
    worker.start();
    pushWorker.start();
  }
  const alarmSweeper = new AlarmSweeper(deps);
  if (opts.outboxWorker !== false) alarmSweeper.start();
  const maintenanceScheduler = config.MAINTENANCE_SCHEDULER_MS > 0 ? startScheduler(deps, config.MAINTENANCE_SCHEDULER_MS) : null;

  // Photo files a crash left without a row go before the first request, then periodically.
  const sweeper = photoSweeper(deps);
  await sweeper.runOnce();
  sweeper.start();

  /** Every background loop of this process (each claims its rows with locks; see DEVELOPERS.md). */
  async function stopBackgroundWork() {
    sweeper.stop();
    await worker.stop();
    await accountMail.stop();
    await alarmSweeper.stop();
    await maintenanceScheduler?.stop();
    await pushWorker.stop();
    stopPruning();
  }

  try {
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config.PORT, config.HOST, () => {
        server.off('error', reject);
        resolve();
      });
    });
  } catch (error) {
    // The port is taken (or not ours to use): undo what was started, and let the caller say so.
    await stopBackgroundWork();
    await new Promise<void>((resolve) => io.close(() => resolve()));
    await redis?.close();
    if (catcher) await catcher.stop();
    await releaseSequelize(sequelize);
    photos.close();
    throw error;
  }
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;

  let closed = false;
  async function close() {
    if (closed) return;
    closed = true;
    await stopBackgroundWork();
    await worker.stop();
    await accountMail.stop();
    stopPruning();
    await new Promise<void>((resolve) => io.close(() => resolve()));
    await redis?.close();
    server.closeAllConnections?.();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    if (catcher) await catcher.stop();
    await releaseSequelize(sequelize);
    photos.close();
  }

  return { app, server, io, deps, worker, pushWorker, accountMail, sweeper, catcher, port, url: `http://${config.HOST}:${port}`, close };
}
