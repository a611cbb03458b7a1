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
const running = await startServer(config, { catcher });
running.deps.log.info({ url: config.publicUrl, catcher: !!catcher }, 'Faultline is listening');
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
