import { z } from 'zod';

/** Base64url as browsers hand out subscription keys (no padding). */
const base64url = (min: number, max: number) =>
  z
    .string()
    .min(min)
    .max(max)
    .regex(/^[A-Za-z0-9_-]+$/, 'Must be base64url text');

/** What PushSubscription.toJSON() gives in a browser: the push service's URL and our keys. */
export const pushSubscriptionInput = z.strictObject({
  endpoint: z.url({ protocol: /^https$/, message: 'Must be the push service address (https)' }).max(2000),
  expirationTime: z.number().nullable().optional(),
  keys: z.strictObject({
    p256dh: base64url(80, 100),
    auth: base64url(16, 30),
  }),
});
export type PushSubscriptionInput = z.infer<typeof pushSubscriptionInput>;

export const pushUnsubscribeInput = z.strictObject({ endpoint: z.url().max(2000) });

export interface PushStatus {
  /** The VAPID public key the browser needs to subscribe (base64url). */
  publicKey: string;
  /** How many browsers of mine receive pushes. */
  subscriptions: number;
}

/** What a push carries; the service worker shows it as a notification. */
export interface PushPayload {
  title: string;
  body: string;
  /** A path inside the app to open when the notification is tapped. */
  link: string;
}
