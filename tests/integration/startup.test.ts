import { spawn, execFileSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createSequelize } from '../../server/db';
import { projectRoot, testConfig } from '../support/env';
import { localSecrets } from '../../scripts/lib/local-secrets';

// What `npm start` and scripts/db.sh tell a person must be true: no welcome while something
// else holds our port, and the database status names the port the server really uses.

let blocker: net.Server;
let busyPort: number;
beforeAll(async () => {
  blocker = net.createServer((socket) => socket.end('HTTP/1.1 200 OK\r\nContent-Length: 0\r\n\r\n'));
  await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', () => resolve()));
  busyPort = (blocker.address() as net.AddressInfo).port;
});
afterAll(() => new Promise<void>((resolve) => blocker.close(() => resolve())));

function run(command: string, args: string[], env: Record<string, string>, timeoutMs = 60_000) {
  return new Promise<{ code: number | null; out: string }>((resolve) => {
    const child = spawn(command, args, { cwd: projectRoot, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (out += c.toString()));
    const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
    child.on('exit', (code) => {
      clearTimeout(timer);
      resolve({ code, out });
    });
  });
}

describe('start-up', () => {
  it('when the app port is already taken, then npm start names the port and how to choose another, prints no welcome and exits non-zero', async () => {
    const r = await run('bash', ['scripts/start.sh'], { PORT: String(busyPort), SMTP_PORT: '0' });
    expect(r.code).not.toBe(0);
    expect(r.out).toContain(`Port ${busyPort} (PORT)`);
    expect(r.out).toMatch(/PORT=\d+ npm start/);
    expect(r.out).not.toContain('Faultline is running');
    expect(r.out).not.toContain('Demo sign-ins');
  });

  it('when the mail catcher port is already taken, then npm start names SMTP_PORT and exits non-zero without a welcome', async () => {
    const r = await run('bash', ['scripts/start.sh'], { PORT: '0', SMTP_PORT: String(busyPort) });
    expect(r.code).not.toBe(0);
    expect(r.out).toContain(`Port ${busyPort} (SMTP_PORT)`);
    expect(r.out).not.toContain('Faultline is running');
  });

  it('when the port is taken after the check (a race), then the server itself says which port, writes no ready file and exits 1', async () => {
    const readyFile = path.join(projectRoot, 'test-results', `ready-${process.pid}`);
    fs.rmSync(readyFile, { force: true });
    const config = testConfig();
    const secrets = localSecrets();
    const r = await run(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
      PORT: String(busyPort),
      READY_FILE: readyFile,
      NODE_ENV: 'test',
      LOG_LEVEL: 'silent',
      DB_NAME: 'faultline_test',
      DB_PORT: String(config.DB_PORT),
      DB_PASSWORD: config.DB_PASSWORD || secrets.DB_PASSWORD || '',
      SESSION_SECRET: 'x'.repeat(40),
      MAIL_CATCHER: 'false',
    });
    expect(r.code).toBe(1);
    expect(r.out).toContain(`:${busyPort} (PORT): the port is already in use`);
    expect(fs.existsSync(readyFile)).toBe(false);
  });
});

describe('database status', () => {
  it('when DB_PORT in the environment differs from the running server, then status reports the port in use', async () => {
    const config = testConfig();
    const db = createSequelize({ ...config, DB_NAME: 'information_schema' }, { bindModels: false });
    const [row] = await db.query<{ port: number }>('SELECT @@port AS port', { type: QueryTypes.SELECT });
    await db.close();
    const out = execFileSync('bash', ['scripts/db.sh', 'status'], { cwd: projectRoot, env: { ...process.env, DB_PORT: '1' } }).toString();
    expect(out.trim()).toBe(`running on 127.0.0.1:${row.port}`);
  });
});
