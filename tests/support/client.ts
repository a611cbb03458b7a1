/**
 * A small HTTP client for tests that behaves like the browser app: keeps the session cookie,
 * reads the CSRF token from GET /api/session and sends it on every state-changing request.
 */
export class TestClient {
  cookie: string | null = null;
  csrfToken: string | null = null;

  constructor(readonly baseUrl: string) {}

  async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    const h: Record<string, string> = { ...headers };
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
    const setCookie = res.headers.get('set-cookie');
    if (setCookie) {
      const first = setCookie.split(';')[0];
      this.cookie = first.endsWith('=') ? null : first;
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
