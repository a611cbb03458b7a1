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

  /** Who runs this server, for push services (VAPID subject: a mailto: or https: address). */
  PUSH_SUBJECT: z
    .string()
    .regex(/^(mailto:|https:)/)
    .default('mailto:faultline@facility.invalid'),
  /** A PEM file of extra certificate authorities to trust for push services (a local fake's). */
  PUSH_CA_FILE: z.string().optional(),
  /** Local folder for part files while they arrive, and for the photos themselves when PHOTO_STORAGE=local. */
  UPLOAD_DIR: z.string().default('uploads'),
  /** Where photos are kept: 'local' (UPLOAD_DIR) or 's3' (an S3-compatible bucket every process reaches). */
  PHOTO_STORAGE: z.enum(['local', 's3']).default('local'),
  /** An S3-compatible endpoint (unset: the provider's own endpoint for S3_REGION). */
  S3_ENDPOINT: z.url().optional(),
  S3_BUCKET: z.string().min(3).max(63).optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  /** Unset: the SDK's own credential chain (environment, shared files, instance role). */
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  /** bucket in the path (endpoint/bucket/key) rather than in the host name; most self-hosted stores want it. */
  S3_FORCE_PATH_STYLE: bool.default(false),
  /** Photos' keys start with this (several installations can share one bucket). */
  S3_PREFIX: z
    .string()
    .regex(/^([A-Za-z0-9_.-]+\/)*$/, 'S3_PREFIX is empty or folder names each ending in /, e.g. photos/')
    .default('photos/'),
  /** Uploads with photos one account may send at once, and that one process receives at once. */
  UPLOADS_PER_ACCOUNT: z.coerce.number().int().positive().default(2),
  UPLOADS_AT_ONCE: z.coerce.number().int().positive().default(8),
  FACILITY_TIME_ZONE: z.string().default('Europe/Berlin'),
  DEMO: bool.default(false),
  /** Set when several server processes share the sockets (socket.io's Redis adapter). */
  REDIS_URL: z.url().optional(),
});

const checkedSchema = configSchema.superRefine((c, ctx) => {
  if (c.PHOTO_STORAGE === 's3' && !c.S3_BUCKET)
    ctx.addIssue({ code: 'custom', path: ['S3_BUCKET'], message: 'PHOTO_STORAGE=s3 needs S3_BUCKET (the bucket that holds the photos)' });
  if (!c.S3_ACCESS_KEY_ID !== !c.S3_SECRET_ACCESS_KEY)
    ctx.addIssue({
      code: 'custom',
      path: [c.S3_ACCESS_KEY_ID ? 'S3_SECRET_ACCESS_KEY' : 'S3_ACCESS_KEY_ID'],
      message: 'S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY are set together (or both left unset for the SDK’s own credentials)',
    });
});

export type Config = z.infer<typeof configSchema> & { publicUrl: string; cookieSecure: boolean };

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Record<string, string>> = {}): Config {
  const parsed = checkedSchema.safeParse({ ...env, ...overrides });
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  - ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Faultline cannot start: the configuration is invalid.\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  const publicUrl = c.PUBLIC_URL ?? `http://localhost:${c.PORT}`;
  return { ...c, publicUrl, cookieSecure: c.COOKIE_SECURE ?? publicUrl.startsWith('https://') };
}
