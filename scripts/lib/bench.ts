// What the benchmarks in scripts/bench share: their configuration, a fresh faultline_bench
// database (never the demo or test one), and a signed-in session cookie.
import { loadConfig, type Config } from '../../server/config';
import { createSequelize, createMigrator } from '../../server/db';
import { localSecrets } from './local-secrets';

export function benchConfig(overrides: Record<string, string> = {}): Config {
  const secrets = localSecrets();
  return loadConfig(process.env, {
    DB_NAME: 'faultline_bench',
    DB_PASSWORD: process.env.DB_PASSWORD ?? secrets.DB_PASSWORD ?? '',
    SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.SESSION_SECRET ?? 'bench-session-secret-bench-session-secret',
    PORT: '0',
    LOG_LEVEL: 'silent',
    NODE_ENV: 'production',
    ...overrides,
  });
}

/** Drops and rebuilds faultline_bench with every migration; returns a connection to it. */
export async function rebuildBenchDatabase(config: Config) {
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_bench');
  await admin.query('CREATE DATABASE faultline_bench CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  return sequelize;
}

/** Signs in through the API and returns the session cookie ("name=value"). */
export async function signInCookie(url: string, email: string, password: string): Promise<string> {
  const first = await fetch(`${url}/api/session`);
  const cookie = first.headers.get('set-cookie')!.split(';')[0];
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const r = await fetch(`${url}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie },
    body: JSON.stringify({ email, password }),
  });
  if (r.status !== 200) throw new Error(`bench sign-in failed: ${r.status}`);
  return r.headers.get('set-cookie')!.split(';')[0];
}
