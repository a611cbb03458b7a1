// The Faultline log forwarder, for tool computers without a host link: it follows a growing
// alarm/event log, turns matching lines into alarm events and posts them to the ingest API.
//
//   npm run forwarder -- --url http://faultline.example:3000 --key flt_… --log /path/alarms.log \
//     --pattern '^(?<at>\S+) ALARM (?<id>\d+) (?<state>SET|CLEAR) (?<text>.*)$'
//
// Nothing is lost or sent twice across restarts of either side:
// - each event's id is derived from the log file's identity and the line's byte offset, so a
//   resent event is recognised by the server (idempotent by sender id);
// - lines read but not yet accepted wait in a local state file (written atomically before
//   sending), together with the file offset, so a restart resumes exactly where it stopped.

import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';

interface PendingEvent {
  id: string;
  alarmId: number | string;
  set: boolean;
  text?: string;
  at: string;
  module?: string;
}

interface ForwarderState {
  /** Identity of the log file (device + inode); a new file starts from offset 0. */
  fileId: string;
  offset: number;
  pending: PendingEvent[];
  sent: number;
}

const { values: args } = parseArgs({
  options: {
    url: { type: 'string' },
    key: { type: 'string' },
    log: { type: 'string' },
    pattern: { type: 'string' },
    state: { type: 'string' },
    'max-backoff-ms': { type: 'string', default: '30000' },
    'poll-ms': { type: 'string', default: '500' },
    batch: { type: 'string', default: '200' },
    'set-words': { type: 'string', default: 'set,on,raised,active,alarm,1,true' },
    'clear-words': { type: 'string', default: 'clear,cleared,off,reset,ok,0,false' },
    help: { type: 'boolean', default: false },
  },
  strict: true,
});

function usage(message?: string): never {
  if (message) console.error(`forwarder: ${message}\n`);
  console.error(
    [
      'Usage: npm run forwarder -- --url <Faultline URL> --key <tool key> --log <file> --pattern <regex>',
      '  --pattern   a regular expression with named groups: id (alarm ID), state (set/clear word),',
      '              text (alarm text), and optionally at (ISO time on the tool) and module (module code)',
      '  --state     where to keep the offset and unsent events (default: <log>.faultline-state.json)',
      '  --poll-ms   how often to look for new lines (default 500)',
      '  --max-backoff-ms   the longest wait between retries while Faultline is away (default 30000)',
      '  --set-words / --clear-words   comma-separated words for the state group',
      'The key can also come from the FAULTLINE_TOOL_KEY environment variable.',
    ].join('\n'),
  );
  process.exit(2);
}

if (args.help) usage();
const baseUrl = (args.url ?? '').replace(/\/+$/, '');
const key = args.key ?? process.env.FAULTLINE_TOOL_KEY ?? '';
if (!baseUrl) usage('--url is required');
if (!key) usage('--key (or FAULTLINE_TOOL_KEY) is required');
if (!args.log) usage('--log is required');
if (!args.pattern) usage('--pattern is required');
let pattern: RegExp;
try {
  pattern = new RegExp(args.pattern);
} catch (error) {
  usage(`the pattern is not a valid regular expression: ${(error as Error).message}`);
}
const groups = ['id', 'state', 'text'].filter((g) => !new RegExp(`\\(\\?<${g}>`).test(args.pattern!));
if (groups.length) usage(`the pattern needs the named groups id, state and text (missing: ${groups.join(', ')})`);

const logPath = path.resolve(args.log!);
const statePath = path.resolve(args.state ?? `${logPath}.faultline-state.json`);
const pollMs = Math.max(50, Number(args['poll-ms']) || 500);
const batchSize = Math.min(500, Math.max(1, Number(args.batch) || 200));
const setWords = new Set(
  args['set-words']!.toLowerCase()
    .split(',')
    .map((w) => w.trim()),
);
const clearWords = new Set(
  args['clear-words']!.toLowerCase()
    .split(',')
    .map((w) => w.trim()),
);
const endpoint = `${baseUrl}/api/ingest/v1/alarms`;
const maxBackoffMs = Math.max(100, Number(args['max-backoff-ms']) || 30_000);

const say = (msg: string) => console.log(`${new Date().toISOString()} forwarder: ${msg}`);

function fileIdOf(stat: fs.Stats) {
  return `${stat.dev}:${stat.ino}`;
}

function loadState(): ForwarderState {
  try {
    const s = JSON.parse(fs.readFileSync(statePath, 'utf8')) as ForwarderState;
    if (typeof s.offset === 'number' && Array.isArray(s.pending)) return s;
  } catch {
    // No state yet (first run) or unreadable: start fresh.
  }
  return { fileId: '', offset: 0, pending: [], sent: 0 };
}

/** Written to a temporary file and renamed: a crash leaves the old state or the new, never half. */
function saveState(s: ForwarderState) {
  const tmp = `${statePath}.tmp`;
  const fd = fs.openSync(tmp, 'w');
  fs.writeSync(fd, JSON.stringify(s));
  fs.fsyncSync(fd);
  fs.closeSync(fd);
  fs.renameSync(tmp, statePath);
}

const state = loadState();
const eventIdPrefix = () => `fw-${crypto.createHash('sha256').update(`${logPath}|${state.fileId}`).digest('hex').slice(0, 12)}`;

function toEvent(line: string, offset: number): PendingEvent | null {
  const m = pattern.exec(line);
  if (!m?.groups) return null;
  const word = (m.groups.state ?? '').trim().toLowerCase();
  const set = setWords.has(word) ? true : clearWords.has(word) ? false : null;
  if (set === null) {
    say(`skipped a line with an unknown state word "${m.groups.state}" at byte ${offset}`);
    return null;
  }
  const rawId = (m.groups.id ?? '').trim();
  if (!rawId) return null;
  const at = m.groups.at && !Number.isNaN(Date.parse(m.groups.at)) ? new Date(m.groups.at).toISOString() : new Date().toISOString();
  const text = (m.groups.text ?? '').trim().slice(0, 500);
  return {
    id: `${eventIdPrefix()}-${offset}`,
    alarmId: /^\d{1,9}$/.test(rawId) ? Number(rawId) : rawId.slice(0, 64),
    set,
    ...(text ? { text } : {}),
    at,
    ...(m.groups.module ? { module: m.groups.module.trim() } : {}),
  };
}

/** Reads the complete new lines of the log into the pending list; returns how many matched. */
function readNewLines(): number {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(logPath);
  } catch {
    return 0; // the log is not there (yet); keep looking
  }
  const id = fileIdOf(stat);
  if (state.fileId !== id || stat.size < state.offset) {
    // A new or rotated file: read it from the start.
    if (state.fileId) say(`the log file changed (rotated or truncated); reading the new one from its start`);
    state.fileId = id;
    state.offset = 0;
  }
  if (stat.size === state.offset) return 0;
  const fd = fs.openSync(logPath, 'r');
  try {
    const length = Math.min(stat.size - state.offset, 4 * 1024 * 1024);
    const buf = Buffer.alloc(length);
    fs.readSync(fd, buf, 0, length, state.offset);
    let start = 0;
    let matched = 0;
    for (let i = 0; i < buf.length; i++) {
      if (buf[i] !== 0x0a) continue;
      const line = buf.subarray(start, i).toString('utf8').replace(/\r$/, '');
      const event = toEvent(line, state.offset + start);
      if (event) {
        state.pending.push(event);
        matched++;
      }
      start = i + 1;
    }
    // Only complete lines move the offset; a half-written last line is read next time.
    state.offset += start;
    saveState(state);
    return matched;
  } finally {
    fs.closeSync(fd);
  }
}

let backoffMs = 0;

/** Sends pending events in batches; keeps them on any failure and retries with back-off. */
async function sendPending(): Promise<void> {
  while (state.pending.length) {
    const batch = state.pending.slice(0, batchSize);
    let res: Response;
    try {
      res = await fetch(endpoint, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
        body: JSON.stringify({ events: batch }),
        signal: AbortSignal.timeout(15_000),
      });
    } catch (error) {
      backoffMs = Math.min(maxBackoffMs, Math.max(Math.min(1000, maxBackoffMs), backoffMs * 2));
      say(`Faultline is unreachable (${(error as Error).message}); ${state.pending.length} events wait; retrying in ${backoffMs / 1000} s`);
      return;
    }
    const body = await res.text();
    if (res.status === 202) {
      state.pending.splice(0, batch.length);
      state.sent += batch.length;
      saveState(state);
      backoffMs = 0;
      continue;
    }
    if (res.status === 400) {
      // The server refuses these events as they are; keep them aside so the rest can flow.
      fs.appendFileSync(
        `${statePath}.rejected.jsonl`,
        batch.map((e) => JSON.stringify({ event: e, answer: body.slice(0, 2000) })).join('\n') + '\n',
      );
      state.pending.splice(0, batch.length);
      saveState(state);
      say(`Faultline refused ${batch.length} events (kept in ${statePath}.rejected.jsonl): ${body.slice(0, 300)}`);
      continue;
    }
    backoffMs = Math.min(maxBackoffMs * 2, Math.max(Math.min(1000, maxBackoffMs), backoffMs * 2));
    const retryAfter = Number(res.headers.get('retry-after'));
    if (Number.isFinite(retryAfter) && retryAfter > 0) backoffMs = Math.max(backoffMs, retryAfter * 1000);
    say(
      `Faultline answered ${res.status}${res.status === 401 ? ' (the key is unknown or revoked)' : ''}; ${state.pending.length} events wait; retrying in ${backoffMs / 1000} s`,
    );
    return;
  }
}

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    stopping = true;
  });
}

say(`following ${logPath} → ${endpoint} (state in ${statePath}; ${state.pending.length} events waiting, offset ${state.offset})`);
while (!stopping) {
  readNewLines();
  await sendPending();
  await new Promise((r) => setTimeout(r, backoffMs || pollMs));
}
saveState(state);
say(`stopped; ${state.pending.length} events wait for the next start`);
