import nodemailer, { type Transporter } from 'nodemailer';
import { Op, type Transaction } from 'sequelize';
import { OutboxMail } from '../modules/mail/outbox.model';
import type { Config } from '../config';
import type { Logger } from './logger';
import { LeasedOutboxWorker, type OutboxWorkerOptions } from './outbox';

export type { OutboxWorkerOptions } from './outbox';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /**
   * Messages with the same key within `foldMs` become one mail: the first waits that long in
   * the outbox, later ones are added to it (e.g. one person's updates on one ticket).
   */
  fold?: { key: string; ms: number };
}

/** How a folded mail reads: the latest subject, then every update, oldest first. */
function foldInto(row: OutboxMail, m: MailMessage) {
  const count = (row.textBody.match(/^— Update \d+ —$/gm) ?? []).length || 1;
  const first = count === 1 ? `— Update 1 —\n${row.textBody}` : row.textBody;
  return { subject: `${m.subject} (${count + 1} updates)`.slice(0, 255), textBody: `${first}\n\n— Update ${count + 1} —\n${m.text}` };
}

/**
 * Queues mail in the outbox inside the caller's transaction: the mail exists exactly when the
 * change that caused it was committed. Nothing is sent here; the outbox worker sends.
 */
export async function queueMail(messages: MailMessage | MailMessage[], transaction?: Transaction | null) {
  const all = Array.isArray(messages) ? messages : [messages];
  if (all.length === 0) return;
  const now = new Date();
  const list: MailMessage[] = [];
  for (const m of all) {
    if (!m.fold || m.fold.ms <= 0) {
      list.push(m);
      continue;
    }
    // Only a row still waiting well before its send time is joined, so the worker never
    // claims a row while it grows.
    const open = await OutboxMail.findOne({
      where: { foldKey: m.fold.key, status: 'pending', attempts: 0, nextAttemptAt: { [Op.gt]: new Date(now.getTime() + 5_000) } },
      order: [['id', 'DESC']],
      lock: transaction ? transaction.LOCK.UPDATE : undefined,
      transaction: transaction ?? undefined,
    });
    if (open) await open.update(foldInto(open, m), { transaction: transaction ?? undefined });
    else
      await OutboxMail.create(
        {
          toAddress: m.to,
          subject: m.subject.slice(0, 255),
          textBody: m.text,
          htmlBody: m.html ?? null,
          nextAttemptAt: new Date(now.getTime() + m.fold.ms),
          lastError: null,
          sentAt: null,
          foldKey: m.fold.key,
        },
        { transaction: transaction ?? undefined },
      );
  }
  if (list.length === 0) return;
  await OutboxMail.bulkCreate(
    list.map((m) => ({
      toAddress: m.to,
      subject: m.subject.slice(0, 255),
      textBody: m.text,
      htmlBody: m.html ?? null,
      nextAttemptAt: now,
      lastError: null,
      sentAt: null,
    })),
    { transaction: transaction ?? undefined },
  );
}

export function createTransport(config: Config): Transporter {
  return nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
    // The local catcher speaks plain SMTP; a real relay would be configured with TLS.
    ignoreTLS: !config.SMTP_SECURE && !config.SMTP_USER,
    connectionTimeout: 3000,
    greetingTimeout: 3000,
    socketTimeout: 5000,
  });
}

export { backoffMs } from './outbox';

/** A mail still not delivered this long after it was queued is shown to admins (and they are told). */
export const MAIL_LATE_AFTER_MS = 60 * 60_000;

/**
 * The Message-ID of an outbox row: the same on every attempt, so a receiver (or a mail client)
 * folds the copy a retry may deliver after a crash between sending and recording it.
 */
export function messageIdFor(mail: Pick<OutboxMail, 'id' | 'createdAt'>, config: Pick<Config, 'MAIL_FROM' | 'publicUrl'>): string {
  const domain = /@([A-Za-z0-9.-]+)>?\s*$/.exec(config.MAIL_FROM)?.[1] ?? new URL(config.publicUrl).hostname;
  return `<outbox.${mail.id}.${mail.createdAt.getTime().toString(36)}@${domain}>`;
}

/** Sends due outbox mail through SMTP (the machinery is LeasedOutboxWorker, shared with texts). */
export class OutboxWorker extends LeasedOutboxWorker<OutboxMail> {
  constructor(
    private transport: Transporter,
    private config: Config,
    log: Logger,
    opts: OutboxWorkerOptions = { pollMs: config.OUTBOX_POLL_MS },
  ) {
    super(OutboxMail, log, opts, 'mail');
  }

  protected async deliver(mail: OutboxMail) {
    await this.transport.sendMail({
      from: this.config.MAIL_FROM,
      to: mail.toAddress,
      subject: mail.subject,
      text: mail.textBody,
      html: mail.htmlBody ?? undefined,
      messageId: messageIdFor(mail, this.config),
    });
  }
}
