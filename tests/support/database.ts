import { execFileSync } from 'node:child_process';
import path from 'node:path';
import os from 'node:os';
import { projectRoot } from './env';

const socket = path.join(projectRoot, '.data/mariadb/mysqld.sock');

/** Stops the private MariaDB (clean shutdown), for outage tests. */
export function stopDatabase() {
  execFileSync('mariadb-admin', ['--no-defaults', '-S', socket, `-u${os.userInfo().username}`, 'shutdown'], {
    env: { ...process.env, PATH: `${process.env.PATH}:/usr/sbin:/usr/bin` },
  });
}

/** Starts it again (scripts/db.sh waits until it answers). */
export function startDatabase() {
  execFileSync('bash', [path.join(projectRoot, 'scripts/db.sh'), 'start'], { stdio: 'ignore' });
}
