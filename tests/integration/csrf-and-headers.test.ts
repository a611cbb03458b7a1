import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient, TEST_PASSWORD } from '../support/factories';
import { TestClient } from '../support/client';
import { User } from '../../server/modules/users/user.model';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('CSRF', () => {
  it('when a signed-in user sends a state-changing request without the token, then 403 and nothing changes', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const email = `csrf-${Date.now()}@test.faultline.test`;
    const r = await client.post('/api/users', { email, name: 'Nobody', role: 'member' }, { 'x-csrf-token': '' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('csrf_failed');
    expect(await User.findOne({ where: { email } })).toBeNull();
  });

  it('when the token is wrong, then 403', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    const r = await client.post(
      '/api/users',
      { email: 'x@test.faultline.test', name: 'X', role: 'member' },
      { 'x-csrf-token': 'A'.repeat(43) },
    );
    expect(r.status).toBe(403);
  });

  it('when the request comes from another site (Origin or Fetch-Metadata), then 403 even with the token', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    expect((await client.delete('/api/session', { origin: 'https://evil.example' })).status).toBe(403);
    expect((await client.delete('/api/session', { 'sec-fetch-site': 'cross-site' })).status).toBe(403);
    // Still signed in: the refused requests changed nothing.
    expect((await client.get('/api/session')).body.user).not.toBeNull();
  });

  it('when the Origin names the Host header instead of the public address, then 403 even with the token', async () => {
    const { client } = await signedInClient(server.url, 'admin');
    // The test server's public address is http://localhost:0; the request goes to 127.0.0.1.
    expect(server.config.publicUrl).not.toBe(server.url);
    const r = await client.delete('/api/session', { origin: server.url });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('csrf_failed');
    expect((await client.delete('/api/session', { origin: new URL(server.config.publicUrl).origin })).status).toBe(204);
  });

  it('when a signed-out visitor sends the token of their cookie, then it goes through; without the cookie it does not', async () => {
    const visitor = new TestClient(server.url);
    await visitor.refreshCsrf();
    const email = `${Date.now()}-nobody@test.faultline.test`;
    expect((await visitor.post('/api/session', { email, password: 'whatever-it-is' })).status).toBe(401);
    const cookieless = new TestClient(server.url);
    const r = await cookieless.post('/api/session', { email, password: 'whatever-it-is' }, { 'x-csrf-token': visitor.csrfToken! });
    expect(r.status).toBe(403);
  });

  it('when the token is right, then the request goes through', async () => {
    const { client } = await signedInClient(server.url, 'member');
    expect((await client.delete('/api/session')).status).toBe(204);
  });
});

describe('security headers', () => {
  it('when any API route answers, then helmet headers, a strict CSP and no-store are set, and no stack leaks', async () => {
    const r = await fetch(`${server.url}/api/session`);
    const csp = r.headers.get('content-security-policy')!;
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("base-uri 'none'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(r.headers.get('x-content-type-options')).toBe('nosniff');
    expect(r.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
    expect(r.headers.get('cache-control')).toBe('no-store');
    expect(r.headers.get('x-powered-by')).toBeNull();
    // Sockets and fetches only to the app itself.
    const connect = /connect-src ([^;]*)/.exec(csp)![1].trim().split(/\s+/);
    expect(connect).toEqual(["'self'", 'ws://localhost:0']);
    // Camera for the report form's photos, nothing else.
    const permissions = r.headers.get('permissions-policy')!;
    expect(permissions).toContain('camera=(self)');
    for (const feature of ['microphone', 'geolocation', 'payment', 'usb']) expect(permissions).toContain(`${feature}=()`);

    const bad = await fetch(`${server.url}/api/session`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: '{not json',
    });
    const text = await bad.text();
    expect(text).not.toMatch(/at .*\.ts:\d+/);
    expect(JSON.parse(text).error).toEqual(expect.objectContaining({ code: expect.any(String), message: expect.any(String) }));
  });
});

describe('behind a TLS-terminating proxy', () => {
  it('when PUBLIC_URL is https and TRUST_PROXY names the proxy, then sign-in sets a Secure cookie and the user stays signed in', async () => {
    const s = await startTestServer({ PUBLIC_URL: 'https://faultline.example.test', TRUST_PROXY: 'loopback' });
    try {
      const user = await createUser();
      const client = new TestClient(s.url, { 'x-forwarded-proto': 'https', 'x-forwarded-for': '192.0.2.77' });
      const r = await client.signIn(user.email, TEST_PASSWORD);
      expect(r.status).toBe(200);
      expect(client.jar.has('faultline.sid')).toBe(true);
      expect((await client.get('/api/session')).body.user.id).toBe(user.id);
      const raw = await fetch(`${s.url}/api/session`, { headers: { 'x-forwarded-proto': 'https' } });
      expect(raw.headers.getSetCookie().every((c) => /;\s*Secure/i.test(c))).toBe(true);
      expect(raw.headers.get('content-security-policy')).toContain('wss://faultline.example.test');
    } finally {
      await s.close();
    }
  });

  it('when PUBLIC_URL is https and no proxy is trusted, then no session cookie is set (what TRUST_PROXY is for)', async () => {
    const s = await startTestServer({ PUBLIC_URL: 'https://faultline.example.test' });
    try {
      const user = await createUser();
      const client = new TestClient(s.url, { 'x-forwarded-proto': 'https' });
      expect((await client.signIn(user.email, TEST_PASSWORD)).status).toBe(200);
      expect(client.jar.has('faultline.sid')).toBe(false);
    } finally {
      await s.close();
    }
  });

  it('when TRUST_PROXY is "true", then the configuration is refused with a reason', async () => {
    const { loadConfig } = await import('../../server/config');
    expect(() => loadConfig({}, { SESSION_SECRET: 'x'.repeat(32), TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY/);
  });
});
