// Moves photos from the local upload folder (UPLOAD_DIR) to the S3-compatible bucket named by
// the S3_* settings: `npm run photos:move [-- --limit N]`. Safe to interrupt and run again
// (see server/lib/storage/move-photos.ts); docs/operations.md says when to run it.
import { parseArgs } from 'node:util';
import { loadConfig } from '../server/config';
import { S3PhotoStore, s3SettingsFrom } from '../server/lib/storage/s3-store';
import { movePhotos } from '../server/lib/storage/move-photos';

const { values } = parseArgs({ options: { limit: { type: 'string' }, help: { type: 'boolean', short: 'h' } } });
if (values.help) {
  console.log('Usage: npm run photos:move [-- --limit N]\nCopies each photo in UPLOAD_DIR to S3_BUCKET once, verifies it, then deletes the local file.');
  process.exit(0);
}
const limit = values.limit === undefined ? undefined : Number(values.limit);
if (limit !== undefined && !(Number.isInteger(limit) && limit >= 0)) {
  console.error('--limit takes a whole number of photos (0 or more).');
  process.exit(2);
}

// The move needs no database and no session secret: only the folder and the bucket.
const config = loadConfig(process.env, { SESSION_SECRET: process.env.SESSION_SECRET ?? 'x'.repeat(32) });
if (!config.S3_BUCKET) {
  console.error('Set S3_BUCKET (and S3_ENDPOINT, S3_REGION, S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY, S3_FORCE_PATH_STYLE as needed) first.');
  process.exit(2);
}
const target = new S3PhotoStore(s3SettingsFrom(config));
try {
  const summary = await movePhotos({
    dir: config.UPLOAD_DIR,
    target,
    limit,
    // One JSON line per photo, written as soon as it is done: a log of what moved.
    onPhoto: (name, outcome, detail) => console.log(JSON.stringify({ photo: name, outcome, ...(detail ? { detail } : {}) })),
  });
  console.log(JSON.stringify({ summary }));
  if (summary.failed > 0) {
    console.error(`${summary.failed} photo(s) could not be copied and stay in ${config.UPLOAD_DIR}; run the command again.`);
    process.exitCode = 1;
  } else if (summary.left > 0) console.error(`Stopped at the limit; ${summary.left} photo(s) left. Run the command again to go on.`);
} finally {
  target.close();
}
