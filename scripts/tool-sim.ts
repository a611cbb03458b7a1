// Plays a believable stream of alarms and usage counters from one tool against a running
// Faultline, for the demo and the tests:
//
//   npm run tool-sim -- --tool ETCH-02                 (key from the demo's key file)
//   npm run tool-sim -- --tool ETCH-02 --key flt_… --url http://localhost:3000 --fast
//
// The stream: counters (wafers, run hours); a level switch that chatters; a vacuum trip that
// floods the tool with follow-on alarms; a personal-safety alarm (gas detector) that clears
// after a while; and a chamber pressure alarm left set at the end. Times are real (now).

import crypto from 'node:crypto';
import { parseArgs } from 'node:util';
import { DEMO_KEY_TOOLS, demoToolKey } from '../server/db/seed/alarms';

const { values: args } = parseArgs({
  options: {
    tool: { type: 'string' },
    key: { type: 'string' },
    url: { type: 'string', default: process.env.PUBLIC_URL ?? 'http://localhost:3000' },
    fast: { type: 'boolean', default: false },
    only: { type: 'string' },
  },
  strict: true,
});

if (!args.tool) {
  console.error(
    'Usage: npm run tool-sim -- --tool <code> [--key <tool key>] [--url http://localhost:3000] [--fast] [--only counters,chatter,flood,safety,pressure]',
  );
  process.exit(2);
}
const tool = args.tool.toUpperCase();
// The demo tools' keys are known (see server/db/seed/alarms.ts); any other tool needs --key.
const key = args.key ?? process.env.FAULTLINE_TOOL_KEY ?? ((DEMO_KEY_TOOLS as readonly string[]).includes(tool) ? demoToolKey(tool) : '');
if (!key) {
  console.error(`tool-sim: no key for ${tool}. Give --key (made on the tool's page), or use a demo tool: ${DEMO_KEY_TOOLS.join(', ')}.`);
  process.exit(2);
}
const base = args.url!.replace(/\/+$/, '');
const only = args.only ? new Set(args.only.split(',')) : null;
const run = (part: string) => !only || only.has(part);
const scale = args.fast ? 0.01 : 1;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms * scale));
const runId = crypto.randomBytes(4).toString('hex');
let seq = 0;
const say = (msg: string) => console.log(`${new Date().toISOString()} tool-sim ${tool}: ${msg}`);

async function post(pathName: 'alarms' | 'counters', body: unknown) {
  const res = await fetch(`${base}/api/ingest/v1/${pathName}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
    body: JSON.stringify(body),
  });
  const text = await res.text();
  if (res.status !== 202) throw new Error(`Faultline answered ${res.status}: ${text.slice(0, 300)}`);
  return JSON.parse(text) as { accepted: number; duplicates: number };
}

const event = (alarmId: number, set: boolean, text: string, extra: Record<string, unknown> = {}) => ({
  id: `sim-${runId}-${++seq}`,
  alarmId,
  set,
  text,
  at: new Date().toISOString(),
  ...extra,
});

async function alarm(alarmId: number, set: boolean, text: string, extra: Record<string, unknown> = {}) {
  await post('alarms', { events: [event(alarmId, set, text, extra)] });
  say(`${set ? 'SET  ' : 'CLEAR'} ${alarmId} ${text}`);
}

// Cumulative counters that only grow between runs (as on a real tool): derived from the clock.
const sinceEpochMs = Date.now() - Date.UTC(2025, 0, 1);
let wafers = 30_000 + Math.floor(sinceEpochMs / 600_000);
let runHours = 11_000 + sinceEpochMs / 7_200_000;
async function counters() {
  wafers += 1 + Math.floor(Math.random() * 3);
  runHours += 0.05;
  await post('counters', {
    readings: [
      { id: `sim-${runId}-${++seq}`, counter: 'wafers', value: wafers, at: new Date().toISOString() },
      { id: `sim-${runId}-${++seq}`, counter: 'run_hours', value: Math.round(runHours * 100) / 100, at: new Date().toISOString() },
    ],
  });
  say(`counters wafers=${wafers} run_hours=${runHours.toFixed(2)}`);
}

if (run('counters')) await counters();

if (run('chatter')) {
  // A waste-container level switch on the edge of its threshold: sets and clears four times in 50 s.
  for (let i = 0; i < 4; i++) {
    await alarm(3105, true, 'Waste container level high', { category: 6 });
    await sleep(4000);
    await alarm(3105, false, 'Waste container level high', { category: 6 });
    await sleep(8000);
  }
}

if (run('counters')) await counters();

if (run('flood')) {
  // A vacuum trip: the first alarm and its consequences, sixteen alarms in half a minute.
  const cascade = [
    [5201, 'Foreline pressure high'],
    [5202, 'Turbo pump speed low'],
    [5203, 'Chamber pressure out of range'],
    [5204, 'Process gas flow deviation MFC1'],
    [5205, 'Process gas flow deviation MFC2'],
    [5206, 'RF reflected power high'],
    [5207, 'RF generator interlock'],
    [5208, 'Throttle valve position error'],
    [5209, 'Load lock vent timeout'],
    [5210, 'Transfer arm interlock'],
    [5211, 'Wafer presence sensor mismatch'],
    [5212, 'Recipe step aborted'],
    [5213, 'Helium backside flow low'],
    [5214, 'Chiller flow low'],
    [5215, 'Exhaust pressure switch'],
    [5216, 'Process aborted by interlock'],
  ] as const;
  for (const [id, text] of cascade) {
    await alarm(id, true, text, { category: 4 });
    await sleep(1800);
  }
  await sleep(5000);
  await post('alarms', { events: cascade.map(([id, text]) => event(id, false, text, { category: 4 })) });
  say('CLEAR the vacuum cascade');
}

if (run('safety')) {
  // A gas detector at the tool's exhaust (personal safety, ALCD 0x81), cleared 30 s later.
  await post('alarms', {
    events: [
      {
        id: `sim-${runId}-${++seq}`,
        alarmId: 9001,
        alcd: 0x81,
        text: 'Gas detector at exhaust: toxic gas alarm',
        at: new Date().toISOString(),
      },
    ],
  });
  say('SET   9001 Gas detector at exhaust (personal safety)');
  await sleep(30_000);
  await post('alarms', {
    events: [
      {
        id: `sim-${runId}-${++seq}`,
        alarmId: 9001,
        alcd: 0x01,
        text: 'Gas detector at exhaust: toxic gas alarm',
        at: new Date().toISOString(),
      },
    ],
  });
  say('CLEAR 9001 Gas detector at exhaust');
}

if (run('counters')) await counters();

if (run('pressure')) {
  // Left set: the tool page and the board show it as the active alarm.
  await alarm(2041, true, 'Chamber pressure high during process step', { category: 4 });
}
say('done');
