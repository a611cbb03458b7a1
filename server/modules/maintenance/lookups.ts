import type { Sequelize, Transaction } from 'sequelize';
import { notFound } from '../../lib/errors';
import { engineerIdsOf, findTool, isActiveModuleOf, type ToolFacts } from '../facility/tool-directory';
import { toolFollowerIds } from '../facility/follow.service';
import { findOpenInterval } from '../facility/state.service';
import { activePeople } from '../users/user-directory';

// Small reads of other modules' data this module needs (tool names, engineers, followers),
// through those modules' public functions, so their tables and models stay their own.
// (`sequelize` stays in the signatures so the call sites read the same.)

export type ToolInfo = ToolFacts;

export async function toolInfo(_sequelize: Sequelize, toolId: number, transaction?: Transaction): Promise<ToolInfo> {
  const tool = await findTool(toolId, transaction);
  if (!tool) throw notFound('That tool');
  return tool;
}

/** The module belongs to the tool (or is null). */
export async function moduleBelongs(_sequelize: Sequelize, toolId: number, moduleId: number | null, transaction?: Transaction) {
  return moduleId === null || isActiveModuleOf(toolId, moduleId, transaction);
}

export interface Person {
  userId: number;
  email: string;
  name: string;
}

const asPeople = (people: { id: number; email: string; name: string }[]): Person[] =>
  people.map((u) => ({ userId: u.id, email: u.email, name: u.name }));

export async function followersOf(
  _sequelize: Sequelize,
  toolId: number,
  exceptUserId: number | null,
  transaction: Transaction,
): Promise<Person[]> {
  const ids = (await toolFollowerIds(toolId, transaction)).filter((id) => id !== exceptUserId);
  return asPeople(await activePeople(ids, { transaction }));
}

/** Active primary and backup engineers of the given tools. */
export async function engineersOf(_sequelize: Sequelize, toolIds: number[], transaction: Transaction): Promise<Person[]> {
  return asPeople(await activePeople(await engineerIdsOf(toolIds, transaction), { transaction }));
}

/** The tool's (or module's) open state, to know whether a work order holds it in downtime. */
export async function openState(_sequelize: Sequelize, toolId: number, moduleId: number | null, transaction?: Transaction) {
  const open = await findOpenInterval(toolId, moduleId, transaction);
  return open ? { state: open.state, reason: open.reason } : null;
}
