import { Op, type Model, type ModelStatic, type WhereOptions } from 'sequelize';
import type { Logger } from './logger';

/** Back-off after the n-th failed attempt: 2 s, 4 s, 8 s … capped at 10 min, for ever. */
export function backoffMs(attempts: number, baseMs = 2000, capMs = 10 * 60_000) {
  return Math.min(capMs, baseMs * 2 ** Math.min(30, Math.max(0, attempts - 1)));
}

/** The columns every outbox table has (outbox_mails, sms_outbox). */
export interface OutboxRow extends Model {
  id: number;
  status: string;
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  sentAt: Date | null;
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
  /** Run after every pass (the mail worker uses it to warn admins of mail that is late). */
  afterPass?: () => Promise<void>;
}

/**
 * Sends due outbox rows, at least once each: the machinery shared by mail and texts. Rows are
 * claimed with SELECT … FOR UPDATE SKIP LOCKED and a short lease, so several server processes
 * can run workers side by side, and a crash between sending and recording a row sends it again
 * (with the same Message-ID or idempotency key, so the receiver can fold the copy). A failing row
 * is retried with a capped back-off for as long as it takes; it is never given up.
 */
export abstract class LeasedOutboxWorker<R extends OutboxRow> {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;

  constructor(
    private model: ModelStatic<R>,
    protected log: Logger,
    protected opts: OutboxWorkerOptions,
    /** What the log calls one row ("mail", "text"). */
    private noun: string,
  ) {}

  /** Delivers one row; throws to have it retried. What it returns is stored on the row when it went out. */
  protected abstract deliver(row: R): Promise<Record<string, unknown> | void>;

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

  /** One pass over the due rows; returns how many went out. Calls are queued, never overlapped. */
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
  async claim(): Promise<R[]> {
    const sequelize = this.model.sequelize!;
    return sequelize.transaction(async (transaction) => {
      const rows = await this.model.findAll({
        where: { status: 'pending', nextAttemptAt: { [Op.lte]: new Date() } } as WhereOptions,
        order: [['id', 'ASC']],
        limit: this.opts.batch ?? 20,
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
        transaction,
      });
      // The claim is the next attempt time pushed out by the lease: other workers skip the
      // rows until then, and take them over if this worker never comes back.
      if (rows.length)
        await this.model.update({ nextAttemptAt: new Date(Date.now() + this.leaseMs) } as never, {
          where: { id: rows.map((r) => r.id) } as WhereOptions,
          transaction,
        });
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
          void this.model
            .update({ nextAttemptAt: new Date(Date.now() + this.leaseMs) } as never, {
              where: { id: [...open], status: 'pending' } as WhereOptions,
            })
            .catch(() => undefined);
        },
        Math.max(50, Math.floor(this.leaseMs / 3)),
      );
      heartbeat.unref();
      try {
        for (const row of due) {
          try {
            const extra = await this.deliver(row);
            await row.update({ ...(extra ?? {}), status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null });
            sent++;
          } catch (error) {
            const attempts = row.attempts + 1;
            const message = error instanceof Error ? error.message : String(error);
            await row.update({
              attempts,
              lastError: message.slice(0, 1000),
              nextAttemptAt: new Date(Date.now() + backoffMs(attempts, this.opts.baseBackoffMs)),
            });
            this.log.warn({ [`${this.noun}Id`]: row.id, attempts, err: message }, `${this.noun} send failed; will retry`);
          } finally {
            open.delete(row.id);
          }
        }
      } finally {
        clearInterval(heartbeat);
      }
      await this.opts.afterPass?.();
    } catch (error) {
      this.log.warn({ err: String(error) }, `${this.noun} outbox pass failed`);
    }
    return sent;
  }
}
