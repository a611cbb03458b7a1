import { z } from 'zod';

// Typed configuration from the environment, validated once at start-up: a wrong or missing
// value stops the process with a readable message instead of failing later at random.
const bool = z.enum(['true', 'false', '1', '0', 'yes', 'no']).transform((v) => v === 'true' || v === '1' || v === 'yes');

const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  PUBLIC_URL: z.url().optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),

  DB_HOST: z.string().default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().default(3307),
  DB_NAME: z.string().min(1).default('faultline'),
  DB_USER: z.string().min(1).default('faultline'),
  DB_PASSWORD: z.string().default(''),
  DB_POOL_MAX: z.coerce.number().int().min(1).default(10),

  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  SESSION_IDLE_MINUTES: z.coerce.number().positive().default(120),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(12),
  COOKIE_SECURE: bool.optional(),

  SIGNIN_MAX_FAILURES_PER_ACCOUNT: z.coerce.number().int().min(1).default(5),
  SIGNIN_MAX_FAILURES_PER_ADDRESS: z.coerce.number().int().min(1).default(20),
  SIGNIN_WINDOW_SECONDS: z.coerce.number().positive().default(900),

  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default('Faultline <faultline@facility.invalid>'),
  MAIL_CATCHER: bool.default(false),
  OUTBOX_POLL_MS: z.coerce.number().int().positive().default(2000),
  /** Updates on one ticket to one person within this window go out as one mail (0: no folding). */
  MAIL_FOLD_MS: z.coerce.number().int().min(0).default(180_000),
  OUTBOX_BASE_BACKOFF_MS: z.coerce.number().int().positive().default(2000),

  UPLOAD_DIR: z.string().default('uploads'),
  FACILITY_TIME_ZONE: z.string().default('Europe/Berlin'),
  DEMO: bool.default(false),
});

export type Config = z.infer<typeof configSchema> & { publicUrl: string; cookieSecure: boolean };

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Record<string, string>> = {}): Config {
  const parsed = configSchema.safeParse({ ...env, ...overrides });
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  - ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Faultline cannot start: the configuration is invalid.\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  const publicUrl = c.PUBLIC_URL ?? `http://localhost:${c.PORT}`;
  return { ...c, publicUrl, cookieSecure: c.COOKIE_SECURE ?? publicUrl.startsWith('https://') };
}
