import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, type Config } from '../../server/config';
import { localSecrets } from '../../scripts/lib/local-secrets';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

/** Configuration for tests: the separate test database, quiet logs, fast workers. */
export function testConfig(overrides: Record<string, string> = {}): Config {
  const secrets = localSecrets();
  return loadConfig(
    {},
    {
      NODE_ENV: 'test',
      LOG_LEVEL: process.env.LOG_LEVEL ?? 'silent',
      DB_HOST: process.env.DB_HOST ?? '127.0.0.1',
      DB_PORT: process.env.DB_PORT ?? '3307',
      DB_USER: process.env.DB_USER ?? 'faultline',
      DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
      DB_NAME: 'faultline_test',
      SESSION_SECRET: 'test-secret-test-secret-test-secret-0123',
      PORT: '0',
      OUTBOX_POLL_MS: '200',
      // Tests run maintenance scheduler passes themselves, when they need one.
      MAINTENANCE_SCHEDULER_MS: '0',
      // …and escalation passes (runEscalationPass with a clock), instead of waiting minutes.
      ONCALL_PASS_MS: '0',
      // Mail goes out at once in tests; folding gets its own test.
      MAIL_FOLD_MS: '0',
      // Every test signs in from 127.0.0.1; the per-address limit gets its own test.
      SIGNIN_MAX_FAILURES_PER_ADDRESS: '100000',
      ANONYMOUS_REQUESTS_PER_MINUTE: '100000',
      UPLOAD_DIR: path.join(root, 'test-results/uploads'),
      ...overrides,
    },
  );
}

export const projectRoot = root;
