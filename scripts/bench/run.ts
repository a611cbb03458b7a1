// Runs every benchmark in scripts/bench (each *.ts but this one), one after another, each in
// its own process so one benchmark's server and pools never skew the next one's figures.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { localSecrets } from '../lib/local-secrets';

const dir = path.dirname(fileURLToPath(import.meta.url));

// The local database password and session secret (written by scripts/db.sh), unless the
// environment already names them, so `npm run bench` works like `npm test` on a dev machine.
const env = { ...process.env };
for (const [name, value] of Object.entries(localSecrets())) env[name] ??= value;
const only = process.argv.slice(2);
const benches = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith('.ts') && f !== 'run.ts' && !f.endsWith('.d.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.startsWith(o)))
  .sort();

let failed = 0;
for (const file of benches) {
  console.log(`\n=== ${file} ===`);
  const result = spawnSync(process.execPath, ['--import', 'tsx', path.join(dir, file)], { stdio: 'inherit', env });
  if (result.status !== 0) {
    failed++;
    console.error(`${file} failed (exit ${result.status ?? result.signal}).`);
  }
}
if (benches.length === 0) console.log('No benchmarks found.');
process.exit(failed > 0 ? 1 : 0);
