import type { Sequelize } from 'sequelize';
import { Area, Tool, ToolModule } from '../../server/modules/facility/facility.model';
import { changeState, openInitialState } from '../../server/modules/facility/state.service';
import type { AppDeps } from '../../server/lib/http';
import type { E10State, StateReason } from '../../shared/equipment-state';
import { unique } from '../support/factories';

interface ToolPlan {
  name: string;
  code: string;
  modules?: [string, string][];
  state?: {
    state: E10State;
    reason?: StateReason;
    note?: string;
    restriction?: string;
    backInHours?: number;
    agoHours: number;
    module?: string;
  };
}

const PLAN: { area: string; tools: ToolPlan[] }[] = [
  {
    area: 'Lithography bay',
    tools: [
      {
        name: 'Resist coat track A',
        code: 'TRACK-A',
        modules: [
          ['COAT1', 'Coater bowl 1'],
          ['COAT2', 'Coater bowl 2'],
          ['DEV', 'Developer bowl'],
        ],
        state: {
          module: 'COAT2',
          state: 'unscheduled_downtime',
          reason: 'repair',
          note: 'Dispense pump not delivering resist',
          agoHours: 2,
          backInHours: 5,
        },
      },
      { name: 'Mask aligner 1', code: 'ALIGN-1' },
      {
        name: 'Mask aligner 2',
        code: 'ALIGN-2',
        state: {
          state: 'unscheduled_downtime',
          reason: 'waiting_parts',
          note: 'Exposure lamp failed; replacement ordered',
          agoHours: 26,
          backInHours: 30,
        },
      },
      { name: 'E-beam lithography system', code: 'EBL-1', state: { state: 'productive', agoHours: 1 } },
    ],
  },
  {
    area: 'Dry etch bay',
    tools: [
      {
        name: 'ICP etcher 1',
        code: 'ICP-1',
        state: {
          state: 'scheduled_downtime',
          reason: 'preventive_maintenance',
          note: 'Chamber wet clean and seal change',
          agoHours: 3,
          backInHours: 2,
        },
      },
      {
        name: 'ICP etcher 2',
        code: 'ICP-2',
        modules: [
          ['PM1', 'Process chamber 1'],
          ['PM2', 'Process chamber 2'],
        ],
      },
      {
        name: 'Deep silicon etcher',
        code: 'DRIE-1',
        state: { state: 'engineering', reason: 'process_development', note: 'Recipe tuning for a user project', agoHours: 4 },
      },
      {
        name: 'Oxygen plasma asher',
        code: 'ASH-1',
        state: { state: 'productive', restriction: 'Descum only; strip recipes disabled', agoHours: 20 },
      },
    ],
  },
  {
    area: 'Furnace bay',
    tools: [
      {
        name: 'LPCVD tube 3',
        code: 'LPCVD-3',
        state: {
          state: 'unscheduled_downtime',
          reason: 'repair',
          note: 'Pressure will not reach base; leak check in progress',
          agoHours: 3,
          backInHours: 20,
        },
      },
      { name: 'Rapid thermal annealer', code: 'RTA-1' },
      {
        name: 'Forming gas anneal oven',
        code: 'ANL-1',
        state: { state: 'non_scheduled', reason: 'not_staffed', note: 'Out of use until the gas line is requalified', agoHours: 24 * 6 },
      },
    ],
  },
];

export interface BuiltTool {
  id: number;
  code: string;
  name: string;
  areaId: number;
}

/**
 * A small, realistic facility with tools in every state, under unique codes so it never
 * collides with other tests' rows. Names are generic; the facility is invented.
 */
export async function buildFacility(deps: AppDeps, sequelize: Sequelize = deps.sequelize) {
  const suffix = unique('').slice(1, 5).toUpperCase();
  const tools: Record<string, BuiltTool> = {};
  const areas: Area[] = [];
  const created = new Date(Date.now() - 30 * 24 * 3_600_000);
  for (const [i, block] of PLAN.entries()) {
    const area = await Area.create({
      name: `${block.area} ${suffix}`,
      code: `E2E${suffix}${i}`,
      description: 'Invented for a browser test.',
      sortOrder: -100 + i,
      retiredAt: null,
    });
    areas.push(area);
    for (const plan of block.tools) {
      const code = `${plan.code}-${suffix}`;
      const { tool, modules } = await sequelize.transaction(async (transaction) => {
        const t = await Tool.create(
          {
            areaId: area.id,
            name: plan.name,
            code,
            description: `${plan.name}, invented for a browser test.`,
            primaryEngineerId: null,
            backupEngineerId: null,
            retiredAt: null,
          },
          { transaction },
        );
        await openInitialState(t.id, null, created, null, transaction);
        const mods: ToolModule[] = [];
        for (const [j, [mcode, mname]] of (plan.modules ?? []).entries()) {
          const m = await ToolModule.create({ toolId: t.id, code: mcode, name: mname, sortOrder: j, retiredAt: null }, { transaction });
          await openInitialState(t.id, m.id, created, null, transaction);
          mods.push(m);
        }
        return { tool: t, modules: mods };
      });
      if (plan.state) {
        const s = plan.state;
        await changeState(deps, {
          toolId: tool.id,
          moduleId: s.module ? modules.find((m) => m.code === s.module)!.id : null,
          state: s.state,
          reason: s.reason,
          note: s.note ?? null,
          restriction: s.restriction ?? null,
          expectedReturnAt: s.backInHours ? new Date(Date.now() + s.backInHours * 3_600_000) : null,
          actorId: null,
          at: new Date(Date.now() - s.agoHours * 3_600_000),
        });
      }
      tools[plan.code] = { id: tool.id, code, name: plan.name, areaId: area.id };
    }
  }
  return { tools, areas };
}
