import crypto from 'node:crypto';
import type { Transaction } from 'sequelize';
import { AlarmDefinition, ToolKey } from '../../modules/alarms/alarms.model';
import type { FacilitySeed } from './facility';
import { createRandom } from './random';
import type { AlarmRule } from '../../../shared/schemas/alarms';

// A few months of alarms from the demo tools (invented alarm IDs and texts, generic for the
// trade), and ingest keys for two demo tools so the simulator can post at once.

/** The demo tools that get keys; their keys are printed by `npm start`. */
export const DEMO_KEY_TOOLS = ['ICP-2', 'TRACK-A'] as const;

/**
 * Demo keys are derived from the tool code, so the welcome text and the simulator know them
 * without a secret store. They are as public as the demo passwords: a real facility starts
 * from an empty database (no demo data) and makes its own keys, which are random.
 */
export const demoToolKey = (code: string) =>
  `flt_demo_${crypto.createHash('sha256').update(`faultline demo tool key ${code}`).digest('base64url').slice(0, 32)}`;

const DAY = 86_400_000;
const MINUTE = 60_000;
const HISTORY_DAYS = 120;

interface AlarmSpec {
  id: string;
  text: string;
  category: number | null;
  /** Mean sets per day on a busy tool. */
  perDay: number;
  meanMinutes: number;
  rule?: AlarmRule;
}

const COMMON: AlarmSpec[] = [
  { id: '1101', text: 'Door interlock open', category: 6, perDay: 1.5, meanMinutes: 2 },
  { id: '1203', text: 'Cooling water flow low', category: 3, perDay: 0.4, meanMinutes: 15 },
  { id: '1310', text: 'Exhaust pressure switch', category: 2, perDay: 0.05, meanMinutes: 8 },
  { id: '1402', text: 'Recipe parameter outside limits', category: 4, perDay: 0.6, meanMinutes: 5 },
  { id: '1507', text: 'Controller communication timeout', category: 8, perDay: 0.2, meanMinutes: 3 },
];

const BY_KIND: [RegExp, AlarmSpec[]][] = [
  [
    /etch|asher|mill|RIE|ICP|DRIE/i,
    [
      { id: '2041', text: 'Chamber pressure high during process step', category: 4, perDay: 1.2, meanMinutes: 6, rule: 'ticket_down' },
      { id: '2107', text: 'RF reflected power high', category: 3, perDay: 2, meanMinutes: 1 },
      { id: '2210', text: 'Helium backside flow low', category: 4, perDay: 0.8, meanMinutes: 4 },
      { id: '2302', text: 'Process gas flow deviation', category: 3, perDay: 1.5, meanMinutes: 2 },
    ],
  ],
  [
    /track|coat/i,
    [
      { id: '3105', text: 'Waste container level high', category: 6, perDay: 1, meanMinutes: 40 },
      { id: '3202', text: 'Wafer not detected on chuck', category: 5, perDay: 0.7, meanMinutes: 10, rule: 'ticket' },
      { id: '3310', text: 'Hotplate temperature out of range', category: 4, perDay: 0.5, meanMinutes: 12 },
      { id: '3401', text: 'Resist pump pressure low', category: 3, perDay: 0.9, meanMinutes: 3 },
    ],
  ],
  [
    /furnace|LPCVD|tube|oxid/i,
    [
      { id: '4102', text: 'Zone thermocouple deviation', category: 4, perDay: 0.6, meanMinutes: 20 },
      { id: '4210', text: 'Boat elevator position error', category: 5, perDay: 0.2, meanMinutes: 15, rule: 'ticket' },
      { id: '4305', text: 'Vacuum pump warning', category: 6, perDay: 0.8, meanMinutes: 30 },
    ],
  ],
];

/** Seeds definitions, events and occurrences for up to 12 busy tools, plus counters and keys. */
export async function seedAlarms(transaction: Transaction, facility: FacilitySeed, now: Date) {
  const rnd = createRandom(0xa1a2);
  const sequelize = ToolKey.sequelize!;
  const nowMs = Math.floor(now.getTime() / MINUTE) * MINUTE;
  const from = nowMs - HISTORY_DAYS * DAY;
  const keyed = facility.tools.filter((t) => (DEMO_KEY_TOOLS as readonly string[]).includes(t.code));
  const others = facility.tools
    .filter((t) => !keyed.includes(t))
    .filter((_, i) => i % 3 === 0)
    .slice(0, 10);
  const tools = [...keyed, ...others];

  for (const t of keyed) {
    const key = demoToolKey(t.code);
    await ToolKey.create(
      {
        toolId: t.id,
        label: 'Demo host computer',
        keyHash: crypto.createHash('sha256').update(key).digest('hex'),
        keyHint: key.slice(0, 10),
        createdById: null,
        lastUsedAt: null,
        revokedAt: null,
        createdAt: new Date(from),
      },
      { transaction },
    );
  }

  const events: unknown[][] = [];
  const occurrences: unknown[][] = [];
  let seq = 0;
  for (const tool of tools) {
    const specs = [...COMMON, ...(BY_KIND.find(([re]) => re.test(`${tool.name} ${tool.code}`))?.[1] ?? [])];
    const busy = keyed.includes(tool) ? 1.6 : 0.5 + rnd.next();
    const defs = await AlarmDefinition.bulkCreate(
      specs.map((s) => ({
        toolId: tool.id,
        alarmKey: s.id,
        text: s.text,
        category: s.category,
        rule: s.rule ?? null,
        moduleId: null,
        chatteringSince: null,
        lastNotifiedAt: null,
        createdAt: new Date(from),
        updatedAt: new Date(from),
      })),
      { transaction },
    );
    for (const [i, spec] of specs.entries()) {
      const def = defs[i];
      let t = from + rnd.exp(DAY / (spec.perDay * busy));
      while (t < nowMs - 2 * 60 * MINUTE) {
        // Now and then an alarm chatters: a burst of quick sets within a minute.
        const burst = rnd.chance(0.015) ? rnd.int(3, 6) : 1;
        for (let b = 0; b < burst; b++) {
          const setAt = t + b * rnd.int(8, 18) * 1000;
          const clearAt = setAt + (burst > 1 ? rnd.int(2, 6) * 1000 : Math.max(10_000, rnd.exp(spec.meanMinutes * MINUTE)));
          events.push(
            [tool.id, `seed-${++seq}`, def.id, 1, spec.category, spec.text, new Date(setAt)],
            [tool.id, `seed-${++seq}`, def.id, 0, spec.category, spec.text, new Date(clearAt)],
          );
          occurrences.push([tool.id, def.id, new Date(setAt), new Date(clearAt), burst > 1 ? 1 : 0]);
        }
        t += rnd.exp(DAY / (spec.perDay * busy)) + 60 * MINUTE;
      }
    }
    // An attention flag that never sent its clear (SEMI E5 allows that): stale on the tool page.
    if (keyed.includes(tool) || rnd.chance(0.3)) {
      const [flag] = await AlarmDefinition.bulkCreate(
        [
          {
            toolId: tool.id,
            alarmKey: '7001',
            text: 'Preventive maintenance counter reached',
            category: 7,
            rule: null,
            moduleId: null,
            chatteringSince: null,
            lastNotifiedAt: null,
            createdAt: new Date(from),
            updatedAt: new Date(from),
          },
        ],
        { transaction },
      );
      const setAt = nowMs - rnd.int(30, 70) * 60 * MINUTE;
      events.push([tool.id, `seed-${++seq}`, flag.id, 1, 7, flag.text, new Date(setAt)]);
      occurrences.push([tool.id, flag.id, new Date(setAt), null, 0]);
    }
  }
  // A flood on one of the keyed tools a few weeks ago: a vacuum trip and its follow-on alarms.
  if (keyed[0]) {
    const defsOf = await AlarmDefinition.findAll({ where: { toolId: keyed[0].id }, transaction });
    const start = nowMs - 23 * DAY + 9 * 60 * MINUTE;
    for (let i = 0; i < 24; i++) {
      const def = defsOf[i % defsOf.length];
      const setAt = start + i * 20_000;
      events.push(
        [keyed[0].id, `seed-${++seq}`, def.id, 1, def.category, def.text, new Date(setAt)],
        [keyed[0].id, `seed-${++seq}`, def.id, 0, def.category, def.text, new Date(setAt + 15 * MINUTE)],
      );
      occurrences.push([keyed[0].id, def.id, new Date(setAt), new Date(setAt + 15 * MINUTE), 0]);
    }
  }

  const created = new Date(nowMs);
  for (let i = 0; i < events.length; i += 1000) {
    const chunk = events.slice(i, i + 1000);
    await sequelize.query(
      `INSERT INTO alarm_events (tool_id, sender_id, definition_id, is_set, category, text, at, received_at) VALUES ${chunk.map(() => '(?, ?, ?, ?, ?, ?, ?, ?)').join(', ')}`,
      { replacements: chunk.flatMap((e) => [...e, created]), transaction },
    );
  }
  for (let i = 0; i < occurrences.length; i += 1000) {
    const chunk = occurrences.slice(i, i + 1000);
    await sequelize.query(
      `INSERT INTO alarm_occurrences (tool_id, definition_id, set_at, cleared_at, cleared_by, chattering, created_at) VALUES ${chunk.map(() => '(?, ?, ?, ?, ?, ?, ?)').join(', ')}`,
      {
        replacements: chunk.flatMap(([toolId, defId, setAt, clearedAt, chatter]) => [
          toolId,
          defId,
          setAt,
          clearedAt,
          clearedAt ? 'tool' : null,
          chatter,
          created,
        ]),
        transaction,
      },
    );
  }

  // Daily usage counters for the keyed tools (wafers and run hours, cumulative).
  const readings: unknown[][] = [];
  for (const tool of keyed) {
    let wafers = 20_000 + rnd.int(0, 5000);
    let hours = 9_000 + rnd.int(0, 500);
    for (let d = HISTORY_DAYS; d >= 1; d--) {
      wafers += rnd.int(5, 60);
      hours += 8 + rnd.next() * 10;
      const at = new Date(nowMs - d * DAY);
      readings.push([tool.id, `seed-w-${d}`, 'wafers', wafers, at], [tool.id, `seed-h-${d}`, 'run_hours', Math.round(hours * 10) / 10, at]);
    }
  }
  if (readings.length) {
    await sequelize.query(
      `INSERT INTO counter_readings (tool_id, sender_id, counter, value, at, received_at) VALUES ${readings.map(() => '(?, ?, ?, ?, ?, ?)').join(', ')}`,
      {
        replacements: readings.flatMap((r) => [...r, created]),
        transaction,
      },
    );
  }
  return { tools: tools.length, occurrences: occurrences.length, keyed: keyed.map((t) => t.code) };
}
