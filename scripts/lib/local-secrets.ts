import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const secretsFile = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../.data/secrets.env');

/**
 * The database password and session secret that scripts/db.sh writes to .data/secrets.env
 * (KEY=value lines), so tests and benchmarks run on a dev machine without exporting them.
 * Empty when the file is missing; callers let the environment win over it.
 */
export function localSecrets(): Record<string, string> {
  if (!fs.existsSync(secretsFile)) return {};
  const secrets: Record<string, string> = {};
  for (const line of fs.readFileSync(secretsFile, 'utf8').split('\n')) {
    const at = line.indexOf('=');
    if (at > 0) secrets[line.slice(0, at)] = line.slice(at + 1);
  }
  return secrets;
}
