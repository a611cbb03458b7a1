import { Telnyx } from 'telnyx';
import type { Transaction } from 'sequelize';
import { SmsOutbox } from '../modules/oncall/oncall.model';
import { LeasedOutboxWorker, type OutboxWorkerOptions } from './outbox';
import type { Config } from '../config';
import type { Logger } from './logger';

export interface TextMessage {
  to: string;
  text: string;
  /** Stable per text (e.g. `page-42`): the outbox keeps one row per key and sends it with the request. */
  idempotencyKey: string;
}

/**
 * Queues texts in the caller's transaction, like queueMail: a text exists exactly when the change
 * that caused it was committed. A key already queued is not queued again.
 */
export async function queueSms(messages: TextMessage[], transaction: Transaction) {
  if (messages.length === 0) return;
  const now = new Date();
  await SmsOutbox.bulkCreate(
    messages.map((m) => ({ toNumber: m.to, body: m.text.slice(0, 1000), idempotencyKey: m.idempotencyKey, nextAttemptAt: now })),
    { transaction, ignoreDuplicates: true },
  );
}

export type SmsMode = 'fake' | 'provider' | 'off';

export function smsMode(config: Config, fakeRunning: boolean): SmsMode {
  if (fakeRunning) return 'fake';
  return config.SMS_API_KEY ? 'provider' : 'off';
}

/** The provider's SDK client; its base address points at the local fake when one runs. */
export function createSmsClient(config: Config, fake: { baseUrl: string; apiKey: string } | null) {
  return new Telnyx({
    apiKey: fake?.apiKey ?? config.SMS_API_KEY ?? null,
    baseURL: fake?.baseUrl ?? config.SMS_BASE_URL ?? undefined,
    // The outbox retries with its own back-off; the SDK's own retries would hold the lease.
    maxRetries: 0,
    timeout: 5000,
  });
}

/** Sends due texts through the provider's SDK: the mail outbox's machinery (LeasedOutboxWorker). */
export class SmsWorker extends LeasedOutboxWorker<SmsOutbox> {
  constructor(
    private client: Telnyx,
    private config: Config,
    log: Logger,
    opts: OutboxWorkerOptions,
  ) {
    super(SmsOutbox, log, opts, 'text');
  }

  protected async deliver(row: SmsOutbox) {
    const res = await this.client.messages.send(
      { from: this.config.SMS_FROM, to: row.toNumber, text: row.body },
      // The same key on every attempt: a retry after a lost answer is one text, not two.
      { headers: { 'Idempotency-Key': row.idempotencyKey } },
    );
    return { providerId: res.data?.id ?? null };
  }
}
