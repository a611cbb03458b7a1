import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

export interface CaughtMail {
  id: number;
  to: string;
  from: string;
  subject: string;
  text: string;
  /** The Message-ID header, so repeats of one mail can be recognised. */
  messageId: string | null;
  receivedAt: string;
}

/**
 * A local SMTP server that accepts everything and keeps it in memory: development and tests
 * send real SMTP to it, and admins can read what it caught while the demo runs.
 */
export class MailCatcher {
  readonly messages: CaughtMail[] = [];
  private server: SMTPServer | null = null;
  private nextId = 1;
  private waiters: Array<{ match: (m: CaughtMail) => boolean; resolve: (m: CaughtMail) => void }> = [];

  /** Port 0 picks a free port at the first start; restarts reuse the same port. */
  constructor(
    public port: number,
    readonly host = '127.0.0.1',
  ) {}

  get running() {
    return this.server !== null;
  }

  async start() {
    if (this.server) return;
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      onData: (stream, _session, callback) => {
        simpleParser(stream)
          .then((parsed) => {
            const to = Array.isArray(parsed.to) ? parsed.to.map((a) => a.text).join(', ') : (parsed.to?.text ?? '');
            const mail: CaughtMail = {
              id: this.nextId++,
              to,
              from: parsed.from?.text ?? '',
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              messageId: parsed.messageId ?? null,
              receivedAt: new Date().toISOString(),
            };
            this.messages.push(mail);
            if (this.messages.length > 500) this.messages.shift();
            this.waiters = this.waiters.filter((w) => (w.match(mail) ? (w.resolve(mail), false) : true));
            callback();
          })
          .catch((error: Error) => callback(error));
      },
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(this.port, this.host, () => resolve());
    });
    const address = (server as unknown as { server: import('node:net').Server }).server.address();
    if (address && typeof address === 'object') this.port = address.port;
    this.server = server;
  }

  async stop() {
    const server = this.server;
    this.server = null;
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  /** Resolves with the first caught mail (already caught or arriving later) that matches. */
  waitFor(match: (m: CaughtMail) => boolean, timeoutMs = 10_000): Promise<CaughtMail> {
    const found = this.messages.find(match);
    if (found) return Promise.resolve(found);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error('no matching mail arrived in time')), timeoutMs);
      this.waiters.push({ match, resolve: (m) => (clearTimeout(timer), resolve(m)) });
    });
  }
}
