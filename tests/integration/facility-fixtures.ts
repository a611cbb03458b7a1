import type { Sequelize } from 'sequelize';
import { Area, StateInterval, Tool, ToolModule } from '../../server/modules/facility/facility.model';
import { openInitialState } from '../../server/modules/facility/state.service';
import { unique } from '../support/factories';
import type { Criticality } from '../../shared/priority';

// Rows for the facility tests: each call makes its own area and tool with unique codes.

export const uniqueCode = (prefix: string) => unique(prefix).toUpperCase();

export async function makeArea(name?: string) {
  return Area.create({ name: name ?? unique('Bay'), code: uniqueCode('A'), description: null, retiredAt: null });
}

export async function makeTool(
  sequelize: Sequelize,
  opts: {
    areaId?: number;
    name?: string;
    criticality?: Criticality;
    modules?: string[];
    since?: Date;
    primaryEngineerId?: number | null;
    backupEngineerId?: number | null;
  } = {},
) {
  const areaId = opts.areaId ?? (await makeArea()).id;
  const since = opts.since ?? new Date(Date.now() - 60_000);
  return sequelize.transaction(async (transaction) => {
    const tool = await Tool.create(
      {
        areaId,
        name: opts.name ?? unique('Test etcher'),
        code: uniqueCode('T'),
        description: null,
        criticality: opts.criticality ?? 'normal',
        primaryEngineerId: opts.primaryEngineerId ?? null,
        backupEngineerId: opts.backupEngineerId ?? null,
        retiredAt: null,
      },
      { transaction },
    );
    await openInitialState(tool.id, null, since, null, transaction);
    const modules: ToolModule[] = [];
    for (const [i, code] of (opts.modules ?? []).entries()) {
      const m = await ToolModule.create({ toolId: tool.id, name: `Chamber ${code}`, code, sortOrder: i, retiredAt: null }, { transaction });
      await openInitialState(tool.id, m.id, since, null, transaction);
      modules.push(m);
    }
    return { tool, modules, areaId };
  });
}

/** The state log of a tool or module, oldest first. */
export function intervalsOf(toolId: number, moduleId: number | null = null) {
  return StateInterval.findAll({
    where: { toolId, moduleId },
    order: [
      ['startedAt', 'ASC'],
      ['id', 'ASC'],
    ],
  });
}

/** Checks the log invariant: starts at the previous end, one open interval, the last one. */
export function logProblems(intervals: StateInterval[]): string[] {
  const problems: string[] = [];
  const open = intervals.filter((i) => i.endedAt === null);
  if (open.length !== 1) problems.push(`expected exactly one open interval, found ${open.length}`);
  if (intervals.length && intervals[intervals.length - 1].endedAt !== null) problems.push('the last interval is not the open one');
  for (let i = 1; i < intervals.length; i++) {
    const prev = intervals[i - 1];
    const cur = intervals[i];
    if (!prev.endedAt || prev.endedAt.getTime() !== cur.startedAt.getTime()) {
      problems.push(
        `interval ${cur.id} starts at ${cur.startedAt.toISOString()} but the one before ends at ${prev.endedAt?.toISOString() ?? 'never'}`,
      );
    }
  }
  return problems;
}
