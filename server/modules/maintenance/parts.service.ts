import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { Part, PartUse, WorkOrder } from './maintenance.model';
import { engineersOf } from './lookups';
import { createNotices } from '../notices/notices.service';
import { queueMail } from '../../lib/mailer';
import { AppError, badRequest, notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import type { PartUseInput } from '../../../shared/schemas/maintenance';
import { likePattern } from '../../lib/like-pattern';

// The spare-parts list. Using a part draws the count down in the same transaction as the
// use; when the count first falls below the reorder level the engineers of the part's tools
// are told once (low_notice_at), and a restock to the level or above re-arms the notice.

async function toolIdsOf(partIds: number[], transaction?: Transaction) {
  if (partIds.length === 0) return new Map<number, number[]>();
  const rows = await Part.sequelize!.query<{ partId: number; toolId: number }>(
    `SELECT part_id AS partId, tool_id AS toolId FROM part_tools WHERE part_id IN (:partIds)`,
    {
      type: QueryTypes.SELECT,
      replacements: { partIds },
      transaction,
    },
  );
  const map = new Map<number, number[]>();
  for (const r of rows) map.set(r.partId, [...(map.get(r.partId) ?? []), r.toolId]);
  return map;
}

function present(p: Part, toolIds: number[]) {
  return {
    id: p.id,
    name: p.name,
    partNumber: p.partNumber,
    stock: p.stock,
    reorderLevel: p.reorderLevel,
    low: p.stock < p.reorderLevel,
    toolIds,
  };
}

async function setTools(deps: AppDeps, partId: number, toolIds: number[], transaction: Transaction) {
  await deps.sequelize.query(`DELETE FROM part_tools WHERE part_id = :partId`, { replacements: { partId }, transaction });
  if (toolIds.length === 0) return;
  const known = await deps.sequelize.query<{ id: number }>(`SELECT id FROM tools WHERE id IN (:toolIds)`, {
    type: QueryTypes.SELECT,
    replacements: { toolIds },
    transaction,
  });
  if (known.length !== new Set(toolIds).size) throw badRequest('Unknown tool.', { toolIds: ['One of these tools does not exist.'] });
  await deps.sequelize.query(`INSERT INTO part_tools (part_id, tool_id) VALUES ${[...new Set(toolIds)].map(() => '(?, ?)').join(', ')}`, {
    replacements: [...new Set(toolIds)].flatMap((t) => [partId, t]),
    transaction,
  });
}

function duplicateNumber(err: unknown): never {
  if (err instanceof UniqueConstraintError)
    throw badRequest('That part number is already in the list.', { partNumber: ['Already in the list.'] });
  throw err;
}

export async function createPart(
  deps: AppDeps,
  input: { name: string; partNumber: string; toolIds: number[]; stock: number; reorderLevel: number },
) {
  return deps.sequelize
    .transaction(async (transaction) => {
      const p = await Part.create(
        { name: input.name, partNumber: input.partNumber, stock: input.stock, reorderLevel: input.reorderLevel },
        { transaction },
      );
      await setTools(deps, p.id, input.toolIds, transaction);
      return present(p, input.toolIds);
    })
    .catch(duplicateNumber);
}

export async function updatePart(
  deps: AppDeps,
  id: number,
  input: Partial<{ name: string; partNumber: string; toolIds: number[]; stock: number; reorderLevel: number }>,
) {
  return deps.sequelize
    .transaction(async (transaction) => {
      const p = await Part.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!p) throw notFound('That part');
      const { toolIds, ...fields } = input;
      Object.assign(p, fields);
      if (p.stock >= p.reorderLevel) p.lowNoticeAt = null;
      await p.save({ transaction });
      if (toolIds) await setTools(deps, p.id, toolIds, transaction);
      return present(p, toolIds ?? (await toolIdsOf([p.id], transaction)).get(p.id) ?? []);
    })
    .catch(duplicateNumber);
}

export async function listParts(deps: AppDeps, query: { toolId?: number; q?: string; limit: number; offset: number }) {
  const where: string[] = [];
  if (query.toolId) where.push('p.id IN (SELECT part_id FROM part_tools WHERE tool_id = :toolId)');
  if (query.q) where.push('(p.name LIKE :q OR p.part_number LIKE :q)');
  const sql = `FROM parts p ${where.length ? `WHERE ${where.join(' AND ')}` : ''}`;
  const replacements = {
    toolId: query.toolId ?? 0,
    q: likePattern(query.q ?? ''),
    limit: query.limit,
    offset: query.offset,
  };
  const [rows, [{ n }]] = await Promise.all([
    deps.sequelize.query<{ id: number }>(`SELECT p.id ${sql} ORDER BY p.name LIMIT :limit OFFSET :offset`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
    deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n ${sql}`, { type: QueryTypes.SELECT, replacements }),
  ]);
  const parts = await Part.findAll({ where: { id: rows.map((r) => r.id) }, order: [['name', 'ASC']] });
  const tools = await toolIdsOf(parts.map((p) => p.id));
  return { items: parts.map((p) => present(p, tools.get(p.id) ?? [])), total: Number(n), limit: query.limit, offset: query.offset };
}

/** Records a use on a work order or ticket; a listed part's count goes down in the same step. */
export async function usePart(deps: AppDeps, target: { workOrderId?: number; ticketId?: number }, input: PartUseInput, user: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    if (target.workOrderId) {
      const wo = await WorkOrder.findByPk(target.workOrderId, { transaction, attributes: ['id', 'status'] });
      if (!wo) throw notFound('That work order');
      if (wo.status === 'done' || wo.status === 'skipped')
        throw new AppError(409, 'work_order_closed', 'This work order is closed; parts can no longer be added.');
    } else {
      const [t] = await deps.sequelize.query(`SELECT id FROM tickets WHERE id = :id`, {
        type: QueryTypes.SELECT,
        replacements: { id: target.ticketId },
        transaction,
      });
      if (!t) throw notFound('That ticket');
    }
    let part: Part | null = null;
    if (input.partId !== null) {
      part = await Part.findByPk(input.partId, { transaction, lock: transaction.LOCK.UPDATE });
      if (!part) throw badRequest('Unknown part.', { partId: ['There is no such part in the list.'] });
      if (part.stock < input.quantity)
        throw new AppError(409, 'not_enough_stock', `Only ${part.stock} of ${part.name} (${part.partNumber}) are in stock.`);
      part.stock -= input.quantity;
      const crossed = part.stock < part.reorderLevel && part.lowNoticeAt === null;
      if (crossed) part.lowNoticeAt = new Date();
      await part.save({ transaction });
      if (crossed) await tellLowStock(deps, part, transaction);
    }
    const use = await PartUse.create(
      {
        partId: part?.id ?? null,
        freeText: input.freeText,
        quantity: input.quantity,
        workOrderId: target.workOrderId ?? null,
        ticketId: target.ticketId ?? null,
        usedById: user.id,
        usedAt: new Date(),
      },
      { transaction },
    );
    deps.events.publish(
      {
        type: 'maintenance.changed',
        audience: 'staff',
        payload: { workOrderId: target.workOrderId ?? null, ticketId: target.ticketId ?? null },
      },
      transaction,
    );
    return { id: use.id, partId: use.partId, freeText: use.freeText, quantity: use.quantity, stock: part?.stock ?? null };
  });
}

async function tellLowStock(deps: AppDeps, part: Part, transaction: Transaction) {
  const toolIds = (await toolIdsOf([part.id], transaction)).get(part.id) ?? [];
  const people = await engineersOf(deps.sequelize, toolIds, transaction);
  if (people.length === 0) return;
  const title = `Spare part low: ${part.name} (${part.partNumber}), ${part.stock} left`;
  const body = `${part.name} (${part.partNumber}) is down to ${part.stock}, below its reorder level of ${part.reorderLevel}. Order more before the next repair needs it.`;
  await queueMail(
    people.map((p) => ({
      to: p.email,
      subject: `Faultline: ${title}`,
      text: `Hello ${p.name},\n\n${body}\n\nParts list: ${deps.config.publicUrl}/maintenance/parts`,
    })),
    transaction,
  );
  await createNotices(
    deps,
    people.map((p) => p.userId),
    { kind: 'part_low', title, body, link: '/maintenance/parts' },
    transaction,
  );
}

export async function partUsesOfTicket(deps: AppDeps, ticketId: number) {
  return deps.sequelize.query(
    `SELECT u.id, u.part_id AS partId, p.name, p.part_number AS partNumber, u.free_text AS freeText, u.quantity, u.used_at AS usedAt
       FROM part_uses u LEFT JOIN parts p ON p.id = u.part_id WHERE u.ticket_id = :ticketId ORDER BY u.used_at`,
    { type: QueryTypes.SELECT, replacements: { ticketId } },
  );
}
