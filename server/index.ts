import fs from 'node:fs';
import { loadConfig } from './config';
import { startServer } from './server';
import { MailCatcher } from './lib/mail-catcher';

// Entry point: validate configuration (fail fast), start, and shut down gracefully.
let config;
try {
  config = loadConfig();
} catch (error) {
  console.error((error as Error).message);
  process.exit(1);
}

const catcher = config.MAIL_CATCHER ? new MailCatcher(config.SMTP_PORT, config.SMTP_HOST) : null;
let running: Awaited<ReturnType<typeof startServer>>;
try {
  running = await startServer(config, { catcher });
} catch (error) {
  const e = error as NodeJS.ErrnoException & { port?: number; address?: string };
  if (e.code === 'EADDRINUSE' || e.code === 'EACCES') {
    const which = e.port === config.SMTP_PORT && catcher ? 'SMTP_PORT' : 'PORT';
    console.error(
      `Cannot listen on ${e.address ?? config.HOST}:${e.port ?? config.PORT} (${which}): ${e.code === 'EADDRINUSE' ? 'the port is already in use' : 'permission denied'}.\n` +
        `Stop the other program, or choose another port, e.g. ${which}=${(e.port ?? config.PORT) + 100} npm start`,
    );
  } else {
    console.error(`Faultline did not start: ${e.message}`);
  }
  process.exit(1);
}
running.deps.log.info({ url: config.publicUrl, catcher: !!catcher }, 'Faultline is listening');
// npm start waits for this file to hold our pid before it prints the welcome (scripts/start.sh).
if (config.READY_FILE) fs.writeFileSync(config.READY_FILE, String(process.pid));
process.send?.('ready');

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    running.deps.log.info({ signal }, 'shutting down');
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    running.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  });
}
