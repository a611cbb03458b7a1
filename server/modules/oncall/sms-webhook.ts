import express, { type RequestHandler } from 'express';
import { TelnyxWebhook } from 'telnyx/lib/webhooks';
import { securityLog, type Logger } from '../../lib/logger';

/** Where the provider posts inbound texts (under /api). */
export const SMS_WEBHOOK_PATH = '/oncall/sms/inbound';

/**
 * Checks the provider's signature over the exact bytes it sent (Ed25519 over
 * "<timestamp>|<body>", timestamp within 5 minutes) with the provider SDK's own verifier.
 * Only then is the body parsed and the request marked signed; anything else reaches the
 * route's 'webhook' access rule unsigned and is refused with 401, before anything is read.
 */
export function smsWebhookAuth(publicKey: string | null, log: Logger): RequestHandler[] {
  const verifier = publicKey ? new TelnyxWebhook(publicKey) : null;
  if (!verifier) log.warn('No SMS webhook public key is set: replies to pages are refused (SMS_WEBHOOK_PUBLIC_KEY).');
  return [
    express.raw({ type: () => true, limit: '64kb' }),
    async (req, _res, next) => {
      const raw = Buffer.isBuffer(req.body) ? req.body.toString('utf8') : '';
      req.body = undefined;
      try {
        if (!verifier) throw new Error('no key');
        const headers = Object.fromEntries(Object.entries(req.headers).map(([k, v]) => [k, Array.isArray(v) ? v[0] : (v ?? '')]));
        await verifier.verify(raw, headers);
        req.signedWebhook = true;
        try {
          req.body = JSON.parse(raw);
        } catch {
          req.body = raw; // signed but not JSON: the schema refuses it with a 400
        }
      } catch {
        securityLog(log, req, 'webhook_signature_refused');
      }
      next();
    },
  ];
}
