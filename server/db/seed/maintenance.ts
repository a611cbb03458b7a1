import crypto from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { createRandom } from './random';
import { uniformity, capability, judgeLimits, type FigureLimit } from '../../../shared/requalification';
import type { ChecklistStep } from '../../../shared/schemas/maintenance';

// Demo maintenance (invented): a calendar plan for every tool, a usage plan (wafers) for the
// tools that count wafers, a year of completed work orders — a few late, a few skipped —,
// requalification templates for the coat tracks and their hot plates with a year of records,
// a few booked windows ahead, and a spare-parts list. Limits are common practice of the
// trade (resist thickness within about ±100 Å; soft bake about 90 °C, vapour prime about
// 125 °C), not a published standard.

const DAY = 86400_000;

const step = (text: string, reading?: { unit: string; min: number | null; max: number | null }): ChecklistStep => ({
  text,
  unit: reading?.unit ?? null,
  min: reading?.min ?? null,
  max: reading?.max ?? null,
  asksValue: Boolean(reading),
});

const GENERIC: ChecklistStep[] = [
  step('Put the tool in a safe state and follow its lock-out procedure'),
  step('Inspect and clean the chamber or bath; note any residue'),
  step('Check seals and O-rings; replace worn ones'),
  step('Check the exhaust flow', { unit: 'm/s', min: 0.4, max: 0.6 }),
  step('Run the tool self-test and a dummy run'),
];
const COATER: ChecklistStep[] = [
  step('Put the track in a safe state and follow its lock-out procedure'),
  step('Clean the spin bowls and drain lines'),
  step('Spin motor current at 3000 rpm', { unit: 'A', min: 1.8, max: 2.4 }),
  step('Check the dispense nozzle and suck-back'),
  step('Hot plate surface temperature, soft bake plate', { unit: '°C', min: 89, max: 91 }),
  step('Coat a test wafer for requalification'),
];

interface ToolRow {
  id: number;
  code: string;
  primaryEngineerId: number | null;
}

// The seed runs in the caller's transaction on the caller's Sequelize instance.
let db: Sequelize;
const sql = (t: Transaction, q: string, replacements: unknown[] | Record<string, unknown> = []) =>
  db.query(q, { replacements, transaction: t });

async function insertMany(t: Transaction, table: string, columns: string[], rows: unknown[][]) {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    await sql(
      t,
      `INSERT INTO ${table} (${columns.join(', ')}) VALUES ${chunk.map(() => `(${columns.map(() => '?').join(', ')})`).join(', ')}`,
      chunk.flat(),
    );
  }
}

const json = (v: unknown) => JSON.stringify(v);

export async function seedMaintenance(sequelize: Sequelize, t: Transaction, now = new Date()) {
  db = sequelize;
  const rnd = createRandom(4711);
  const tools = await db.query<ToolRow>(
    `SELECT id, code, primary_engineer_id AS primaryEngineerId FROM tools WHERE retired_at IS NULL ORDER BY id`,
    { type: QueryTypes.SELECT, transaction: t },
  );
  const nowMs = now.getTime();
  const woRows: unknown[][] = [];
  const windows: unknown[][] = [];
  let planId = 0;
  const [{ next }] = await db.query<{ next: number }>(`SELECT COALESCE(MAX(id), 0) + 1 AS next FROM maintenance_plans`, {
    type: QueryTypes.SELECT,
    transaction: t,
  });
  planId = Number(next) - 1;
  const planRows: unknown[][] = [];
  const readings: unknown[][] = [];
  // Counter readings live with the equipment ingest (counter_readings), seeded before this.
  const ingestWafers = new Map(
    (
      await db.query<{ toolId: number; value: number }>(
        `SELECT r.tool_id AS toolId, r.value FROM counter_readings r
           JOIN (SELECT tool_id, MAX(at) AS at FROM counter_readings WHERE counter = 'wafers' GROUP BY tool_id) m
             ON m.tool_id = r.tool_id AND m.at = r.at AND r.counter = 'wafers'`,
        { type: QueryTypes.SELECT, transaction: t },
      )
    ).map((r) => [Number(r.toolId), Number(r.value)]),
  );

  for (const tool of tools) {
    const coater = tool.code.startsWith('TRACK');
    const everyDays = rnd.pick([30, 45, 60, 90]);
    const checklist = coater ? COATER : GENERIC;
    const minutes = coater ? 180 : rnd.pick([60, 90, 120, 240]);
    // A year of history: each interval from the previous completion; a few late, a few skipped.
    let basis = nowMs - 365 * DAY - rnd.int(0, everyDays) * DAY;
    const id = ++planId;
    let lastDone: number | null = null;
    for (;;) {
      const due = basis + everyDays * DAY;
      if (due > nowMs - 3 * DAY) break;
      const grace = basis + everyDays * 1.25 * DAY;
      const key = `${new Date(due).toISOString()}|-`;
      const roll = rnd.next();
      const checklistResults = checklist.map((s, i) => ({
        step: i,
        done: true,
        value: s.asksValue ? Number(((s.min! + s.max!) / 2 + (rnd.next() - 0.5) * (s.max! - s.min!) * 0.6).toFixed(2)) : null,
        outOfLimit: false,
        by: tool.primaryEngineerId,
        at: new Date(due).toISOString(),
      }));
      if (roll < 0.05) {
        // Skipped: the plan moves on from the skipped due point.
        woRows.push([
          tool.id,
          id,
          'preventive',
          'Scheduled PM',
          'skipped',
          key,
          new Date(due),
          new Date(grace),
          json(checklist),
          json([]),
          minutes,
          null,
          'Tool booked for a funded project run; deferred to the next interval',
          null,
          null,
          null,
          0,
          tool.primaryEngineerId,
          new Date(due - 7 * DAY),
        ]);
        basis = due;
        continue;
      }
      const lateDays = roll < 0.12 ? everyDays * 0.25 + rnd.int(2, 10) : rnd.int(-4, 6);
      const started = due + lateDays * DAY + 8 * 3600_000;
      const done = started + minutes * 60_000 * (0.7 + rnd.next() * 0.8);
      if (done > nowMs) break;
      woRows.push([
        tool.id,
        id,
        'preventive',
        'Scheduled PM',
        'done',
        key,
        new Date(due),
        new Date(grace),
        json(checklist),
        json(checklistResults),
        minutes,
        Math.round(minutes * (0.6 + rnd.next() * 0.6)),
        null,
        new Date(started),
        new Date(done),
        tool.primaryEngineerId,
        done <= grace ? 1 : 0,
        tool.primaryEngineerId,
        new Date(due - 7 * DAY),
      ]);
      basis = done;
      lastDone = done;
    }
    planRows.push([
      id,
      tool.id,
      coater ? 'Track clean and spin check' : 'Scheduled PM',
      json(checklist),
      minutes,
      everyDays,
      null,
      null,
      7,
      0,
      new Date(basis),
      null,
      lastDone ? new Date(lastDone) : null,
      now,
      now,
    ]);

    // Tools that count wafers get a usage plan too (every 5,000 wafers).
    if (/^(TRACK|ICP|DRIE|SPUT|EVAP|PECVD)/.test(tool.code)) {
      const perDay = rnd.int(15, 40);
      let counter = rnd.int(10_000, 60_000);
      // A tool that already sends its wafer counter (the ingest demo) keeps that one series.
      const sent = ingestWafers.get(tool.id);
      for (let d = 365; d >= 0; d -= 7) {
        counter += perDay * 7 + rnd.int(-20, 20);
        const at = new Date(nowMs - d * DAY);
        if (sent === undefined) readings.push([tool.id, `seed-${readings.length + 1}`, 'wafers', counter, at, at]);
      }
      if (sent !== undefined) counter = sent;
      const usageId = ++planId;
      const lastAt = counter - rnd.int(500, 4800);
      planRows.push([
        usageId,
        tool.id,
        'Wafer-count PM: handler and chuck',
        json(GENERIC),
        120,
        null,
        5000,
        'wafers',
        0,
        500,
        new Date(nowMs - 60 * DAY),
        lastAt,
        new Date(nowMs - 60 * DAY),
        now,
        now,
      ]);
    }
  }

  await insertMany(
    t,
    'maintenance_plans',
    [
      'id',
      'tool_id',
      'title',
      'checklist',
      'estimated_minutes',
      'every_days',
      'every_units',
      'counter_name',
      'lead_days',
      'lead_units',
      'basis_at',
      'basis_counter',
      'last_done_at',
      'created_at',
      'updated_at',
    ],
    planRows,
  );
  await insertMany(
    t,
    'work_orders',
    [
      'tool_id',
      'plan_id',
      'kind',
      'title',
      'status',
      'due_key',
      'due_at',
      'grace_until',
      'checklist',
      'results',
      'estimated_minutes',
      'hands_on_minutes',
      'skip_reason',
      'started_at',
      'done_at',
      'done_by_id',
      'within_grace',
      'created_by_id',
      'created_at',
    ].concat(['updated_at']),
    woRows.map((r) => [...r, r[r.length - 1]]),
  );
  await insertMany(t, 'counter_readings', ['tool_id', 'sender_id', 'counter', 'value', 'at', 'received_at'], readings);

  // Three work orders ahead with booked windows, so the board announces them.
  for (const code of ['ALIGN-2', 'RIE-1', 'WB-BASE']) {
    const tool = tools.find((x: ToolRow) => x.code === code);
    if (!tool) continue;
    const [plan] = await db.query<{ id: number; basisAt: Date; everyDays: number }>(
      `SELECT id, basis_at AS basisAt, every_days AS everyDays FROM maintenance_plans WHERE tool_id = ? AND every_days IS NOT NULL`,
      { type: QueryTypes.SELECT, replacements: [tool.id], transaction: t },
    );
    const start = new Date(nowMs + rnd.int(1, 5) * DAY);
    start.setUTCHours(7, 0, 0, 0);
    const end = new Date(start.getTime() + 4 * 3600_000);
    const due = new Date(new Date(plan.basisAt).getTime() + plan.everyDays * DAY);
    await sql(t, `UPDATE maintenance_plans SET basis_at = ? WHERE id = ?`, [new Date(start.getTime() - plan.everyDays * DAY), plan.id]);
    const key = `${new Date(start.getTime()).toISOString()}|-`;
    const [woId] = (await sql(
      t,
      `INSERT INTO work_orders (tool_id, plan_id, kind, title, status, due_key, due_at, grace_until, checklist, results, estimated_minutes, created_at, updated_at) VALUES (?, ?, 'preventive', 'Scheduled PM', 'scheduled', ?, ?, ?, ?, '[]', 240, ?, ?)`,
      [tool.id, plan.id, key, start, new Date(start.getTime() + plan.everyDays * 0.25 * DAY), json(GENERIC), now, now],
    )) as unknown as [number];
    void due;
    windows.push([woId, tool.id, `wo-${woId}-${crypto.randomBytes(6).toString('hex')}@faultline`, start, end, now, now]);
  }
  await insertMany(
    t,
    'maintenance_windows',
    ['work_order_id', 'tool_id', 'uid', 'starts_at', 'ends_at', 'created_at', 'updated_at'],
    windows,
  );

  await seedRequalification(t, tools, rnd, nowMs);
  await seedParts(t, tools);
}

interface TemplateSeed {
  code: string;
  name: string;
  quantity: string;
  unit: string;
  points: number;
  target: number;
  lsl: number;
  usl: number;
  limits: FigureLimit[];
  spread: number;
}

const TEMPLATES: TemplateSeed[] = [
  // ±100 Å = ±10 nm: half of a 20 nm range (common practice for spun resist).
  {
    code: 'TRACK-A',
    name: 'Resist thickness, 9-point test wafer',
    quantity: 'Film thickness',
    unit: 'nm',
    points: 9,
    target: 1000,
    lsl: 970,
    usl: 1030,
    limits: [
      { figure: 'range', min: null, max: 20 },
      { figure: 'mean', min: 980, max: 1020 },
    ],
    spread: 4.5,
  },
  {
    code: 'TRACK-B',
    name: 'Resist thickness, 9-point test wafer',
    quantity: 'Film thickness',
    unit: 'nm',
    points: 9,
    target: 1000,
    lsl: 970,
    usl: 1030,
    limits: [
      { figure: 'range', min: null, max: 20 },
      { figure: 'mean', min: 980, max: 1020 },
    ],
    spread: 4.5,
  },
  {
    code: 'TRACK-A',
    name: 'Soft-bake plate temperature, 5 points',
    quantity: 'Plate surface temperature',
    unit: '°C',
    points: 5,
    target: 90,
    lsl: 88,
    usl: 92,
    limits: [
      { figure: 'mean', min: 89, max: 91 },
      { figure: 'range', min: null, max: 1.5 },
    ],
    spread: 0.3,
  },
  {
    code: 'TRACK-A',
    name: 'Vapour-prime plate temperature, 5 points',
    quantity: 'Plate surface temperature',
    unit: '°C',
    points: 5,
    target: 125,
    lsl: 122,
    usl: 128,
    limits: [
      { figure: 'mean', min: 123.5, max: 126.5 },
      { figure: 'range', min: null, max: 2 },
    ],
    spread: 0.4,
  },
  {
    code: 'TRACK-B',
    name: 'Soft-bake plate temperature, 5 points',
    quantity: 'Plate surface temperature',
    unit: '°C',
    points: 5,
    target: 90,
    lsl: 88,
    usl: 92,
    limits: [
      { figure: 'mean', min: 89, max: 91 },
      { figure: 'range', min: null, max: 1.5 },
    ],
    spread: 0.3,
  },
];

async function seedRequalification(t: Transaction, tools: ToolRow[], rnd: ReturnType<typeof createRandom>, nowMs: number) {
  for (const tpl of TEMPLATES) {
    const tool = tools.find((x) => x.code === tpl.code);
    if (!tool) continue;
    const [templateId] = (await sql(
      t,
      `INSERT INTO requal_templates (tool_id, name, quantity, unit, points, target, lsl, usl, limits, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      [
        tool.id,
        tpl.name,
        tpl.quantity,
        tpl.unit,
        tpl.points,
        tpl.target,
        tpl.lsl,
        tpl.usl,
        json(tpl.limits),
        new Date(nowMs - 370 * DAY),
        new Date(nowMs - 370 * DAY),
      ],
    )) as unknown as [number];
    const rows: unknown[][] = [];
    for (let k = 0; k < 10; k++) {
      const at = new Date(nowMs - (360 - k * 36) * DAY);
      const offset = (rnd.next() - 0.5) * tpl.spread * 2 + (k === 6 ? tpl.spread * 5 : 0);
      const values = Array.from({ length: tpl.points }, () =>
        Number((tpl.target + offset + (rnd.next() - 0.5) * tpl.spread * 2.5).toFixed(tpl.unit === 'nm' ? 0 : 2)),
      );
      const s = uniformity(values);
      const cap = capability({ mean: s.mean, stdDev: s.stdDev, lsl: tpl.lsl, usl: tpl.usl });
      const verdicts = judgeLimits(s, tpl.limits);
      rows.push([
        templateId,
        tool.id,
        json(values),
        json({ ...s, ...cap }),
        json(verdicts),
        verdicts.every((v) => v.pass) ? 1 : 0,
        tool.primaryEngineerId,
        at,
      ]);
    }
    await insertMany(
      t,
      'requal_records',
      ['template_id', 'tool_id', 'measurements', 'summary', 'verdicts', 'passed', 'recorded_by_id', 'recorded_at'],
      rows,
    );
  }
}

const PARTS: [name: string, number: string, prefix: RegExp, stock: number, reorder: number][] = [
  ['Spin bowl seal kit', 'SP-BWL-110', /^TRACK/, 6, 2],
  ['Dispense nozzle, 0.5 mm', 'SP-NZL-050', /^TRACK/, 3, 2],
  ['Viton O-ring, chamber lid', 'OR-VT-2250', /^(ICP|DRIE|RIE|PECVD|ALD|SPUT)/, 24, 10],
  ['Quartz focus ring', 'QZ-FR-150', /^(ICP|DRIE)/, 2, 1],
  ['Turbo pump controller fuse', 'EL-FU-T10', /^(ICP|DRIE|SPUT|EVAP|RIE|IBE)/, 12, 4],
  ['E-beam filament', 'EB-FIL-06', /^EVAP-1/, 4, 2],
  ['Crucible liner, graphite', 'EB-CRL-7CC', /^EVAP-1/, 10, 4],
  ['Thermocouple, type K, 600 mm', 'TC-K-600', /^(FURN|LPCVD|RTA|ANL)/, 5, 2],
  ['Bath heater element', 'WB-HTR-1K', /^WB-/, 2, 1],
  ['PFA drain valve', 'WB-VLV-PFA', /^WB-/, 3, 1],
  ['Mercury lamp, 350 W', 'LMP-HG-350', /^ALIGN/, 2, 1],
  ['SEM filament cartridge', 'SEM-CART-01', /^SEM/, 1, 1],
];

async function seedParts(t: Transaction, tools: ToolRow[]) {
  const now = new Date();
  for (const [name, number, prefix, stock, reorder] of PARTS) {
    const [id] = (await sql(
      t,
      `INSERT INTO parts (name, part_number, stock, reorder_level, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)`,
      [name, number, stock, reorder, now, now],
    )) as unknown as [number];
    const toolIds = tools.filter((x) => prefix.test(x.code)).map((x) => x.id);
    if (toolIds.length)
      await insertMany(
        t,
        'part_tools',
        ['part_id', 'tool_id'],
        toolIds.map((tid) => [id, tid]),
      );
  }
}
