import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
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
