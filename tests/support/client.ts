/**
 * A small HTTP client for tests that behaves like the browser app: keeps the session cookie,
 * reads the CSRF token from GET /api/session and sends it on every state-changing request.
 */
export class TestClient {
  /** The cookies this client holds, by name (the session cookie, the signed-out CSRF cookie). */
  readonly jar = new Map<string, string>();
  csrfToken: string | null = null;

  /** `headers` go with every request (e.g. X-Forwarded-For behind a trusted proxy). */
  constructor(
    readonly baseUrl: string,
    readonly headers: Record<string, string> = {},
  ) {}

  /** The Cookie header this client sends (null when it holds none); assigning replaces the jar. */
  get cookie(): string | null {
    return this.jar.size ? [...this.jar].map(([name, value]) => `${name}=${value}`).join('; ') : null;
  }
  set cookie(header: string | null) {
    this.jar.clear();
    for (const part of (header ?? '').split(';')) {
      const eq = part.indexOf('=');
      if (eq > 0) this.jar.set(part.slice(0, eq).trim(), part.slice(eq + 1).trim());
    }
  }

  /** The server-side session id behind the session cookie (s:<sid>.<signature>), if any. */
  get sessionId(): string | null {
    const value = this.jar.get('faultline.sid');
    return value ? decodeURIComponent(value).slice(2).split('.')[0] : null;
  }

  async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    const h: Record<string, string> = { ...this.headers, ...headers };
    if (method !== 'GET' && method !== 'HEAD') {
      if (!this.csrfToken && !('x-csrf-token' in h)) await this.refreshCsrf();
      if (this.csrfToken && !('x-csrf-token' in h)) h['x-csrf-token'] = this.csrfToken;
    }
    if (this.cookie) h.cookie = this.cookie;
    let payload: BodyInit | undefined;
    if (body instanceof FormData) payload = body;
    else if (body !== undefined) {
      h['content-type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const res = await fetch(this.baseUrl + path, { method, headers: h, body: payload, redirect: 'manual' });
    for (const setCookie of res.headers.getSetCookie()) {
      const first = setCookie.split(';')[0];
      const eq = first.indexOf('=');
      const name = first.slice(0, eq).trim();
      const value = first.slice(eq + 1).trim();
      // An empty value or a date in the past is how a server clears a cookie.
      if (!value || /expires=Thu, 01 Jan 1970/i.test(setCookie)) this.jar.delete(name);
      else this.jar.set(name, value);
    }
    const text = await res.text();
    let json: any = null;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      json = null;
    }
    return { status: res.status, body: json, text, headers: res.headers };
  }

  async refreshCsrf() {
    const r = await this.request('GET', '/api/session');
    this.csrfToken = r.body?.csrfToken ?? null;
    return r;
  }

  get(path: string, headers?: Record<string, string>) {
    return this.request('GET', path, undefined, headers);
  }
  post(path: string, body?: unknown, headers?: Record<string, string>) {
    return this.request('POST', path, body, headers);
  }
  patch(path: string, body?: unknown, headers?: Record<string, string>) {
    return this.request('PATCH', path, body, headers);
  }
  put(path: string, body?: unknown, headers?: Record<string, string>) {
    return this.request('PUT', path, body, headers);
  }
  delete(path: string, headers?: Record<string, string>) {
    return this.request('DELETE', path, undefined, headers);
  }

  async signIn(email: string, password: string) {
    await this.refreshCsrf();
    const r = await this.post('/api/session', { email, password });
    if (r.status === 200) this.csrfToken = r.body.csrfToken;
    return r;
  }
}
