import { execFileSync, spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createMigrator, createSequelize } from '../../server/db';
import { freePort } from './server';
import { testConfig } from './env';

const env = { ...process.env, PATH: `${process.env.PATH}:/usr/sbin:/usr/bin:/sbin` };
const asRoot = os.userInfo().uid === 0 ? ['--user=root'] : [];

export interface ScratchDatabase {
  port: number;
  /** Overrides for startTestServer / testConfig that point at this instance. */
  overrides: Record<string, string>;
  /** Clean shutdown (the outage). */
  stop(): void;
  /** Start again on the same port and wait until it answers. */
  start(): Promise<void>;
  /** Stop and delete its data folder. */
  destroy(): void;
}

/**
 * A throw-away MariaDB of a test's own (own data folder under the system temp dir, own port),
 * for tests that stop or kill the database: the private instance that `npm start`'s demo and
 * the other tests use is never touched. It holds a migrated `faultline_test` database.
 */
export async function startScratchDatabase(): Promise<ScratchDatabase> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-db-'));
  const socket = path.join(dir, 'mysqld.sock');
  const port = await freePort();
  const password = crypto.randomBytes(18).toString('base64url');
  const user = os.userInfo().username;
  execFileSync(
    'mariadb-install-db',
    [
      '--no-defaults',
      `--datadir=${dir}/data`,
      `--user=${user}`,
      '--auth-root-authentication-method=socket',
      '--skip-test-db',
      '--skip-name-resolve',
    ],
    { env, stdio: 'ignore' },
  );

  const ping = () => {
    try {
      execFileSync('mariadb-admin', ['--no-defaults', '-S', socket, `-u${user}`, '--connect-timeout=1', 'ping'], { env, stdio: 'ignore' });
      return true;
    } catch {
      return false;
    }
  };
  const start = async () => {
    const child = spawn(
      'mariadbd',
      [
        '--no-defaults',
        ...asRoot,
        `--datadir=${dir}/data`,
        `--socket=${socket}`,
        `--pid-file=${dir}/mysqld.pid`,
        `--port=${port}`,
        '--bind-address=127.0.0.1',
        `--log-error=${dir}/mysqld.err`,
        '--skip-name-resolve',
        '--character-set-server=utf8mb4',
        '--collation-server=utf8mb4_unicode_ci',
        '--innodb-buffer-pool-size=32M',
      ],
      { env, detached: true, stdio: 'ignore' },
    );
    child.unref();
    for (let i = 0; i < 300; i++) {
      if (ping()) return;
      await new Promise((r) => setTimeout(r, 100));
    }
    throw new Error(`scratch MariaDB did not start; see ${dir}/mysqld.err`);
  };
  const stop = () => {
    if (ping()) execFileSync('mariadb-admin', ['--no-defaults', '-S', socket, `-u${user}`, 'shutdown'], { env, stdio: 'ignore' });
  };

  await start();
  execFileSync('mariadb', ['--no-defaults', '-S', socket, `-u${user}`], {
    env,
    input: `CREATE DATABASE faultline_test CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER 'faultline'@'127.0.0.1' IDENTIFIED BY '${password}';
GRANT ALL PRIVILEGES ON faultline_test.* TO 'faultline'@'127.0.0.1';
FLUSH PRIVILEGES;`,
  });
  const overrides = { DB_PORT: String(port), DB_PASSWORD: password, DB_USER: 'faultline', DB_HOST: '127.0.0.1' };
  const sequelize = createSequelize(testConfig(overrides), { bindModels: false });
  try {
    await createMigrator(sequelize).up();
  } finally {
    await sequelize.close();
  }
  return {
    port,
    overrides,
    stop,
    start,
    destroy() {
      stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
