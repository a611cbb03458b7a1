import express, { type RequestHandler } from 'express';
import helmet from 'helmet';
import compression from 'compression';
import path from 'node:path';
import fs from 'node:fs';
import type { PassportStatic } from 'passport';
import { mountRoutes, type AppDeps, type RegisteredRoute } from './lib/http';
import { errorMiddleware } from './lib/error-middleware';
import { AppError } from './lib/errors';
import { apiRoutes } from './routes';
import { ingestRoutes } from './modules/alarms/alarms.routes';
import { toolKeyAuth } from './modules/alarms/keys.service';
import { healthRoutes } from './modules/health/health.routes';
import { sessionLifetime, csrfProtection } from './modules/auth/session-middleware';
import { anonymousRateLimit } from './lib/throttle';
import { verifyDisplayKey } from './modules/facility/display-links.service';
import type { MailCatcher } from './lib/mail-catcher';
import type { SmsFake } from './lib/sms-fake';
import { smsMode } from './lib/sms';
import { smsWebhookRoutes } from './modules/oncall/oncall.routes';
import { smsWebhookAuth, SMS_WEBHOOK_PATH } from './modules/oncall/sms-webhook';

export interface AppOptions {
  session: RequestHandler;
  passport: PassportStatic;
  catcher: MailCatcher | null;
  /** The local SMS fake, when it runs in this process (demo and tests). */
  smsFake?: SmsFake | null;
  /** The key inbound texts must be signed with (the provider's, or the fake's). */
  smsWebhookKey?: string | null;
  /** Built client to serve (absent in API-only tests and in `npm run dev`). */
  distDir?: string;
}

const PERMISSIONS_POLICY = [
  'camera=(self)',
  'microphone=()',
  'geolocation=()',
  'payment=()',
  'usb=()',
  'serial=()',
  'bluetooth=()',
  'hid=()',
  'midi=()',
  'display-capture=()',
  'screen-wake-lock=()',
  'publickey-credentials-get=()',
  'accelerometer=()',
  'gyroscope=()',
  'magnetometer=()',
  'fullscreen=()',
].join(', ');

/** Builds the Express app without listening, so tests run it on an ephemeral port. */
export function createApp(deps: AppDeps, opts: AppOptions) {
  const { config, log } = deps;
  const app = express();
  app.disable('x-powered-by');
  // Behind a TLS-terminating proxy, req.secure and req.ip come from X-Forwarded-Proto/-For,
  // but only from the proxies named in TRUST_PROXY; the Secure session cookie needs req.secure.
  app.set('trust proxy', config.TRUST_PROXY);
  if (config.cookieSecure && config.TRUST_PROXY === false) {
    log.warn(
      'PUBLIC_URL is https but TRUST_PROXY is not set: the server itself speaks plain HTTP, so Secure session cookies are never set and nobody stays signed in. Set TRUST_PROXY to the TLS proxy in front of it.',
    );
  }
  const publicUrl = new URL(config.publicUrl);
  const ownSocketOrigin = `${publicUrl.protocol === 'https:' ? 'wss:' : 'ws:'}//${publicUrl.host}`;

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          // The app's own API and its own socket, nothing else ('self' covers ws: only in newer browsers).
          'connect-src': ["'self'", ownSocketOrigin],
          'font-src': ["'self'", 'data:'],
          'object-src': ["'none'"],
          'base-uri': ["'none'"],
          'frame-ancestors': ["'none'"],
          'form-action': ["'self'"],
          'upgrade-insecure-requests': config.cookieSecure ? [] : null,
        },
      },
      referrerPolicy: { policy: 'strict-origin-when-cross-origin' },
      crossOriginEmbedderPolicy: false,
      strictTransportSecurity: config.cookieSecure,
    }),
  );
  // The report form may use the camera (photos of the fault); every other powerful feature is off.
  app.use((_req, res, next) => {
    res.setHeader('Permissions-Policy', PERMISSIONS_POLICY);
    next();
  });

  // gzip or brotli (quality 4: about gzip's cost for a smaller body) for the API and the built
  // client alike, negotiated per request; bodies under 1 KiB and images go as they are.
  app.use(compression());

  const api = express.Router();
  const registry: RegisteredRoute[] = [];
  app.locals.routeRegistry = registry;
  // API answers carry personal data: never cached by browsers or proxies.
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  // Health first: it must answer even when the session store (MariaDB) is down.
  mountRoutes(api, '', healthRoutes(), deps, registry);
  // Tools post with their own key, before sessions and CSRF; 500 events fit in 1 MB.
  api.use('/ingest/v1', toolKeyAuth(log), express.json({ limit: '1mb' }));
  mountRoutes(api, '', ingestRoutes(config.DB_POOL_MAX), deps, registry);
  // The SMS provider posts replies with its signature over the raw body, before sessions and CSRF.
  api.use(SMS_WEBHOOK_PATH, ...smsWebhookAuth(opts.smsWebhookKey ?? null, log));
  mountRoutes(api, '', smsWebhookRoutes(), deps, registry);
  api.use(express.json({ limit: '200kb' }));
  api.use(opts.session);
  api.use(opts.passport.initialize());
  api.use(opts.passport.session());
  api.use(sessionLifetime(config, log));
  // A lobby display identifies itself with its key; it may read the board and nothing else.
  api.use(async (req, _res, next) => {
    const key = req.get('x-display-key');
    if (!key || req.user) return next();
    try {
      const id = await verifyDisplayKey(key);
      if (!id) return next(new AppError(401, 'display_revoked', 'This display link is not valid any more.'));
      req.displayLinkId = id;
      next();
    } catch (error) {
      next(error);
    }
  });
  // Signed-out visitors keep no session row; this bounds what one address can make us do.
  api.use(anonymousRateLimit({ limit: config.ANONYMOUS_REQUESTS_PER_MINUTE, log }));
  api.use(csrfProtection(config, log));
  mountRoutes(
    api,
    '',
    apiRoutes({ log, catcher: opts.catcher, config, smsFake: opts.smsFake ?? null, smsMode: () => smsMode(config, !!opts.smsFake) }),
    deps,
    registry,
  );
  api.use((_req, _res, next) => next(new AppError(404, 'not_found', 'There is no such API route.')));
  app.use('/api', api);

  if (opts.distDir && fs.existsSync(path.join(opts.distDir, 'index.html'))) {
    const distDir = opts.distDir;
    app.use(
      express.static(distDir, {
        index: false,
        maxAge: '1h',
        // Vite names built files by their content hash: a new build gets new names, so a
        // browser may keep these for a year without asking again.
        setHeaders: (res, file) => {
          if (file.startsWith(path.join(distDir, 'assets') + path.sep))
            res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
        },
      }),
    );
    // Client-side routes: every other GET gets the app shell.
    app.get('/{*splat}', (_req, res) => res.sendFile('index.html', { root: distDir, maxAge: 0 }));
  }

  app.use(errorMiddleware(log));
  return app;
}
