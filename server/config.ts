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
  /** When set, the server writes its pid here once it listens (npm start waits for it). */
  READY_FILE: z.string().optional(),

  DB_HOST: z.string().default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().default(3307),
  DB_NAME: z.string().min(1).default('faultline'),
  DB_USER: z.string().min(1).default('faultline'),
  DB_PASSWORD: z.string().default(''),
  DB_POOL_MAX: z.coerce.number().int().min(1).default(20),
  /** How long a request may wait for a free connection: a burst of reads queues rather than fails. */
  DB_ACQUIRE_TIMEOUT_MS: z.coerce.number().int().positive().default(30_000),

  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  SESSION_IDLE_MINUTES: z.coerce.number().positive().default(120),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(12),
  COOKIE_SECURE: bool.optional(),

  // Free sign-in attempts per window: for one account from one address, for one account from
  // anywhere, and from one address across accounts. Past them, each attempt waits a delay
  // that starts at SIGNIN_DELAY_SECONDS and doubles (capped at the window).
  SIGNIN_MAX_FAILURES_PER_ACCOUNT: z.coerce.number().int().min(1).default(5),
  SIGNIN_MAX_FAILURES_PER_ACCOUNT_TOTAL: z.coerce.number().int().min(1).default(20),
  SIGNIN_MAX_FAILURES_PER_ADDRESS: z.coerce.number().int().min(1).default(20),
  SIGNIN_WINDOW_SECONDS: z.coerce.number().positive().default(900),
  SIGNIN_DELAY_SECONDS: z.coerce.number().positive().default(30),
  // API requests per minute from one address by visitors who are not signed in (no session).
  ANONYMOUS_REQUESTS_PER_MINUTE: z.coerce.number().int().min(1).default(300),
  // Which proxies in front of the server to believe about the client's address and protocol
  // (X-Forwarded-For / -Proto): 'false' (none), 'loopback', a comma-separated list of
  // addresses or subnets, or a hop count. Needed for an https PUBLIC_URL behind a TLS proxy.
  TRUST_PROXY: z
    .string()
    .default('false')
    .transform((v, ctx) => {
      const s = v.trim();
      if (s === '' || s === 'false' || s === '0') return false;
      if (s === 'true') {
        ctx.addIssue({
          code: 'custom',
          message:
            "TRUST_PROXY=true would believe any client's X-Forwarded-For; name the proxy (e.g. 'loopback' or its address) or a hop count",
        });
        return z.NEVER;
      }
      if (/^\d+$/.test(s)) return Number(s);
      return s;
    }),

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
  /** How long a worker's claim on outbox rows lasts without a heartbeat (a dead worker's rows return after it). */
  OUTBOX_LEASE_MS: z.coerce.number().int().positive().default(15_000),

  /** How often the maintenance scheduler looks for plans coming due; 0 turns it off in this process. */
  MAINTENANCE_SCHEDULER_MS: z.coerce.number().int().min(0).default(60_000),

  // Pages by SMS (decision 0008). With SMS_FAKE the local fake (server/lib/sms-fake.ts) runs in
  // the process and takes the texts; with SMS_API_KEY texts go to the provider; with neither,
  // pages go by e-mail and in-app notice only.
  SMS_FAKE: bool.default(false),
  SMS_FAKE_PORT: z.coerce.number().int().min(0).max(65535).default(2526),
  SMS_API_KEY: z.string().min(1).optional(),
  /** The provider's API address (its SDK's default when unset); the fake sets its own. */
  SMS_BASE_URL: z.url().optional(),
  /** The number (or sender id) texts come from. */
  SMS_FROM: z.string().min(1).max(20).default('+15555550100'),
  /** The provider's public key for inbound webhook signatures (Ed25519, base64); the fake supplies its own. */
  SMS_WEBHOOK_PUBLIC_KEY: z.string().optional(),
  /** How often the escalation pass looks for pages nobody acknowledged; 0 turns it off in this process. */
  ONCALL_PASS_MS: z.coerce.number().int().min(0).default(15_000),
  /** Minutes before the next step is paged, until an admin sets it per severity. */
  ONCALL_STEP_MINUTES: z.coerce.number().int().min(1).max(240).default(10),

  /** Who runs this server, for push services (VAPID subject: a mailto: or https: address). */
  PUSH_SUBJECT: z
    .string()
    .regex(/^(mailto:|https:)/)
    .default('mailto:faultline@facility.invalid'),
  /** A PEM file of extra certificate authorities to trust for push services (a local fake's). */
  PUSH_CA_FILE: z.string().optional(),
  UPLOAD_DIR: z.string().default('uploads'),
  /** Uploads with photos one account may send at once, and that one process receives at once. */
  UPLOADS_PER_ACCOUNT: z.coerce.number().int().positive().default(2),
  UPLOADS_AT_ONCE: z.coerce.number().int().positive().default(8),
  FACILITY_TIME_ZONE: z.string().default('Europe/Berlin'),
  DEMO: bool.default(false),
  /** Set when several server processes share the sockets (socket.io's Redis adapter). */
  REDIS_URL: z.url().optional(),
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
