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
import { warnAdminsOfLateMail } from './modules/mail/mail.service';
import { AlarmSweeper } from './modules/alarms/sweep';
import { startScheduler } from './modules/maintenance/scheduler';
import { SmsFake } from './lib/sms-fake';
import { createSmsClient, SmsWorker } from './lib/sms';
import { startEscalationClock } from './modules/oncall/escalation.service';
import { SMS_WEBHOOK_PATH } from './modules/oncall/sms-webhook';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export interface StartOptions {
  /** Start the in-process SMTP catcher on SMTP_PORT (demo and development). */
  catcher?: MailCatcher | null;
  /** The local SMS fake (default: one on SMS_FAKE_PORT when SMS_FAKE is set; tests pass their own). */
  smsFake?: SmsFake | null;
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
  const deps: AppDeps = { config, sequelize, log, events };

  const catcher = opts.catcher ?? null;
  if (catcher) await catcher.start();
  const smsFake = opts.smsFake !== undefined ? opts.smsFake : config.SMS_FAKE ? new SmsFake(config.SMS_FAKE_PORT, '127.0.0.1') : null;
  if (smsFake && !smsFake.running) await smsFake.start();
  // With the fake, its test key signs replies; otherwise the provider's public key from the settings.
  const smsWebhookKey = smsFake ? smsFake.publicKey : (config.SMS_WEBHOOK_PUBLIC_KEY ?? null);

  const { middleware: session } = createSessionMiddleware(config, sequelize);
  const passport = configurePassport();
  const app = createApp(deps, {
    session,
    passport,
    catcher,
    smsFake,
    smsWebhookKey,
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
  // Texts go through their own outbox with the same machinery; with neither fake nor provider
  // credentials no texts are queued (pages go by mail and in-app notice).
  const smsWorker =
    smsFake || config.SMS_API_KEY
      ? new SmsWorker(createSmsClient(config, smsFake ? { baseUrl: smsFake.baseUrl, apiKey: smsFake.apiKey } : null), config, log, {
          pollMs: config.OUTBOX_POLL_MS,
          baseBackoffMs: config.OUTBOX_BASE_BACKOFF_MS,
          leaseMs: config.OUTBOX_LEASE_MS,
        })
      : null;
  if (opts.outboxWorker !== false) {
    worker.start();
    pushWorker.start();
    smsWorker?.start();
  }
  const escalationClock =
    config.ONCALL_PASS_MS > 0 && opts.outboxWorker !== false ? startEscalationClock(deps, config.ONCALL_PASS_MS) : null;
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
    await smsWorker?.stop();
    await escalationClock?.stop();
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
    if (smsFake && opts.smsFake === undefined) await smsFake.stop();
    await releaseSequelize(sequelize);
    throw error;
  }
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  if (smsFake) smsFake.webhookUrl = `http://127.0.0.1:${port}/api${SMS_WEBHOOK_PATH}`;

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
    if (smsFake && opts.smsFake === undefined) await smsFake.stop();
    await releaseSequelize(sequelize);
  }

  return {
    app,
    server,
    io,
    deps,
    worker,
    pushWorker,
    smsWorker,
    smsFake,
    accountMail,
    sweeper,
    catcher,
    port,
    url: `http://${config.HOST}:${port}`,
    close,
  };
}
