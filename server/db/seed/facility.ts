import type { Transaction } from 'sequelize';
import { Area, Tool, ToolModule } from '../../modules/facility/facility.model';
import type { User } from '../../modules/users/user.model';
import type { E10State, StateReason } from '../../../shared/equipment-state';
import type { StateSource } from '../../modules/facility/facility.model';
import { createRandom, type Random } from './random';

/**
 * The demo facility and a year of its state history. The facility, its bays, tools, people
 * and history are fictional, invented for the demo; tool names are generic descriptions.
 * Everything is drawn from a fixed seed, so every machine gets the same demo for a given
 * `now`, and written with a few multi-row INSERTs so seeding takes a second or two.
 */
export const DEMO_FACILITY_NAME = 'Quillmoor Microfabrication Centre (fictional)';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const MINUTE = 60_000;

type Family = 'litho' | 'etch' | 'thermal' | 'deposition' | 'wet' | 'metrology';

interface ToolSpec {
  code: string;
  name: string;
  criticality?: 'high' | 'normal' | 'low';
  modules?: [code: string, name: string][];
  /** Mean days between failures at the start of the year. */
  mtbfDays: number;
  /** Days between preventive maintenance. */
  pmDays: number;
  /** Share of weekdays the tool is used. */
  usage: number;
  /** Failure rate climbing over the year (for the "getting worse" view in analytics). */
  worsening?: boolean;
  description: string;
}

interface AreaSpec {
  code: string;
  name: string;
  family: Family;
  description: string;
  tools: ToolSpec[];
}

const AREAS: AreaSpec[] = [
  {
    code: 'LITHO',
    name: 'Lithography bay',
    family: 'litho',
    description: 'Yellow-light bay: resist coating, exposure and development. Part of the fictional demo facility.',
    tools: [
      {
        code: 'TRACK-A',
        name: 'Resist coat track A',
        criticality: 'high',
        modules: [
          ['COAT1', 'Coater bowl 1'],
          ['COAT2', 'Coater bowl 2'],
          ['DEV1', 'Developer bowl'],
          ['HP', 'Hotplate stack'],
        ],
        mtbfDays: 28,
        pmDays: 45,
        usage: 0.9,
        description: 'Automatic coat and develop track for 100 and 150 mm wafers.',
      },
      {
        code: 'TRACK-B',
        name: 'Resist coat track B',
        modules: [
          ['COAT', 'Coater bowl'],
          ['DEV', 'Developer bowl'],
        ],
        mtbfDays: 40,
        pmDays: 60,
        usage: 0.7,
        description: 'Second coat and develop track, thick resists.',
      },
      {
        code: 'ALIGN-1',
        name: 'Mask aligner 1',
        criticality: 'high',
        mtbfDays: 45,
        pmDays: 60,
        usage: 0.9,
        description: 'Contact and proximity exposure, front and back side alignment.',
      },
      {
        code: 'ALIGN-2',
        name: 'Mask aligner 2',
        mtbfDays: 50,
        pmDays: 60,
        usage: 0.6,
        description: 'Contact exposure for pieces and small wafers.',
      },
      {
        code: 'LDW-1',
        name: 'Laser direct writer',
        mtbfDays: 60,
        pmDays: 90,
        usage: 0.7,
        description: 'Maskless exposure down to about one micrometre.',
      },
      {
        code: 'EBL-1',
        name: 'E-beam lithography system',
        criticality: 'high',
        mtbfDays: 35,
        pmDays: 45,
        usage: 0.8,
        description: 'Electron-beam writer for nanoscale patterns.',
      },
      {
        code: 'NIL-1',
        name: 'Nanoimprint press',
        criticality: 'low',
        mtbfDays: 90,
        pmDays: 120,
        usage: 0.3,
        description: 'Thermal and UV nanoimprint.',
      },
    ],
  },
  {
    code: 'ETCH',
    name: 'Dry etch bay',
    family: 'etch',
    description: 'Plasma and ion-beam etching. Part of the fictional demo facility.',
    tools: [
      {
        code: 'ICP-1',
        name: 'ICP etcher 1',
        mtbfDays: 30,
        pmDays: 45,
        usage: 0.85,
        description: 'Inductively coupled plasma etch, fluorine chemistry.',
      },
      {
        code: 'ICP-2',
        name: 'ICP etcher 2',
        criticality: 'high',
        modules: [
          ['PM1', 'Process chamber 1'],
          ['PM2', 'Process chamber 2'],
          ['LL', 'Load lock'],
        ],
        mtbfDays: 30,
        pmDays: 45,
        usage: 0.9,
        worsening: true,
        description: 'Two-chamber cluster, chlorine and fluorine chemistries.',
      },
      {
        code: 'DRIE-1',
        name: 'Deep silicon etcher',
        criticality: 'high',
        mtbfDays: 25,
        pmDays: 40,
        usage: 0.85,
        description: 'Cyclic deep reactive ion etching of silicon.',
      },
      {
        code: 'RIE-1',
        name: 'Reactive ion etcher',
        mtbfDays: 55,
        pmDays: 60,
        usage: 0.6,
        description: 'Parallel-plate RIE for dielectrics and polymers.',
      },
      {
        code: 'ASH-1',
        name: 'Oxygen plasma asher',
        criticality: 'low',
        mtbfDays: 80,
        pmDays: 90,
        usage: 0.8,
        description: 'Barrel asher for resist strip and descum.',
      },
      {
        code: 'XEF-1',
        name: 'XeF2 release etcher',
        criticality: 'low',
        mtbfDays: 70,
        pmDays: 90,
        usage: 0.3,
        description: 'Vapour-phase isotropic silicon release.',
      },
      {
        code: 'IBE-1',
        name: 'Ion beam mill',
        mtbfDays: 45,
        pmDays: 60,
        usage: 0.5,
        description: 'Argon ion milling of metals and hard materials.',
      },
    ],
  },
  {
    code: 'THERMAL',
    name: 'Furnace bay',
    family: 'thermal',
    description: 'Oxidation, diffusion, LPCVD and annealing. Part of the fictional demo facility.',
    tools: [
      {
        code: 'FURN-A',
        name: 'Furnace stack A',
        criticality: 'high',
        modules: [
          ['TUBE1', 'Tube 1 (dry oxide)'],
          ['TUBE2', 'Tube 2 (wet oxide)'],
          ['TUBE3', 'Tube 3 (anneal)'],
          ['TUBE4', 'Tube 4 (diffusion)'],
        ],
        mtbfDays: 45,
        pmDays: 90,
        usage: 0.8,
        description: 'Four-tube horizontal furnace stack.',
      },
      {
        code: 'LPCVD-3',
        name: 'LPCVD tube 3',
        criticality: 'high',
        mtbfDays: 35,
        pmDays: 60,
        usage: 0.8,
        description: 'Low-stress silicon nitride.',
      },
      {
        code: 'LPCVD-4',
        name: 'LPCVD tube 4',
        mtbfDays: 40,
        pmDays: 60,
        usage: 0.7,
        worsening: true,
        description: 'Polysilicon and amorphous silicon.',
      },
      {
        code: 'RTA-1',
        name: 'Rapid thermal annealer',
        mtbfDays: 60,
        pmDays: 90,
        usage: 0.6,
        description: 'Lamp-heated anneal up to 1100 °C.',
      },
      {
        code: 'ANL-1',
        name: 'Forming gas anneal oven',
        criticality: 'low',
        mtbfDays: 120,
        pmDays: 120,
        usage: 0.4,
        description: 'Low-temperature anneal in forming gas.',
      },
    ],
  },
  {
    code: 'DEPO',
    name: 'Thin-film bay',
    family: 'deposition',
    description: 'Evaporation, sputtering, CVD and ALD. Part of the fictional demo facility.',
    tools: [
      {
        code: 'EVAP-1',
        name: 'E-beam evaporator',
        criticality: 'high',
        mtbfDays: 30,
        pmDays: 45,
        usage: 0.85,
        description: 'Six-pocket electron-beam evaporator for metals and oxides.',
      },
      {
        code: 'EVAP-2',
        name: 'Thermal evaporator',
        mtbfDays: 60,
        pmDays: 90,
        usage: 0.5,
        description: 'Resistive evaporation of low-melting metals.',
      },
      {
        code: 'SPUT-1',
        name: 'Sputter cluster',
        criticality: 'high',
        modules: [
          ['PM1', 'Magnetron chamber 1'],
          ['PM2', 'Magnetron chamber 2'],
          ['PM3', 'Reactive chamber'],
          ['LL', 'Load lock'],
        ],
        mtbfDays: 30,
        pmDays: 45,
        usage: 0.85,
        description: 'Three-chamber DC and RF sputtering cluster.',
      },
      {
        code: 'PECVD-1',
        name: 'PECVD system',
        modules: [
          ['PM1', 'Oxide chamber'],
          ['PM2', 'Nitride chamber'],
        ],
        mtbfDays: 40,
        pmDays: 60,
        usage: 0.75,
        description: 'Plasma-enhanced CVD of oxide and nitride.',
      },
      {
        code: 'ALD-1',
        name: 'ALD reactor',
        mtbfDays: 50,
        pmDays: 60,
        usage: 0.6,
        description: 'Thermal and plasma atomic layer deposition.',
      },
      {
        code: 'PARY-1',
        name: 'Parylene coater',
        criticality: 'low',
        mtbfDays: 90,
        pmDays: 120,
        usage: 0.3,
        description: 'Conformal parylene coating.',
      },
      {
        code: 'PLATE-1',
        name: 'Electroplating bench',
        criticality: 'low',
        mtbfDays: 70,
        pmDays: 60,
        usage: 0.4,
        description: 'Copper and gold plating baths.',
      },
    ],
  },
  {
    code: 'WET',
    name: 'Wet chemistry bay',
    family: 'wet',
    description: 'Wet benches, drying and cleaning. Follow the bay’s chemical safety rules. Part of the fictional demo facility.',
    tools: [
      {
        code: 'WB-ACID',
        name: 'Acid wet bench',
        criticality: 'high',
        mtbfDays: 60,
        pmDays: 30,
        usage: 0.9,
        description: 'Piranha, buffered oxide etch and metal etchants.',
      },
      {
        code: 'WB-SOLV',
        name: 'Solvent wet bench',
        mtbfDays: 90,
        pmDays: 60,
        usage: 0.9,
        description: 'Acetone, isopropanol and lift-off.',
      },
      {
        code: 'WB-BASE',
        name: 'Base wet bench',
        mtbfDays: 70,
        pmDays: 45,
        usage: 0.6,
        description: 'KOH and TMAH anisotropic etching baths.',
      },
      { code: 'SRD-1', name: 'Spin rinse dryer', mtbfDays: 60, pmDays: 90, usage: 0.9, description: 'Rinse and dry for wafer cassettes.' },
      {
        code: 'CPD-1',
        name: 'Critical point dryer',
        criticality: 'low',
        mtbfDays: 80,
        pmDays: 120,
        usage: 0.3,
        description: 'CO2 critical point drying of released structures.',
      },
      {
        code: 'MEGA-1',
        name: 'Megasonic cleaner',
        criticality: 'low',
        mtbfDays: 100,
        pmDays: 120,
        usage: 0.4,
        description: 'Megasonic particle removal.',
      },
    ],
  },
  {
    code: 'METRO',
    name: 'Metrology room',
    family: 'metrology',
    description: 'Inspection and measurement. Part of the fictional demo facility.',
    tools: [
      {
        code: 'SEM-1',
        name: 'Scanning electron microscope',
        criticality: 'high',
        mtbfDays: 50,
        pmDays: 90,
        usage: 0.9,
        description: 'Field-emission SEM with EDX.',
      },
      {
        code: 'ELLIP-1',
        name: 'Spectroscopic ellipsometer',
        mtbfDays: 90,
        pmDays: 120,
        usage: 0.7,
        description: 'Film thickness and optical constants.',
      },
      {
        code: 'PROF-1',
        name: 'Stylus profilometer',
        criticality: 'low',
        mtbfDays: 120,
        pmDays: 180,
        usage: 0.8,
        description: 'Step height and roughness.',
      },
      {
        code: 'OPT-1',
        name: 'Inspection microscope station',
        criticality: 'low',
        mtbfDays: 150,
        pmDays: 180,
        usage: 0.9,
        description: 'Bright and dark field inspection with camera.',
      },
      {
        code: 'FPP-1',
        name: 'Four-point probe',
        criticality: 'low',
        mtbfDays: 150,
        pmDays: 180,
        usage: 0.5,
        description: 'Sheet resistance mapping.',
      },
      {
        code: 'AFM-1',
        name: 'Atomic force microscope',
        mtbfDays: 60,
        pmDays: 90,
        usage: 0.6,
        description: 'Tapping and contact mode surface imaging.',
      },
      {
        code: 'REFL-1',
        name: 'Film thickness reflectometer',
        criticality: 'low',
        mtbfDays: 120,
        pmDays: 180,
        usage: 0.7,
        description: 'Quick thickness of transparent films.',
      },
      {
        code: 'BOND-1',
        name: 'Wafer bonder',
        mtbfDays: 70,
        pmDays: 90,
        usage: 0.3,
        description: 'Anodic, fusion and adhesive bonding (kept here for its alignment optics).',
      },
    ],
  },
];

const FAILURE_NOTES: Record<Family, string[]> = {
  litho: [
    'Dispense pump not delivering resist',
    'Hotplate temperature out of tolerance',
    'Exposure lamp will not ignite',
    'Wafer stuck on the transfer arm',
    'Alignment stage does not home',
    'Vacuum chuck does not hold the wafer',
    'Developer nozzle blocked',
  ],
  etch: [
    'RF reflected power too high; plasma unstable',
    'Chamber will not pump down to base pressure',
    'Helium backside cooling leak',
    'Wafer broken in the process chamber',
    'Mass flow controller not reaching setpoint',
    'Chiller flow alarm',
    'Robot lost its teach position',
  ],
  thermal: [
    'Heater zone out of tolerance',
    'Pressure will not reach base; leak check needed',
    'Boat elevator motor fault',
    'Thermocouple reading drifts',
    'Gas cabinet purge alarm',
    'Exhaust pressure alarm',
  ],
  deposition: [
    'Crucible indexer jams',
    'Chamber will not pump down to base pressure',
    'Crystal monitor reads nonsense',
    'Shutter stuck closed',
    'Target arcing; plasma unstable',
    'Cryo pump regeneration failed',
    'Substrate heater does not reach setpoint',
  ],
  wet: [
    'Bath heater does not reach temperature',
    'Exhaust airflow alarm',
    'Drain valve leaking',
    'Recirculation pump stopped',
    'Level sensor fault',
    'Rinse tank resistivity alarm',
  ],
  metrology: [
    'Stage does not home',
    'Filament burned out',
    'Software froze; controller restart did not help',
    'Light source failed',
    'Vacuum interlock fault',
    'Calibration standard out of range',
  ],
};

const PART_NOTES = [
  'Replacement part ordered',
  'Spare pump ordered from the vendor',
  'Replacement sensor on order',
  'New controller board ordered',
  'Waiting for a replacement valve',
];
const DEV_NOTES = ['Process development for a new recipe', 'Recipe tuning for a user project', 'Test runs for a new material'];
const QUAL_NOTES = ['Qualification runs after maintenance', 'Test wafers after repair'];
const PM_NOTES: Record<Family, string> = {
  litho: 'Preventive maintenance: bowl clean, lamp hours check, calibration',
  etch: 'Preventive maintenance: chamber wet clean and seal change',
  thermal: 'Preventive maintenance: tube bake and profile check',
  deposition: 'Preventive maintenance: shield swap and source refill',
  wet: 'Preventive maintenance: bath change and filter swap',
  metrology: 'Preventive maintenance: calibration and cleaning',
};

interface Segment {
  start: number;
  end: number;
  state: E10State;
  reason: StateReason;
  note: string | null;
  restriction?: string | null;
  expectedReturnAt?: number | null;
  source: StateSource;
  setById: number | null;
  confirmed?: boolean;
}

/** A stretch of non-routine time (failure, PM, engineering, shutdown): consecutive segments. */
interface Disruption {
  start: number;
  segments: Omit<Segment, 'start' | 'end'>[];
  durations: number[];
}

const end = (d: Disruption) => d.start + d.durations.reduce((a, b) => a + b, 0);

/** Busy days and idle nights: productive while people work on a weekday, standby otherwise. */
function routine(from: number, to: number, usage: number, rnd: Random): Segment[] {
  const out: Segment[] = [];
  const push = (start: number, stop: number, state: E10State) => {
    if (stop <= start) return;
    const last = out[out.length - 1];
    if (last && last.state === state) last.end = stop;
    else out.push({ start, end: stop, state, reason: 'none', note: null, source: 'system', setById: null });
  };
  let cursor = from;
  for (let day = Math.floor(from / DAY) * DAY; day < to; day += DAY) {
    const weekday = new Date(day).getUTCDay();
    const weekend = weekday === 0 || weekday === 6;
    // Weekends see the odd user finishing a run; weekdays run from morning into the evening.
    if (!rnd.chance(weekend ? usage * 0.2 : usage)) continue;
    const s = Math.max(day + (6 + rnd.int(0, 3)) * HOUR + rnd.int(0, 59) * MINUTE, cursor);
    const e = Math.min(s + (weekend ? 2 + rnd.next() * 4 : 4 + rnd.next() * 10) * HOUR, to);
    if (e <= s) continue;
    push(cursor, s, 'standby');
    push(s, e, 'productive');
    cursor = e;
  }
  push(cursor, to, 'standby');
  return out;
}

function failure(at: number, family: Family, rnd: Random, engineer: number, reporter: number): Disruption {
  const note = rnd.pick(FAILURE_NOTES[family]);
  const reported = rnd.chance(0.35);
  const segments: Disruption['segments'] = [];
  const durations: number[] = [];
  const add = (seg: Disruption['segments'][number], ms: number) => {
    segments.push(seg);
    durations.push(Math.max(20 * MINUTE, Math.round(ms / MINUTE) * MINUTE));
  };
  const facilities = rnd.chance(0.06);
  if (facilities) {
    add(
      {
        state: 'unscheduled_downtime',
        reason: 'facilities_related',
        note: rnd.pick(['Exhaust failure in the bay', 'Process cooling water outage', 'Nitrogen supply pressure low']),
        source: 'staff',
        setById: engineer,
      },
      (2 + rnd.exp(6)) * HOUR,
    );
    return { start: at, segments, durations };
  }
  add(
    {
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: reported ? `Reported by a user: ${note}` : note,
      source: reported ? 'user_report' : 'staff',
      setById: reported ? reporter : engineer,
    },
    (0.75 + rnd.exp(3.5)) * HOUR,
  );
  if (rnd.chance(0.3)) {
    const wait = (12 + rnd.exp(48)) * HOUR;
    add(
      {
        state: 'unscheduled_downtime',
        reason: 'waiting_parts',
        note: rnd.pick(PART_NOTES),
        expectedReturnAt: at + durations[0] + wait + rnd.int(-12, 24) * HOUR,
        source: 'staff',
        setById: engineer,
      },
      wait,
    );
    add(
      { state: 'unscheduled_downtime', reason: 'repair', note: 'Fitting the new part', source: 'staff', setById: engineer },
      (1 + rnd.exp(2)) * HOUR,
    );
  } else if (rnd.chance(0.1)) {
    add(
      {
        state: 'unscheduled_downtime',
        reason: 'maintenance_delay_supplier',
        note: 'Waiting for the vendor’s service visit',
        source: 'staff',
        setById: engineer,
      },
      (24 + rnd.exp(36)) * HOUR,
    );
    add(
      { state: 'unscheduled_downtime', reason: 'repair', note: 'Vendor engineer on site', source: 'staff', setById: engineer },
      (2 + rnd.exp(3)) * HOUR,
    );
  }
  if (rnd.chance(0.3))
    add(
      { state: 'unscheduled_downtime', reason: 'qualification', note: rnd.pick(QUAL_NOTES), source: 'staff', setById: engineer },
      (0.5 + rnd.next() * 1.5) * HOUR,
    );
  return { start: at, segments, durations };
}

function preventive(at: number, family: Family, rnd: Random, engineer: number): Disruption {
  const segments: Disruption['segments'] = [
    { state: 'scheduled_downtime', reason: 'preventive_maintenance', note: PM_NOTES[family], source: 'staff', setById: engineer },
  ];
  const durations = [Math.round((3 + rnd.next() * 7) * 4) * 15 * MINUTE];
  segments[0].expectedReturnAt = at + durations[0];
  if (rnd.chance(0.6)) {
    segments.push({ state: 'engineering', reason: 'qualification', note: rnd.pick(QUAL_NOTES), source: 'staff', setById: engineer });
    durations.push((1 + rnd.next()) * HOUR);
  }
  return { start: at, segments, durations };
}

/** The Monday-to-Friday morning on or after `t`, at 07:00 UTC. */
function workMorning(t: number): number {
  let day = Math.floor(t / DAY) * DAY + 7 * HOUR;
  if (day < t) day += DAY;
  while ([0, 6].includes(new Date(day).getUTCDay())) day += DAY;
  return day;
}

/** The year-end shutdown inside the history window, as non-scheduled time for every tool. */
function shutdownWindow(start: number, now: number): [number, number] | null {
  for (let year = new Date(now).getUTCFullYear(); year >= new Date(start).getUTCFullYear() - 1; year--) {
    const s = Date.UTC(year, 11, 24, 12);
    const e = Date.UTC(year + 1, 0, 2, 6);
    if (s >= start && e <= now - DAY) return [s, e];
  }
  return null;
}

/** Puts disruptions in order without overlaps (a later one waits for the one before). */
function arrange(candidates: Disruption[], fixed: Disruption[], until: number, rnd: Random): Disruption[] {
  fixed = [...fixed].sort((a, b) => a.start - b.start);
  const all = [...fixed.map((d) => ({ d, fixed: true })), ...candidates.map((d) => ({ d, fixed: false }))].sort(
    (a, b) => a.d.start - b.d.start,
  );
  const out: Disruption[] = [];
  let cursor = -Infinity;
  for (const { d, fixed: isFixed } of all) {
    if (isFixed) {
      // Fixed ones (the shutdown, the current state) win: drop whatever would run into them.
      while (out.length && end(out[out.length - 1]) > d.start) out.pop();
      out.push(d);
      cursor = end(d);
      continue;
    }
    const start = Math.max(d.start, cursor + (1 + rnd.int(0, 5)) * HOUR);
    const moved = { ...d, start };
    const nextFixed = fixed.find((f) => f.start >= cursor && f.start > start);
    if (end(moved) >= until || (nextFixed && end(moved) > nextFixed.start - HOUR)) continue;
    out.push(moved);
    cursor = end(moved);
  }
  return out.sort((a, b) => a.start - b.start);
}

/** Lays routine time and disruptions end to end: each segment starts where the last ended. */
function timeline(from: number, now: number, disruptions: Disruption[], usage: number, rnd: Random): Segment[] {
  const out: Segment[] = [];
  let cursor = from;
  for (const d of disruptions) {
    if (d.start < cursor) continue;
    out.push(...routine(cursor, d.start, usage, rnd));
    let t = d.start;
    d.segments.forEach((seg, i) => {
      const stop = Math.min(t + d.durations[i], now);
      if (stop > t) out.push({ ...seg, start: t, end: stop });
      t = stop;
    });
    cursor = t;
    if (cursor >= now) break;
  }
  if (cursor < now) out.push(...routine(cursor, now, usage, rnd));
  return out;
}

/**
 * What some tools are doing right now, so the board has something to show. Each trouble tells
 * one story with its open ticket (server/db/seed/tickets.ts reads it back from the state log):
 * for unscheduled downtime the note starts with the problem the ticket is about ("problem;
 * what is being done"); a trouble that waits (`waitAfterHours`) is first in repair with the
 * problem as its note, then waits with `note` saying for what.
 */
interface CurrentTrouble {
  module?: string;
  agoHours: number;
  backInHours?: number;
  state: E10State;
  reason: StateReason;
  note: string | null;
  /** For a trouble that waits: the problem, shown while it was in repair before the wait. */
  problem?: string;
  /** Hours after the start at which the repair turned into the wait. */
  waitAfterHours?: number;
  restriction?: string;
  source?: StateSource;
  confirmed?: boolean;
}

/** A current trouble as the disruption that lasts until now (and a day past, cut at now). */
function currentTrouble(trouble: CurrentTrouble, start: number, nowMs: number, setById: number): Disruption {
  const last = {
    state: trouble.state,
    reason: trouble.reason,
    note: trouble.note,
    restriction: trouble.restriction ?? null,
    expectedReturnAt: trouble.backInHours ? nowMs + trouble.backInHours * HOUR : null,
    source: trouble.source ?? ('staff' as StateSource),
    setById,
    confirmed: trouble.confirmed ?? true,
  };
  if (!trouble.waitAfterHours) return { start, segments: [last], durations: [nowMs - start + DAY] };
  const repair = Math.round(trouble.waitAfterHours * 60) * MINUTE;
  return {
    start,
    segments: [{ ...last, reason: 'repair', note: trouble.problem ?? trouble.note, expectedReturnAt: null }, last],
    durations: [repair, nowMs - start - repair + DAY],
  };
}

const NOW_TROUBLE: Record<string, CurrentTrouble> = {
  'LPCVD-3': {
    agoHours: 3.2,
    backInHours: 20,
    state: 'unscheduled_downtime',
    reason: 'repair',
    note: 'Pressure will not reach base; leak check in progress',
  },
  'EVAP-1': {
    agoHours: 52,
    backInHours: 70,
    state: 'unscheduled_downtime',
    reason: 'waiting_parts',
    problem: 'Crucible indexer motor failed',
    waitAfterHours: 5,
    note: 'Crucible indexer motor failed; replacement on order',
  },
  'ALIGN-2': {
    agoHours: 0.6,
    state: 'unscheduled_downtime',
    reason: 'repair',
    note: 'Reported by a user: exposure lamp will not ignite',
    source: 'user_report',
    confirmed: false,
  },
  'DRIE-1': {
    agoHours: 27,
    backInHours: 30,
    state: 'unscheduled_downtime',
    reason: 'maintenance_delay_supplier',
    problem: 'RF generator fault',
    waitAfterHours: 3,
    note: 'RF generator fault; vendor service visit booked',
  },
  'SPUT-1': {
    agoHours: 2.5,
    backInHours: 4,
    state: 'scheduled_downtime',
    reason: 'preventive_maintenance',
    note: 'Target change and shield swap',
  },
  'WB-ACID': {
    agoHours: 1.2,
    backInHours: 3,
    state: 'scheduled_downtime',
    reason: 'consumables_change',
    note: 'Bath change; do not use until the new bath is up to temperature',
  },
  'SEM-1': { agoHours: 4, backInHours: 2, state: 'engineering', reason: 'qualification', note: 'Column alignment and resolution check' },
  'CPD-1': { agoHours: 24 * 9, state: 'non_scheduled', reason: 'not_staffed', note: 'Out of use until the new CO2 supply is connected' },
  'WB-BASE': { agoHours: 30, state: 'productive', reason: 'none', note: 'TMAH bath drained for cleaning', restriction: 'KOH bath only' },
  'ICP-2': {
    module: 'PM2',
    agoHours: 18,
    backInHours: 40,
    state: 'unscheduled_downtime',
    reason: 'waiting_parts',
    problem: 'RF match network fault',
    waitAfterHours: 2,
    note: 'RF match network fault; spare ordered',
  },
  'FURN-A': {
    module: 'TUBE2',
    agoHours: 6,
    backInHours: 26,
    state: 'unscheduled_downtime',
    reason: 'repair',
    note: 'Thermocouple reading drifts; sensor being replaced',
  },
  'PECVD-1': {
    module: 'PM1',
    agoHours: 1.5,
    backInHours: 5,
    state: 'scheduled_downtime',
    reason: 'preventive_maintenance',
    note: 'Chamber clean',
  },
};

export interface SeededTool {
  id: number;
  code: string;
  name: string;
  areaId: number;
  criticality: 'high' | 'normal' | 'low';
  primaryEngineerId: number | null;
  backupEngineerId: number | null;
  modules: { id: number; code: string; name: string }[];
}

export interface FacilitySeed {
  facilityName: string;
  areas: { id: number; code: string; name: string }[];
  tools: SeededTool[];
  /** Start of the seeded history; every tool and module has one open interval at `now`. */
  historyFrom: Date;
}

const fmt = (ms: number) => new Date(ms).toISOString().replace('T', ' ').replace('Z', '');

type Row = [toolId: number, moduleId: number | null, seg: Segment, endedAt: number | null];

async function insertIntervals(transaction: Transaction, rows: Row[], now: number) {
  const sequelize = Tool.sequelize!;
  const esc = (v: unknown) => (v === null || v === undefined ? 'NULL' : sequelize.escape(v as string | number));
  const created = `'${fmt(now)}'`;
  for (let i = 0; i < rows.length; i += 2000) {
    const values = rows
      .slice(i, i + 2000)
      .map(([toolId, moduleId, s, endedAt]) =>
        [
          toolId,
          moduleId ?? 'NULL',
          esc(s.state),
          esc(s.reason),
          esc(s.note),
          esc(s.restriction ?? null),
          `'${fmt(s.start)}'`,
          endedAt === null ? 'NULL' : `'${fmt(endedAt)}'`,
          s.expectedReturnAt ? `'${fmt(s.expectedReturnAt)}'` : 'NULL',
          s.setById ?? 'NULL',
          esc(s.source),
          s.confirmed === false ? 0 : 1,
          created,
        ].join(','),
      );
    await sequelize.query(
      `INSERT INTO state_intervals (tool_id, module_id, state, reason, note, restriction, started_at, ended_at, expected_return_at, set_by_id, source, confirmed, created_at)
       VALUES (${values.join('),(')})`,
      { transaction },
    );
  }
}

/** Joins neighbours that say the same thing (routine idle time next to idle time). */
function mergeSame(segments: Segment[]): Segment[] {
  const out: Segment[] = [];
  for (const s of segments) {
    const last = out[out.length - 1];
    if (
      last &&
      last.state === s.state &&
      last.reason === s.reason &&
      last.note === s.note &&
      (last.restriction ?? null) === (s.restriction ?? null) &&
      last.end === s.start
    )
      last.end = s.end;
    else out.push({ ...s });
  }
  return out;
}

function rows(toolId: number, moduleId: number | null, segments: Segment[]): Row[] {
  return segments.map((s, i) => [toolId, moduleId, s, i === segments.length - 1 ? null : s.end]);
}

/**
 * Creates the areas, tools and modules of the demo facility and a year of state history:
 * busy days and idle nights, failures (unscheduled downtime with repair and waiting-for-parts
 * stretches), preventive maintenance, engineering time, the year-end shutdown, and a few tools
 * in trouble right now. Returns what the tickets seed needs; it files one ticket per stretch of
 * unscheduled downtime by reading state_intervals afterwards.
 */
export async function seedFacility(
  transaction: Transaction,
  people: { staff: User[]; members: User[] },
  now = new Date(),
): Promise<FacilitySeed> {
  const rnd = createRandom(0x51ee7);
  const nowMs = Math.floor(now.getTime() / MINUTE) * MINUTE;
  const from = Math.floor((nowMs - 365 * DAY) / DAY) * DAY;
  const staff = people.staff.map((u) => u.id);
  const members = people.members.map((u) => u.id);
  const shutdown = shutdownWindow(from, nowMs);

  const areas = await Area.bulkCreate(
    AREAS.map((a, i) => ({
      code: a.code,
      name: a.name,
      description: a.description,
      sortOrder: i + 1,
      retiredAt: null,
      createdAt: new Date(from),
      updatedAt: new Date(from),
    })),
    { transaction },
  );

  let n = 0;
  const toolInputs = AREAS.flatMap((a, ai) =>
    a.tools.map((t) => {
      const primary = staff[n % staff.length];
      const backup = staff[(n + 1 + (n % 3)) % staff.length];
      n++;
      return {
        spec: t,
        family: a.family,
        row: {
          areaId: areas[ai].id,
          code: t.code,
          name: t.name,
          description: t.description,
          criticality: t.criticality ?? 'normal',
          primaryEngineerId: primary,
          backupEngineerId: backup === primary ? staff[(n + 2) % staff.length] : backup,
          retiredAt: null,
          createdAt: new Date(from),
          updatedAt: new Date(from),
        },
      };
    }),
  );
  const tools = await Tool.bulkCreate(
    toolInputs.map((t) => t.row),
    { transaction },
  );
  const moduleRows = toolInputs.flatMap((t, i) =>
    (t.spec.modules ?? []).map(([code, name], j) => ({
      toolId: tools[i].id,
      code,
      name,
      sortOrder: j,
      retiredAt: null,
      createdAt: new Date(from),
      updatedAt: new Date(from),
    })),
  );
  const modules = await ToolModule.bulkCreate(moduleRows, { transaction });

  const all: Row[] = [];
  const seeded: SeededTool[] = [];
  toolInputs.forEach(({ spec, family }, i) => {
    const tool = tools[i];
    const engineer = tool.primaryEngineerId ?? staff[0];
    const helpers = [engineer, tool.backupEngineerId ?? engineer];
    const candidates: Disruption[] = [];

    // Failures: a Poisson process; a worsening tool fails up to 2.5 times as often by the end.
    for (let t = from + rnd.exp(spec.mtbfDays) * DAY; t < nowMs;) {
      candidates.push(failure(t, family, rnd, rnd.pick(helpers), rnd.pick(members)));
      const progress = (t - from) / (nowMs - from);
      const mean = spec.worsening ? spec.mtbfDays / (1 + 1.5 * progress) : spec.mtbfDays;
      t += rnd.exp(mean) * DAY;
    }
    // Preventive maintenance on a calendar, starting on a weekday morning.
    for (let t = from + rnd.int(3, spec.pmDays) * DAY; t < nowMs; t += spec.pmDays * DAY)
      candidates.push(preventive(workMorning(t), family, rnd, rnd.pick(helpers)));
    // Now and then, engineering time for process development.
    for (let t = from + rnd.exp(75) * DAY; t < nowMs; t += rnd.exp(75) * DAY) {
      candidates.push({
        start: workMorning(t),
        segments: [
          { state: 'engineering', reason: 'process_development', note: rnd.pick(DEV_NOTES), source: 'staff', setById: rnd.pick(helpers) },
        ],
        durations: [(2 + rnd.next() * 5) * HOUR],
      });
    }

    const fixed: Disruption[] = [];
    if (shutdown)
      fixed.push({
        start: shutdown[0],
        segments: [
          {
            state: 'non_scheduled',
            reason: 'not_staffed',
            note: 'Facility closed over the year-end holidays',
            source: 'schedule',
            setById: null,
          },
        ],
        durations: [shutdown[1] - shutdown[0]],
      });
    const trouble = NOW_TROUBLE[spec.code];
    if (trouble && !trouble.module) {
      const start = nowMs - Math.round(trouble.agoHours * 60) * MINUTE;
      fixed.push(currentTrouble(trouble, start, nowMs, trouble.source === 'user_report' ? rnd.pick(members) : engineer));
    }
    const toolSegments = mergeSame(timeline(from, nowMs, arrange(candidates, fixed, nowMs, rnd), spec.usage, rnd));
    all.push(...rows(tool.id, null, toolSegments));

    // Modules keep their own, quieter logs: idle between their own faults.
    const mine = modules.filter((m) => m.toolId === tool.id);
    for (const m of mine) {
      const faults: Disruption[] = [];
      for (let t = from + rnd.exp(120) * DAY; t < nowMs; t += rnd.exp(120) * DAY) {
        const note = rnd.pick(FAILURE_NOTES[family]);
        faults.push({
          start: t,
          segments: [{ state: 'unscheduled_downtime', reason: 'repair', note, source: 'staff', setById: engineer }],
          durations: [(2 + rnd.exp(10)) * HOUR],
        });
      }
      const modFixed: Disruption[] = [];
      if (trouble?.module === m.code) {
        const start = nowMs - Math.round(trouble.agoHours * 60) * MINUTE;
        modFixed.push(currentTrouble(trouble, start, nowMs, engineer));
      }
      const segs = timeline(from, nowMs, arrange(faults, modFixed, nowMs, rnd), 0, rnd);
      all.push(...rows(tool.id, m.id, mergeSame(segs)));
    }

    seeded.push({
      id: tool.id,
      code: tool.code,
      name: tool.name,
      areaId: tool.areaId,
      criticality: tool.criticality,
      primaryEngineerId: tool.primaryEngineerId,
      backupEngineerId: tool.backupEngineerId,
      modules: mine.map((m) => ({ id: m.id, code: m.code, name: m.name })),
    });
  });

  await insertIntervals(transaction, all, nowMs);
  return {
    facilityName: DEMO_FACILITY_NAME,
    areas: areas.map((a) => ({ id: a.id, code: a.code, name: a.name })),
    tools: seeded,
    historyFrom: new Date(from),
  };
}
