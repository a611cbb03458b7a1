import crypto from 'node:crypto';
import fs from 'node:fs';
import https from 'node:https';
import tls from 'node:tls';
import webpush from 'web-push';
import { Op, type Transaction } from 'sequelize';
import { PushOutbox, PushSubscription, ServerKey } from './push.model';
import { backoffMs } from '../../lib/mailer';
import type { AppDeps } from '../../lib/http';
import type { Config } from '../../config';
import type { Logger } from '../../lib/logger';
import type { PushPayload, PushStatus, PushSubscriptionInput } from '../../../shared/schemas/push';

const hashEndpoint = (endpoint: string) => crypto.createHash('sha256').update(endpoint).digest('hex');

/** After this many failed sends a push is dropped: a notice that arrives a day late helps nobody. */
export const MAX_PUSH_ATTEMPTS = 20;

type VapidKeys = { publicKey: string; privateKey: string };
let cached: VapidKeys | null = null;

/**
 * The VAPID key pair that signs our pushes, generated at the first start and kept in MariaDB,
 * so every server process (and every restart) signs with the same key and existing browser
 * subscriptions stay valid. INSERT IGNORE settles a race between two processes starting at once.
 */
export async function vapidKeys(deps: Pick<AppDeps, 'sequelize'>): Promise<VapidKeys> {
  if (cached) return cached;
  let row = await ServerKey.findByPk('vapid');
  if (!row) {
    const fresh = webpush.generateVAPIDKeys();
    await deps.sequelize.query('INSERT IGNORE INTO server_keys (name, value, created_at) VALUES (?, ?, NOW(3))', {
      replacements: ['vapid', JSON.stringify(fresh)],
    });
    row = await ServerKey.findByPk('vapid');
  }
  cached = JSON.parse(row!.value) as VapidKeys;
  return cached;
}

export async function pushStatus(deps: AppDeps, userId: number): Promise<PushStatus> {
  const [{ publicKey }, subscriptions] = await Promise.all([vapidKeys(deps), PushSubscription.count({ where: { userId } })]);
  return { publicKey, subscriptions };
}

/** Keeps one browser's subscription; the same browser signed in as someone else moves to them. */
export async function subscribe(deps: AppDeps, userId: number, input: PushSubscriptionInput): Promise<PushStatus> {
  const endpointHash = hashEndpoint(input.endpoint);
  await deps.sequelize.transaction(async (transaction) => {
    const existing = await PushSubscription.findOne({ where: { endpointHash }, transaction, lock: transaction.LOCK.UPDATE });
    const values = { userId, endpoint: input.endpoint, endpointHash, p256dh: input.keys.p256dh, auth: input.keys.auth };
    if (existing) await existing.update(values, { transaction });
    else await PushSubscription.create(values, { transaction });
  });
  return pushStatus(deps, userId);
}

export async function unsubscribe(deps: AppDeps, userId: number, endpoint: string): Promise<PushStatus> {
  await PushSubscription.destroy({ where: { userId, endpointHash: hashEndpoint(endpoint) } });
  return pushStatus(deps, userId);
}

/**
 * Queues a push to every browser of these people, in the caller's transaction: the push exists
 * exactly when the change that caused it was committed. The worker sends it.
 */
export async function queuePush(userIds: readonly number[], payload: PushPayload, transaction?: Transaction | null) {
  const ids = [...new Set(userIds)];
  if (ids.length === 0) return;
  const subs = await PushSubscription.findAll({ where: { userId: ids }, attributes: ['id'], transaction: transaction ?? undefined });
  if (subs.length === 0) return;
  const body = JSON.stringify({
    title: payload.title.slice(0, 200),
    body: payload.body.slice(0, 500),
    link: payload.link,
  } satisfies PushPayload);
  const now = new Date();
  await PushOutbox.bulkCreate(
    subs.map((s) => ({ subscriptionId: s.id, payload: body, nextAttemptAt: now })),
    { transaction: transaction ?? undefined },
  );
}

/**
 * Sends due pushes. Rows are claimed with FOR UPDATE SKIP LOCKED and their next attempt pushed
 * out, so several server processes never send the same push twice at once. A push service
 * answering 404 or 410 means the browser dropped the subscription: it is removed.
 */
export class PushWorker {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;
  /** Push services speak https only; a local fake's certificate authority can be added. */
  private agent: https.Agent | undefined;

  constructor(
    private deps: Pick<AppDeps, 'sequelize'>,
    private config: Config,
    private log: Logger,
  ) {
    if (config.PUSH_CA_FILE)
      this.agent = new https.Agent({ ca: [...tls.rootCertificates, fs.readFileSync(config.PUSH_CA_FILE, 'utf8')], keepAlive: false });
  }

  start() {
    if (this.timer) return;
    this.timer = setInterval(() => void this.runOnce(), this.config.OUTBOX_POLL_MS);
    this.timer.unref();
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running?.catch(() => undefined);
  }

  /** One pass; returns how many pushes were delivered. Passes are queued, never overlapped. */
  runOnce(): Promise<number> {
    const pass = (this.running ?? Promise.resolve()).catch(() => undefined).then(() => this.sendDue());
    this.running = pass;
    return pass;
  }

  private async sendDue(): Promise<number> {
    let sent = 0;
    try {
      const due = await this.deps.sequelize.transaction(async (transaction) => {
        const rows = await PushOutbox.findAll({
          where: { status: 'pending', nextAttemptAt: { [Op.lte]: new Date() } },
          include: [{ model: PushSubscription, as: 'subscription', required: true }],
          order: [['id', 'ASC']],
          limit: 20,
          lock: { level: transaction.LOCK.UPDATE, of: PushOutbox },
          skipLocked: true,
          transaction,
        });
        if (rows.length)
          await PushOutbox.update({ nextAttemptAt: new Date(Date.now() + 60_000) }, { where: { id: rows.map((r) => r.id) }, transaction });
        return rows;
      });
      if (due.length === 0) return 0;
      const vapid = await vapidKeys(this.deps);
      for (const row of due) {
        const sub = row.subscription!;
        try {
          await webpush.sendNotification({ endpoint: sub.endpoint, keys: { p256dh: sub.p256dh, auth: sub.auth } }, row.payload, {
            vapidDetails: { subject: this.config.PUSH_SUBJECT, publicKey: vapid.publicKey, privateKey: vapid.privateKey },
            TTL: 6 * 3600,
            timeout: 5000,
            agent: this.agent,
          });
          await row.update({ status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null });
          sent++;
        } catch (error) {
          const status = (error as { statusCode?: number }).statusCode;
          if (status === 404 || status === 410) {
            await PushSubscription.destroy({ where: { id: sub.id } }); // its outbox rows go with it
            this.log.info({ subscriptionId: sub.id, status }, 'push subscription expired; removed');
            continue;
          }
          const attempts = row.attempts + 1;
          const message = (error instanceof Error ? error.message : String(error)).slice(0, 1000);
          await row.update({
            attempts,
            lastError: message,
            status: attempts >= MAX_PUSH_ATTEMPTS ? 'gone' : 'pending',
            nextAttemptAt: new Date(Date.now() + backoffMs(attempts, this.config.OUTBOX_BASE_BACKOFF_MS)),
          });
          this.log.warn({ pushId: row.id, attempts, status, err: message }, 'push send failed; will retry');
        }
      }
    } catch (error) {
      this.log.warn({ err: String(error) }, 'push pass failed');
    }
    return sent;
  }
}
