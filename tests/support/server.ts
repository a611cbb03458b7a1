import net from 'node:net';
import { startServer } from '../../server/server';
import { MailCatcher } from '../../server/lib/mail-catcher';
import { testConfig } from './env';

export type TestServer = Awaited<ReturnType<typeof startTestServer>>;

/**
 * The real server (Express, sessions in MariaDB, socket.io, outbox worker) on an ephemeral
 * port, with a real SMTP catcher on another ephemeral port.
 */
export async function startTestServer(
  overrides: Record<string, string> = {},
  opts: {
    serveClient?: boolean;
    distDir?: string;
    outboxWorker?: boolean;
    accountMailQueue?: boolean;
    logDestination?: import('pino').DestinationStream;
    /** A local SMS fake for pages (none by default). */
    smsFake?: import('../../server/lib/sms-fake').SmsFake;
  } = {},
) {
  // A browser's Origin must be the public address (the CSRF check accepts no other), so a
  // server for browser tests is told its own address unless the test names one.
  if (opts.serveClient && !overrides.PUBLIC_URL) {
    const port = overrides.PORT ?? String(await freePort());
    overrides = { ...overrides, PORT: port, PUBLIC_URL: `http://127.0.0.1:${port}` };
  }
  const catcher = new MailCatcher(0);
  await catcher.start();
  const config = testConfig({ SMTP_PORT: String(catcher.port), ...overrides });
  const running = await startServer(config, {
    catcher,
    serveClient: opts.serveClient ?? false,
    distDir: opts.distDir,
    outboxWorker: opts.outboxWorker,
    accountMailQueue: opts.accountMailQueue,
    logDestination: opts.logDestination,
    smsFake: opts.smsFake ?? null,
  });
  return { ...running, config, catcher, url: `http://127.0.0.1:${running.port}` };
}

/** Sends every due outbox row now (the shared test database may hold other tests' mail too). */
export async function drainOutbox(server: { worker: { runOnce(): Promise<number> } }) {
  for (let i = 0; i < 100; i++) if ((await server.worker.runOnce()) === 0) return;
}

/**
 * A free loopback port, so the server can be told its own public address: the browser's
 * socket then upgrades to a WebSocket (the server accepts sockets from its own origin only).
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}
