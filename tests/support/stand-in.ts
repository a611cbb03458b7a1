import { spawn } from 'node:child_process';
import path from 'node:path';
import { projectRoot } from './env';

/**
 * Starts a real server in a child process against the shared test database (the private
 * MariaDB that a running demo uses too) and resolves with its URL. Outage tests poll it to show
 * that stopping their own throw-away database leaves everyone else's answering.
 */
export async function startStandInServer(): Promise<{ url: string; stop: () => Promise<void> }> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(projectRoot, 'tests/support/stand-in-main.ts')], {
    cwd: projectRoot,
    env: process.env,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const port = await new Promise<number>((resolve, reject) => {
    let out = '';
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /listening (\d+)/.exec(out);
      if (m) resolve(Number(m[1]));
    });
    child.once('exit', (code) => reject(new Error(`stand-in server exited with ${code}`)));
  });
  return {
    url: `http://127.0.0.1:${port}`,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
