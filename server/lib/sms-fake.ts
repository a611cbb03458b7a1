import http from 'node:http';
import crypto from 'node:crypto';
import type { CaughtText } from '../../shared/schemas/oncall';

/**
 * A local stand-in for the SMS provider, for the demo and the tests (like the mail catcher):
 * it speaks the one call Faultline makes (POST /v2/messages, Bearer key, Idempotency-Key),
 * keeps what it received in memory, and can text back: it posts an inbound-message event to
 * Faultline's webhook, signed with its own Ed25519 test key the way the provider signs
 * (signature over "<timestamp>|<body>", headers telnyx-signature-ed25519 and telnyx-timestamp).
 */
export class SmsFake {
  readonly texts: CaughtText[] = [];
  readonly apiKey = 'fake-sms-key';
  /** Where replies go (Faultline's inbound webhook); set once Faultline listens. */
  webhookUrl: string | null = null;
  private server: http.Server | null = null;
  private keys = crypto.generateKeyPairSync('ed25519');
  private waiters: Array<{ match: (t: CaughtText) => boolean; resolve: (t: CaughtText) => void }> = [];
  private seq = 0;

  /** Port 0 picks a free port at the first start; restarts reuse the same port. */
  constructor(
    public port: number,
    readonly host = '127.0.0.1',
  ) {}

  get running() {
    return this.server !== null;
  }

  /** What the SDK's baseURL is set to. */
  get baseUrl() {
    return `http://${this.host}:${this.port}/v2`;
  }

  /** The raw 32-byte public key, base64, as the provider shows it to its customers. */
  get publicKey() {
    return this.keys.publicKey.export({ format: 'der', type: 'spki' }).subarray(-32).toString('base64');
  }

  async start() {
    if (this.server) return;
    const server = http.createServer((req, res) => void this.handle(req, res));
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(this.port, this.host, () => resolve());
    });
    const address = server.address();
    if (address && typeof address === 'object') this.port = address.port;
    this.server = server;
  }

  async stop() {
    const server = this.server;
    this.server = null;
    if (server) {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    }
  }

  private async handle(req: http.IncomingMessage, res: http.ServerResponse) {
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    if (req.method !== 'POST' || req.url !== '/v2/messages') return send(404, { errors: [{ title: 'Not found' }] });
    if (req.headers.authorization !== `Bearer ${this.apiKey}`) return send(401, { errors: [{ title: 'Authentication failed' }] });
    let body: { to?: unknown; from?: unknown; text?: unknown };
    try {
      body = JSON.parse(Buffer.concat(chunks).toString('utf8'));
    } catch {
      return send(400, { errors: [{ title: 'Invalid JSON' }] });
    }
    if (typeof body.to !== 'string' || typeof body.text !== 'string' || !body.text)
      return send(422, { errors: [{ title: 'to and text are required' }] });
    const key = typeof req.headers['idempotency-key'] === 'string' ? req.headers['idempotency-key'] : null;
    const earlier = key ? this.texts.find((t) => t.idempotencyKey === key && !t.repeat) : undefined;
    const text: CaughtText = {
      id: earlier?.id ?? crypto.randomUUID(),
      to: body.to,
      from: typeof body.from === 'string' ? body.from : '',
      text: body.text,
      idempotencyKey: key,
      repeat: !!earlier,
      receivedAt: new Date().toISOString(),
      replies: [],
    };
    this.texts.push(text);
    if (this.texts.length > 500) this.texts.shift();
    this.waiters = this.waiters.filter((w) => (w.match(text) ? (w.resolve(text), false) : true));
    send(200, {
      data: {
        id: text.id,
        record_type: 'message',
        direction: 'outbound',
        to: [{ phone_number: text.to }],
        from: { phone_number: text.from },
        text: text.text,
      },
    });
  }

  /** Headers that sign `body` as the provider does (tests also sign with other keys through this). */
  signedHeaders(body: string, privateKey: crypto.KeyObject = this.keys.privateKey, at = new Date()) {
    const timestamp = String(Math.floor(at.getTime() / 1000));
    const signature = crypto.sign(null, Buffer.from(`${timestamp}|${body}`), privateKey).toString('base64');
    return { 'telnyx-signature-ed25519': signature, 'telnyx-timestamp': timestamp };
  }

  /** The inbound-message event the provider would post when `from` texts `to`. */
  inboundEvent(from: string, to: string, text: string) {
    const now = new Date().toISOString();
    return JSON.stringify({
      data: {
        event_type: 'message.received',
        id: crypto.randomUUID(),
        occurred_at: now,
        record_type: 'event',
        payload: {
          id: crypto.randomUUID(),
          record_type: 'message',
          direction: 'inbound',
          from: { phone_number: from },
          to: [{ phone_number: to }],
          text,
          received_at: now,
        },
      },
      meta: { attempt: 1, delivered_to: this.webhookUrl },
    });
  }

  /** The paged person texts back: a signed event to Faultline's webhook; returns its HTTP status. */
  async reply(textId: string, text: string): Promise<number> {
    const original = this.texts.find((t) => t.id === textId);
    if (!original) throw new Error('no such text');
    if (!this.webhookUrl) throw new Error('the fake does not know where to send replies');
    const body = this.inboundEvent(original.to, original.from, text);
    const res = await fetch(this.webhookUrl, {
      method: 'POST',
      headers: { 'content-type': 'application/json', ...this.signedHeaders(body) },
      body,
    });
    original.replies.push({ text, at: new Date().toISOString(), status: res.status });
    return res.status;
  }

  /** Resolves with the first text (received already or later) that matches. */
  waitFor(match: (t: CaughtText) => boolean, timeoutMs = 10_000): Promise<CaughtText> {
    const found = this.texts.find(match);
    if (found) return Promise.resolve(found);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error('no matching text arrived in time')), timeoutMs);
      this.waiters.push({ match, resolve: (t) => (clearTimeout(timer), resolve(t)) });
    });
  }
}
