import { startServer } from '../../server/server';
import { MailCatcher } from '../../server/lib/mail-catcher';
import { testConfig } from './env';

export type TestServer = Awaited<ReturnType<typeof startTestServer>>;

/**
 * The real server (Express, sessions in MariaDB, socket.io, outbox worker) on an ephemeral
 * port, with a real SMTP catcher on another ephemeral port.
 */
export async function startTestServer(overrides: Record<string, string> = {}, opts: { serveClient?: boolean; outboxWorker?: boolean; logDestination?: import('pino').DestinationStream } = {}) {
  const catcher = new MailCatcher(0);
  await catcher.start();
  const config = testConfig({ SMTP_PORT: String(catcher.port), ...overrides });
  const running = await startServer(config, { catcher, serveClient: opts.serveClient ?? false, outboxWorker: opts.outboxWorker, logDestination: opts.logDestination });
  return { ...running, config, catcher, url: `http://127.0.0.1:${running.port}` };
}

/** Sends every due outbox row now (the shared test database may hold other tests' mail too). */
export async function drainOutbox(server: { worker: { runOnce(): Promise<number> } }) {
  for (let i = 0; i < 100; i++) if ((await server.worker.runOnce()) === 0) return;
}
