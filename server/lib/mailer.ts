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

/** Back-off after the n-th failed attempt: 2 s, 4 s, 8 s … capped at 10 min, for ever. */
export function backoffMs(attempts: number, baseMs = 2000, capMs = 10 * 60_000) {
  return Math.min(capMs, baseMs * 2 ** Math.min(30, Math.max(0, attempts - 1)));
}

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

export interface OutboxWorkerOptions {
  pollMs: number;
  baseBackoffMs?: number;
  batch?: number;
  /**
   * How long a claim holds rows for this worker. A heartbeat renews it while the worker sends,
   * so only a worker that died (or hangs) loses its rows, which other workers then take over.
   */
  leaseMs?: number;
  /** Run after every pass (the app uses it to warn admins of mail that is late). */
  afterPass?: () => Promise<void>;
}

/**
 * Sends due outbox rows, at least once each. Rows are claimed with SELECT … FOR UPDATE SKIP
 * LOCKED and a short lease, so several server processes can run workers side by side, and a
 * crash between sending and recording a mail sends it again with the same Message-ID.
 * A failing mail is retried with a capped back-off for as long as it takes; it is never given up.
 */
export class OutboxWorker {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;

  constructor(
    private transport: Transporter,
    private config: Config,
    private log: Logger,
    private opts: OutboxWorkerOptions = { pollMs: config.OUTBOX_POLL_MS },
  ) {}

  private get leaseMs() {
    return this.opts.leaseMs ?? 15_000;
  }

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

  /** Claims up to one batch of due rows for leaseMs (exported for tests of a worker that dies). */
  async claim(): Promise<OutboxMail[]> {
    const sequelize = OutboxMail.sequelize!;
    return sequelize.transaction(async (transaction) => {
      const rows = await OutboxMail.findAll({
        where: { status: 'pending', nextAttemptAt: { [Op.lte]: new Date() } },
        order: [['id', 'ASC']],
        limit: this.opts.batch ?? 20,
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
        transaction,
      });
      // The claim is the next attempt time pushed out by the lease: other workers skip the
      // rows until then, and take them over if this worker never comes back.
      if (rows.length)
        await OutboxMail.update(
          { nextAttemptAt: new Date(Date.now() + this.leaseMs) },
          { where: { id: rows.map((r) => r.id) }, transaction },
        );
      return rows;
    });
  }

  private async sendDue(): Promise<number> {
    let sent = 0;
    try {
      const due = await this.claim();
      const open = new Set(due.map((m) => m.id));
      const heartbeat = setInterval(
        () => {
          if (open.size === 0) return;
          void OutboxMail.update(
            { nextAttemptAt: new Date(Date.now() + this.leaseMs) },
            { where: { id: [...open], status: 'pending' } },
          ).catch(() => undefined);
        },
        Math.max(50, Math.floor(this.leaseMs / 3)),
      );
      heartbeat.unref();
      try {
        for (const mail of due) {
          try {
            await this.transport.sendMail({
              from: this.config.MAIL_FROM,
              to: mail.toAddress,
              subject: mail.subject,
              text: mail.textBody,
              html: mail.htmlBody ?? undefined,
              messageId: messageIdFor(mail, this.config),
            });
            await mail.update({ status: 'sent', sentAt: new Date(), attempts: mail.attempts + 1, lastError: null });
            sent++;
          } catch (error) {
            const attempts = mail.attempts + 1;
            const message = error instanceof Error ? error.message : String(error);
            await mail.update({
              attempts,
              lastError: message.slice(0, 1000),
              nextAttemptAt: new Date(Date.now() + backoffMs(attempts, this.opts.baseBackoffMs)),
            });
            this.log.warn({ mailId: mail.id, attempts, err: message }, 'mail send failed; will retry');
          } finally {
            open.delete(mail.id);
          }
        }
      } finally {
        clearInterval(heartbeat);
      }
      await this.opts.afterPass?.();
    } catch (error) {
      this.log.warn({ err: String(error) }, 'outbox pass failed');
    }
    return sent;
  }
}
