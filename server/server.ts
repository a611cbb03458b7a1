import http from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Config } from './config';
import { acquireSequelize, releaseSequelize } from './db';
import { createLogger } from './lib/logger';
import { DomainEvents } from './lib/events';
import { createApp } from './app';
import { createSessionMiddleware, configurePassport } from './modules/auth/session-middleware';
import { attachRealtime } from './lib/realtime';
import { createTransport, OutboxWorker } from './lib/mailer';
import { MailCatcher } from './lib/mail-catcher';
import { verifyDisplayKey } from './modules/facility/display-links.service';
import type { AppDeps } from './lib/http';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export interface StartOptions {
  /** Start the in-process SMTP catcher on SMTP_PORT (demo and development). */
  catcher?: MailCatcher | null;
  /** Run the outbox worker in this process (default true). */
  outboxWorker?: boolean;
  serveClient?: boolean;
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

  const { middleware: session } = createSessionMiddleware(config, sequelize);
  const passport = configurePassport();
  const app = createApp(deps, {
    session,
    passport,
    catcher,
    distDir: opts.serveClient === false ? undefined : path.join(root, 'dist'),
  });
  const server = http.createServer(app);
  const allowedOrigins = [new URL(config.publicUrl).origin];
  const io = attachRealtime(server, { allowedOrigins, session, passport, events, log, verifyDisplayKey });

  const worker = new OutboxWorker(createTransport(config), config, log, {
    pollMs: config.OUTBOX_POLL_MS,
    baseBackoffMs: config.OUTBOX_BASE_BACKOFF_MS,
  });
  if (opts.outboxWorker !== false) worker.start();

  await new Promise<void>((resolve) => server.listen(config.PORT, config.HOST, () => resolve()));
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;

  let closed = false;
  async function close() {
    if (closed) return;
    closed = true;
    await worker.stop();
    await new Promise<void>((resolve) => io.close(() => resolve()));
    server.closeAllConnections?.();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    if (catcher) await catcher.stop();
    await releaseSequelize(sequelize);
  }

  return { app, server, io, deps, worker, catcher, port, url: `http://${config.HOST}:${port}`, close };
}
