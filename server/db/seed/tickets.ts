import { Op, QueryTypes, type InferCreationAttributes, type Transaction } from 'sequelize';
import { Tool, ToolModule, StateInterval } from '../../modules/facility/facility.model';
import { Ticket, TicketEvent, UNWORKED_TICKET_FIELDS } from '../../modules/tickets/ticket.model';
import { User } from '../../modules/users/user.model';
import { createRandom, type Random } from './random';
import { computePriority, type Priority } from '../../../shared/priority';
import type { TicketCategory, Impact, WaitReason } from '../../../shared/report-options';
import type { TicketStatus } from '../../../shared/ticket-workflow';
import type { StateReason } from '../../../shared/equipment-state';

/**
 * Demo tickets that agree with the demo state history: one ticket per tool-level stretch of
 * unscheduled downtime (reported when it began, fixed when it ended), some assists that
 * cost no downtime, and open tickets for what is Down or Limited right now. Everything here
 * is invented for the demo. Reads the history from the database, writes in bulk.
 */

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

// Plain-words failure modes per kind of tool, invented for the demo.
const FAILURE_MODES: { match: RegExp; modes: string[] }[] = [
  {
    match: /etch|rie|icp|asher|plasma/i,
    modes: [
      'RF generator fault',
      'Matching network drift',
      'Chamber pressure control',
      'Helium backside cooling leak',
      'Chiller flow alarm',
      'Endpoint detector failure',
      'Wafer clamp error',
    ],
  },
  {
    match: /coat|develop|track|spin/i,
    modes: [
      'Spin motor fault',
      'Dispense pump blocked',
      'Chuck vacuum loss',
      'Hot plate temperature drift',
      'Robot arm misplacement',
      'Exhaust flow low',
    ],
  },
  {
    match: /furnace|tube|lpcvd|oxid|anneal|diffusion/i,
    modes: [
      'Heater zone failure',
      'Thermocouple drift',
      'Gas flow controller fault',
      'Boat elevator jam',
      'Door seal leak',
      'Vacuum pump failure',
    ],
  },
  {
    match: /evapor|sputter|pvd/i,
    modes: ['Source or target failure', 'Crystal monitor failure', 'Shutter stuck', 'Cryopump needs regeneration', 'Power supply arcing'],
  },
  {
    match: /pecvd|ald|deposit|cvd/i,
    modes: [
      'Precursor line clogged',
      'Showerhead heater fault',
      'RF generator fault',
      'Gas flow controller fault',
      'Chamber pressure control',
    ],
  },
  {
    match: /align|litho|stepper|writer|expos|laser/i,
    modes: ['Lamp failure', 'Stage calibration lost', 'Mask holder vacuum', 'Alignment camera fault', 'Control software crash'],
  },
  {
    match: /wet|bench|bath|rinse|dryer|clean/i,
    modes: ['Bath heater fault', 'Level sensor failure', 'Exhaust interlock', 'Drain valve stuck', 'Rinse water resistivity low'],
  },
  {
    match: /ellips|profil|sem|microscop|metrolog|measure|reflect|probe/i,
    modes: ['Light source failure', 'Stage motor fault', 'Calibration out of range', 'Control software crash'],
  },
];
const GENERIC_MODES = ['Controller fault', 'Vacuum leak', 'Interlock trip', 'Power supply failure', 'Mechanical jam'];

const ASSIST_STORIES: { text: string; category: TicketCategory; work: string }[] = [
  { text: 'Wafer stuck in the load lock', category: 'wafer_handling', work: 'Freed the wafer and cycled the load lock' },
  { text: 'Recipe will not start, screen frozen', category: 'software_controller', work: 'Restarted the control software' },
  { text: 'Waste container full warning', category: 'chemical_supply_waste', work: 'Emptied the waste container' },
  { text: 'Door interlock will not release after the run', category: 'alarm_interlock', work: 'Reset the interlock' },
  { text: 'Wafer not centred on the chuck', category: 'wafer_handling', work: 'Re-seated the wafer and checked the centring pins' },
];

export function failureModesFor(toolName: string): string[] {
  return FAILURE_MODES.find((f) => f.match.test(toolName))?.modes ?? GENERIC_MODES;
}

function categoryFor(mode: string): TicketCategory {
  if (/vacuum|leak|pump|seal/i.test(mode)) return 'vacuum';
  if (/heater|thermo|chiller|temperature|hot plate/i.test(mode)) return 'temperature';
  if (/software|controller|calibration/i.test(mode)) return 'software_controller';
  if (/robot|clamp|boat|chuck|stage|wafer/i.test(mode)) return 'wafer_handling';
  if (/gas|water|exhaust|flow/i.test(mode)) return 'utilities';
  if (/interlock|generator|supply|arcing|lamp|source/i.test(mode)) return 'alarm_interlock';
  return 'mechanical_damage';
}

const WAIT_REASON_OF: Partial<Record<StateReason, WaitReason>> = {
  waiting_parts: 'parts',
  maintenance_delay_supplier: 'vendor',
  maintenance_delay_user: 'user',
  facilities_related: 'facilities',
};

const WAIT_OF = (reason: string): WaitReason | undefined => WAIT_REASON_OF[reason as StateReason];

/**
 * The problem a Down's board note names, which its open ticket is about:
 * "Reported by a user: lamp will not ignite" → "lamp will not ignite";
 * "Crucible indexer motor failed; replacement on order" → "Crucible indexer motor failed".
 */
export function problemOf(note: string | null): string | null {
  const problem = note
    ?.replace(/^Reported by a user:\s*/i, '')
    .split(';')[0]
    .trim();
  return problem || null;
}

// "Pressure low" → "pressure low", but "RF fault" and "KOH bath" keep their capitals.
const lowerFirst = (s: string) => (/^[A-Z][a-z]/.test(s) ? s.charAt(0).toLowerCase() + s.slice(1) : s);
const upperFirst = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

interface Stretch {
  intervals: StateInterval[];
  start: Date;
  end: Date | null;
}

/** Consecutive unscheduled-downtime intervals of one tool: one failure, whatever its sub-states. */
function downtimeStretches(intervals: StateInterval[]): Stretch[] {
  const stretches: Stretch[] = [];
  let current: Stretch | null = null;
  for (const iv of intervals) {
    if (iv.state !== 'unscheduled_downtime') {
      current = null;
      continue;
    }
    if (current && current.end && current.end.getTime() === iv.startedAt.getTime()) {
      current.intervals.push(iv);
      current.end = iv.endedAt;
    } else {
      current = { intervals: [iv], start: iv.startedAt, end: iv.endedAt };
      stretches.push(current);
    }
  }
  return stretches;
}

type TicketRow = Omit<InferCreationAttributes<Ticket>, 'status'> & { id: number; status: TicketStatus; createdAt: Date; updatedAt: Date };
type EventRow = {
  ticketId: number;
  actorId: number | null;
  kind: string;
  internal: boolean;
  body: string | null;
  data: Record<string, unknown> | null;
  createdAt: Date;
};

export interface SeedPeople {
  staff: User[];
  members: User[];
}

const clampTo = (d: Date, max: Date) => (d > max ? max : d);

export async function seedTickets(
  transaction: Transaction,
  people: SeedPeople,
  now: Date,
  opts: { toolIds?: number[]; seed?: number } = {},
) {
  const rng: Random = createRandom(opts.seed ?? 0x71c4e7);
  const toolWhere = { retiredAt: null, ...(opts.toolIds ? { id: opts.toolIds } : {}) };
  const tools = await Tool.findAll({ where: toolWhere, order: [['id', 'ASC']], transaction });
  if (tools.length === 0 || people.members.length === 0 || people.staff.length === 0) return { tickets: 0, events: 0 };
  const modules = await ToolModule.findAll({ where: { toolId: tools.map((t) => t.id) }, transaction });
  const intervals = await StateInterval.findAll({
    where: { toolId: tools.map((t) => t.id), ticketId: null },
    order: [
      ['toolId', 'ASC'],
      ['startedAt', 'ASC'],
      ['id', 'ASC'],
    ],
    transaction,
  });
  const staffById = new Map(people.staff.map((u) => [u.id, u]));

  const [{ maxId }] = await Ticket.sequelize!.query<{ maxId: number | null }>('SELECT MAX(id) AS maxId FROM tickets', {
    type: QueryTypes.SELECT,
    transaction,
  });
  let nextId = Number(maxId ?? 0) + 1;
  const tickets: TicketRow[] = [];
  const events: EventRow[] = [];
  const links = new Map<number, number>(); // interval id -> ticket id

  const ev = (
    ticketId: number,
    actorId: number | null,
    kind: string,
    at: Date,
    data: Record<string, unknown> | null = null,
    body: string | null = null,
  ) => events.push({ ticketId, actorId, kind, internal: false, body, data, createdAt: at });

  const base = (
    tool: Tool,
    at: Date,
    fields: {
      category: TicketCategory;
      title: string;
      description: string;
      impact: Impact;
      wafers: number;
      moduleId?: number | null;
      alarm?: string | null;
    },
  ) => {
    const reporter = rng.pick(people.members);
    const engineer = (tool.primaryEngineerId && staffById.get(tool.primaryEngineerId)) || rng.pick(people.staff);
    const priority: Priority = computePriority({
      impact: fields.impact,
      hazards: [],
      wafersAtRisk: fields.wafers,
      criticality: tool.criticality,
    }).priority;
    const id = nextId++;
    const row: TicketRow = {
      id,
      toolId: tool.id,
      moduleId: fields.moduleId ?? null,
      category: fields.category,
      title: fields.title,
      description: fields.description,
      alarmText: fields.alarm ?? null,
      impact: fields.impact,
      hazards: [],
      wafersCount: fields.wafers,
      wafersOwner: fields.wafers ? `${reporter.name.split(' ')[1] ?? reporter.name} group (invented)` : null,
      wafersRecoverable: fields.wafers ? rng.pick(['yes', 'unknown', 'no'] as const) : null,
      status: 'reported',
      priority,
      priorityOverridden: false,
      reporterId: reporter.id,
      assigneeId: engineer.id,
      ...UNWORKED_TICKET_FIELDS,
      version: 0,
      createdAt: at,
      updatedAt: at,
    };
    tickets.push(row);
    ev(
      id,
      reporter.id,
      'reported',
      at,
      {
        impact: fields.impact,
        hazards: [],
        alarmText: fields.alarm ?? null,
        wafersCount: fields.wafers,
        category: fields.category,
        priority,
        photos: 0,
      },
      fields.description,
    );
    ev(id, null, 'assignment', at, { from: null, to: { id: engineer.id, name: engineer.name }, automatic: true });
    return { row, reporter, engineer };
  };

  const setStatus = (
    row: TicketRow,
    actorId: number,
    to: TicketStatus,
    at: Date,
    data: Record<string, unknown> = {},
    body: string | null = null,
  ) => {
    ev(row.id, actorId, 'status', at, { action: data.action ?? to, from: row.status, to, ...data }, body);
    row.status = to;
    row.updatedAt = at;
  };

  for (const tool of tools) {
    const own = intervals.filter((iv) => iv.toolId === tool.id && iv.moduleId === null);
    const modes = failureModesFor(tool.name);

    // ---- One failure ticket per stretch of unscheduled downtime ------------------------
    for (const stretch of downtimeStretches(own)) {
      const mode = rng.pick(modes);
      const wafers = rng.chance(0.3) ? rng.int(1, 4) : 0;
      let alarm = rng.chance(0.6) ? `ALM ${rng.int(100, 9999)} ${mode.toUpperCase()}` : null;
      // A Down now is told by its board note, so the board and its open ticket tell one story.
      const problem = stretch.end === null ? problemOf(stretch.intervals[0].note) : null;
      if (problem) alarm = null;
      const what = problem ?? mode;
      const { row, engineer } = base(tool, stretch.start, {
        category: categoryFor(what),
        title: `${tool.name} stopped: ${lowerFirst(what)}`,
        description: `${tool.name} stopped during a run${problem ? `: ${lowerFirst(problem)}` : ''}. ${alarm ? 'The alarm text is shown on the screen.' : 'No alarm text on the screen.'} (Demo data, invented.)`,
        impact: 'tool_stopped',
        wafers,
        alarm,
      });
      for (const iv of stretch.intervals) links.set(iv.id, row.id);
      ev(row.id, stretch.intervals[0].setById, 'tool_state', stretch.start, {
        moduleId: null,
        from: { state: 'standby', reason: 'none' },
        to: { state: 'unscheduled_downtime', reason: stretch.intervals[0].reason },
        source: stretch.intervals[0].source,
        confirmed: true,
      });

      const horizon = stretch.end ?? now;
      const ack = clampTo(new Date(stretch.start.getTime() + rng.int(3, 55) * MINUTE), horizon);
      const openNow = stretch.end === null;
      const lastReason = stretch.intervals[stretch.intervals.length - 1].reason;
      if (openNow && stretch.intervals[0].source === 'user_report' && !stretch.intervals[0].confirmed) continue; // nobody has looked yet
      setStatus(row, engineer.id, 'acknowledged', ack, { action: 'acknowledge' });
      row.acknowledgedAt = ack;
      if (openNow && now.getTime() - stretch.start.getTime() < 30 * MINUTE) continue;
      const repairAt = clampTo(new Date(ack.getTime() + rng.int(2, 30) * MINUTE), horizon);
      setStatus(row, engineer.id, 'in_repair', repairAt, { action: 'start_repair' });

      for (const iv of stretch.intervals.slice(1)) {
        const wait = WAIT_OF(iv.reason);
        if (wait) {
          // The wait says what the board says: its note and its expected return.
          setStatus(
            row,
            engineer.id,
            'waiting',
            iv.startedAt,
            { action: 'wait', waitReason: wait, expectedReturnAt: iv.expectedReturnAt?.toISOString() ?? null },
            iv.note,
          );
          row.waitReason = wait;
        } else if (row.status === 'waiting') {
          setStatus(row, engineer.id, 'in_repair', iv.startedAt, { action: 'resume' });
          row.waitReason = null;
        }
      }
      if (openNow) {
        const last = stretch.intervals[stretch.intervals.length - 1];
        if (WAIT_OF(lastReason) && row.status !== 'waiting') {
          setStatus(
            row,
            engineer.id,
            'waiting',
            new Date(Math.max(last.startedAt.getTime(), repairAt.getTime())),
            { action: 'wait', waitReason: WAIT_OF(lastReason), expectedReturnAt: last.expectedReturnAt?.toISOString() ?? null },
            last.note,
          );
          row.waitReason = WAIT_OF(lastReason)!;
        }
        continue;
      }

      const end = stretch.end!;
      const duration = (end.getTime() - stretch.start.getTime()) / MINUTE;
      Object.assign(row, {
        fixKind: 'failure',
        failureMode: mode,
        cause: rng.pick([
          'Worn part',
          'Part at end of life',
          'Loose connection',
          'Contamination build-up',
          'Unknown; replaced on suspicion',
        ]),
        workDone: `Repaired: ${mode.toLowerCase()}. Checked with a test run. (Demo data.)`,
        partsUsed: rng.chance(0.5) ? rng.pick(['O-ring set', 'Fuse', 'Sensor', 'Pump service kit', 'Cable', 'Valve']) : null,
        handsOnMinutes: Math.max(10, Math.round(Math.min(duration, rng.int(20, 240)))),
        wafersRecovered: wafers ? rng.int(0, wafers) : null,
        wafersReturned: wafers ? rng.int(0, wafers) : null,
        fixedAt: end,
        resolvedAt: end,
        waitReason: null,
      });
      if (row.status === 'waiting') setStatus(row, engineer.id, 'in_repair', end, { action: 'resume' });
      setStatus(
        row,
        engineer.id,
        'fixed',
        end,
        { action: 'fix', fixKind: 'failure', failureMode: mode, returnToService: true },
        row.workDone as string,
      );
      ev(row.id, engineer.id, 'tool_state', end, {
        moduleId: null,
        from: { state: 'unscheduled_downtime', reason: lastReason },
        to: { state: 'standby', reason: 'none' },
        source: 'staff',
        confirmed: true,
      });
      const closedAt = new Date(end.getTime() + rng.int(1, 30) * HOUR);
      if (closedAt < now) {
        setStatus(row, engineer.id, 'closed', closedAt, { action: 'close' });
        row.closedAt = closedAt;
      }
    }

    // ---- Assists: short interruptions cleared without repair, no downtime ---------------
    const running = own.filter(
      (iv) => (iv.state === 'productive' || iv.state === 'standby') && (iv.endedAt ?? now).getTime() - iv.startedAt.getTime() > 2 * HOUR,
    );
    for (const iv of running) {
      const endMs = (iv.endedAt ?? now).getTime() - HOUR;
      let t = iv.startedAt.getTime() + rng.exp(40 * DAY);
      while (t < endMs) {
        const story = rng.pick(ASSIST_STORIES);
        const at = new Date(t);
        const { row, engineer } = base(tool, at, {
          category: story.category,
          title: story.text,
          description: `${story.text}. (Demo data, invented.)`,
          impact: 'tool_limited',
          wafers: story.category === 'wafer_handling' ? 1 : 0,
        });
        const ack = new Date(t + rng.int(2, 20) * MINUTE);
        const fixed = new Date(ack.getTime() + rng.int(5, 30) * MINUTE);
        if (fixed < now) {
          setStatus(row, engineer.id, 'acknowledged', ack, { action: 'acknowledge' });
          Object.assign(row, {
            acknowledgedAt: ack,
            fixKind: 'assist',
            failureMode: null,
            workDone: story.work,
            handsOnMinutes: Math.round((fixed.getTime() - ack.getTime()) / MINUTE),
            fixedAt: fixed,
            resolvedAt: fixed,
          });
          if (row.wafersCount) Object.assign(row, { wafersRecovered: 1, wafersReturned: 1 });
          setStatus(row, engineer.id, 'fixed', fixed, { action: 'fix', fixKind: 'assist' }, story.work);
          const closed = new Date(fixed.getTime() + rng.int(1, 6) * HOUR);
          if (closed < now) {
            setStatus(row, engineer.id, 'closed', closed, { action: 'close' });
            row.closedAt = closed;
          }
        }
        t += 3 * HOUR + rng.exp(40 * DAY);
      }
    }

    // ---- What is Limited right now: a module down, or a restriction in force -------------
    for (const mod of modules.filter((m) => m.toolId === tool.id)) {
      const stretch = downtimeStretches(intervals.filter((iv) => iv.toolId === tool.id && iv.moduleId === mod.id)).find(
        (x) => x.end === null,
      );
      if (!stretch) continue;
      const what = problemOf(stretch.intervals[0].note) ?? rng.pick(modes);
      const { row, engineer } = base(tool, stretch.start, {
        category: categoryFor(what),
        title: `${mod.name} down: ${lowerFirst(what)}`,
        description: `${mod.name} stopped: ${lowerFirst(what)}. The rest of the tool still runs. (Demo data, invented.)`,
        impact: 'tool_limited',
        wafers: 0,
        moduleId: mod.id,
      });
      for (const iv of stretch.intervals) links.set(iv.id, row.id);
      const ack = clampTo(new Date(stretch.start.getTime() + rng.int(5, 45) * MINUTE), now);
      setStatus(row, engineer.id, 'acknowledged', ack, { action: 'acknowledge' });
      row.acknowledgedAt = ack;
      const last = stretch.intervals[stretch.intervals.length - 1];
      const wait = WAIT_OF(last.reason);
      if (wait) {
        const repairAt = clampTo(new Date(ack.getTime() + rng.int(2, 30) * MINUTE), now);
        setStatus(row, engineer.id, 'in_repair', repairAt, { action: 'start_repair' });
        setStatus(
          row,
          engineer.id,
          'waiting',
          new Date(Math.max(last.startedAt.getTime(), repairAt.getTime())),
          { action: 'wait', waitReason: wait, expectedReturnAt: last.expectedReturnAt?.toISOString() ?? null },
          last.note,
        );
        row.waitReason = wait;
      }
    }
    const restricted = own.find((iv) => iv.endedAt === null && (iv as StateInterval & { restriction?: string | null }).restriction);
    if (restricted) {
      const restriction = (restricted as StateInterval & { restriction?: string | null }).restriction!;
      const why = restricted.note ? `${upperFirst(restricted.note)}: ` : '';
      const { row } = base(tool, restricted.startedAt, {
        category: 'process_out_of_spec',
        title: `${why}runs with a restriction, ${lowerFirst(restriction)}`.slice(0, 120),
        description: `${why}${restriction}. (Demo data, invented.)`,
        impact: 'tool_limited',
        wafers: 0,
      });
      links.set(restricted.id, row.id);
    }
  }

  // ---- A few fresh reports nobody has picked up yet, for the queue -----------------------
  const runningNow = tools.filter((tool) =>
    intervals.some(
      (iv) => iv.toolId === tool.id && iv.moduleId === null && iv.endedAt === null && (iv.state === 'standby' || iv.state === 'productive'),
    ),
  );
  const fresh = [
    { text: 'Chamber light flickers during the run', category: 'other' as const },
    { text: 'Process log shows a pressure spike at step 3', category: 'process_out_of_spec' as const },
    { text: 'Foot pedal sticks now and then', category: 'mechanical_damage' as const },
  ];
  for (const [i, story] of fresh.entries()) {
    if (runningNow.length === 0) break;
    const tool = runningNow[(i * 7) % runningNow.length];
    base(tool, new Date(now.getTime() - rng.int(20, 300) * MINUTE), {
      category: story.category,
      title: story.text,
      description: `${story.text}. (Demo data, invented.)`,
      impact: 'still_usable',
      wafers: 0,
    });
  }

  // Number the tickets in the order they were reported, as a live system would have.
  tickets.sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id - b.id);
  const firstId = tickets.length ? Math.min(...tickets.map((t) => t.id)) : 0;
  const renumber = new Map(tickets.map((t, i) => [t.id, firstId + i]));
  for (const t of tickets) t.id = renumber.get(t.id)!;
  for (const e of events) e.ticketId = renumber.get(e.ticketId)!;
  for (const [iv, ticketId] of links) links.set(iv, renumber.get(ticketId)!);

  for (let i = 0; i < tickets.length; i += 500) {
    await Ticket.bulkCreate(tickets.slice(i, i + 500), { transaction, hooks: false, validate: false });
  }
  for (let i = 0; i < events.length; i += 2000) {
    await TicketEvent.bulkCreate(events.slice(i, i + 2000), { transaction, hooks: false, validate: false });
  }
  const pairs = [...links.entries()];
  for (let i = 0; i < pairs.length; i += 500) {
    const chunk = pairs.slice(i, i + 500);
    await StateInterval.sequelize!.query(
      `UPDATE state_intervals SET ticket_id = CASE id ${chunk.map(() => 'WHEN ? THEN ?').join(' ')} END WHERE id IN (${chunk.map(() => '?').join(',')})`,
      {
        replacements: [...chunk.flat(), ...chunk.map(([iv]) => iv)],
        transaction,
      },
    );
  }
  return { tickets: tickets.length, events: events.length };
}

/** Staff and members from the database, for callers that did not keep the seeded people. */
export async function seedPeopleFromDb(transaction: Transaction): Promise<SeedPeople> {
  const staff = await User.findAll({ where: { role: { [Op.ne]: 'member' }, active: true }, order: [['id', 'ASC']], transaction });
  const members = await User.findAll({ where: { role: 'member', active: true }, order: [['id', 'ASC']], transaction });
  return { staff: staff.filter((u) => u.role === 'technician').length ? staff.filter((u) => u.role === 'technician') : staff, members };
}
