// A second server process on the shared test database, standing in for a demo that runs while
// `npm test` does (see stand-in.ts). No mail worker: it must not take other tests' outbox rows.
import { startServer } from '../../server/server';
import { testConfig } from './env';

const running = await startServer(testConfig({ PORT: process.env.STAND_IN_PORT ?? '0' }), { outboxWorker: false, serveClient: false });
process.stdout.write(`listening ${running.port}\n`);
process.on('SIGTERM', () => void running.close().then(() => process.exit(0)));
