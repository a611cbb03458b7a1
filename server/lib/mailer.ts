import nodemailer, { type Transporter } from 'nodemailer';
import { Op, type Transaction } from 'sequelize';
import { OutboxMail } from './outbox.model';
import type { Config } from '../config';
import type { Logger } from './logger';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/**
 * Queues mail in the outbox inside the caller's transaction: the mail exists exactly when the
 * change that caused it was committed. Nothing is sent here; the outbox worker sends.
 */
export async function queueMail(messages: MailMessage | MailMessage[], transaction?: Transaction | null) {
  const list = Array.isArray(messages) ? messages : [messages];
  if (list.length === 0) return;
  const now = new Date();
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

/** Back-off after the n-th failed attempt: 2 s, 4 s, 8 s … capped at 10 min. */
export function backoffMs(attempts: number, baseMs = 2000, capMs = 10 * 60_000) {
  return Math.min(capMs, baseMs * 2 ** Math.max(0, attempts - 1));
}

/** After this many failures a mail is parked as 'dead' for an admin to look at, never deleted. */
export const MAX_MAIL_ATTEMPTS = 60;

/**
 * Sends due outbox rows. Rows are claimed with SELECT … FOR UPDATE SKIP LOCKED, so several
 * server processes can run workers side by side without sending a mail twice.
 */
export class OutboxWorker {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;

  constructor(
    private transport: Transporter,
    private config: Config,
    private log: Logger,
    private opts: { pollMs: number; baseBackoffMs?: number; batch?: number } = { pollMs: config.OUTBOX_POLL_MS },
  ) {}

  start() {
    if (this.timer) return;
    this.timer = setInterval(() => void this.runOnce(), this.opts.pollMs);
    this.timer.unref();
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }

  /** One pass over the due mail; returns how many were sent. Calls are queued, never overlapped. */
  runOnce(): Promise<number> {
    const pass = (this.running ?? Promise.resolve()).then(() => this.sendDue());
    const settled = pass.then(
      () => undefined,
      () => undefined,
    );
    this.running = settled;
    void settled.finally(() => {
      if (this.running === settled) this.running = null;
    });
    return pass;
  }

  private async sendDue(): Promise<number> {
    let sent = 0;
    try {
      const sequelize = OutboxMail.sequelize!;
      const due = await sequelize.transaction(async (transaction) => {
        const rows = await OutboxMail.findAll({
          where: { status: 'pending', nextAttemptAt: { [Op.lte]: new Date() } },
          order: [['id', 'ASC']],
          limit: this.opts.batch ?? 20,
          lock: transaction.LOCK.UPDATE,
          skipLocked: true,
          transaction,
        });
        // Push the claimed rows' next attempt out so another process's worker leaves them alone.
        const claimUntil = new Date(Date.now() + 60_000);
        if (rows.length) await OutboxMail.update({ nextAttemptAt: claimUntil }, { where: { id: rows.map((r) => r.id) }, transaction });
        return rows;
      });
      for (const mail of due) {
        try {
          await this.transport.sendMail({
            from: this.config.MAIL_FROM,
            to: mail.toAddress,
            subject: mail.subject,
            text: mail.textBody,
            html: mail.htmlBody ?? undefined,
          });
          await mail.update({ status: 'sent', sentAt: new Date(), attempts: mail.attempts + 1, lastError: null });
          sent++;
        } catch (error) {
          const attempts = mail.attempts + 1;
          const message = error instanceof Error ? error.message : String(error);
          await mail.update({
            attempts,
            lastError: message.slice(0, 1000),
            status: attempts >= MAX_MAIL_ATTEMPTS ? 'dead' : 'pending',
            nextAttemptAt: new Date(Date.now() + backoffMs(attempts, this.opts.baseBackoffMs)),
          });
          this.log.warn({ mailId: mail.id, attempts, err: message }, 'mail send failed; will retry');
        }
      }
    } catch (error) {
      this.log.warn({ err: String(error) }, 'outbox pass failed');
    }
    return sent;
  }
}
