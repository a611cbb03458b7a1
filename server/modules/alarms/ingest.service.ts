import crypto from 'node:crypto';
import { QueryTypes, Transaction } from 'sequelize';
import { AlarmDefinition, AlarmOccurrence, AlarmToolSettings } from './alarms.model';
import { applyRules, type NewOccurrence } from './rules.service';
import { badRequest } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { decodeAlcd } from '../../../shared/alarms';
import { announceAlarmChange } from './announce';
import type { AlarmEventInput, IngestAnswer } from '../../../shared/schemas/alarms';

// Alarm events from a tool: stored once per sender id, then the tool's set/clear intervals
// ("occurrences") are rebuilt in time order from the raw events, so late and out-of-order
// events end in the same intervals as events sent in order. All of one tool's ingest work is
// serialised by a lock on its settings row; different tools run side by side.

interface NormalEvent {
  senderId: string;
  alarmKey: string;
  set: boolean;
  category: number | null;
  text: string | null;
  moduleId: number | null;
  at: Date;
}

/**
 * The tool's settings row exists before any ingest transaction locks it. Created outside the
 * transaction: an INSERT IGNORE inside it would take a shared lock on an existing row, and two
 * requests of the same tool holding that shared lock while both asking for the exclusive one
 * deadlock.
 */
export async function ensureToolSettings(deps: AppDeps, toolId: number) {
  const [exists] = await deps.sequelize.query(`SELECT 1 AS x FROM alarm_tool_settings WHERE tool_id = :toolId`, {
    replacements: { toolId },
    type: QueryTypes.SELECT,
  });
  if (!exists)
    await deps.sequelize.query(`INSERT IGNORE INTO alarm_tool_settings (tool_id, updated_at) VALUES (:toolId, UTC_TIMESTAMP(3))`, {
      replacements: { toolId },
    });
}

/** Takes the per-tool ingest lock; ingestTransaction made sure the row exists. */
export async function lockToolSettings(toolId: number, transaction: Transaction) {
  const settings = await AlarmToolSettings.findByPk(toolId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!settings) throw new Error(`alarm settings of tool ${toolId} are missing`);
  return settings;
}

/**
 * Ingest transactions: all of one tool's work is serialised by its settings row, so READ
 * COMMITTED is enough and spares the gap locks that would make different tools wait on each
 * other in the shared indexes.
 */
export async function ingestTransaction<T>(deps: AppDeps, toolId: number, work: (t: Transaction) => Promise<T>): Promise<T> {
  await ensureToolSettings(deps, toolId);
  return deps.sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, work);
}

/** Module codes of the tool → ids; an unknown code is bad input naming the code. */
async function resolveModules(deps: AppDeps, toolId: number, events: readonly AlarmEventInput[]) {
  const codes = [...new Set(events.map((e) => e.module).filter((c): c is string => !!c))];
  const byCode = new Map<string, number>();
  if (codes.length) {
    const rows = await deps.sequelize.query<{ id: number; code: string }>(
      `SELECT id, code FROM modules WHERE tool_id = :toolId AND retired_at IS NULL AND code IN (:codes)`,
      {
        replacements: { toolId, codes },
        type: QueryTypes.SELECT,
      },
    );
    for (const r of rows) byCode.set(r.code.toUpperCase(), Number(r.id));
  }
  const fields: Record<string, string[]> = {};
  events.forEach((e, i) => {
    if (e.module && !byCode.has(e.module)) fields[`events.${i}.module`] = [`Unknown module code "${e.module}" for this tool.`];
  });
  if (Object.keys(fields).length)
    throw badRequest(
      `Unknown module code${Object.keys(fields).length > 1 ? 's' : ''}: ${[...new Set(events.filter((e) => e.module && !byCode.has(e.module)).map((e) => e.module))].join(', ')}.`,
      fields,
    );
  return byCode;
}

function normalise(events: readonly AlarmEventInput[], modules: Map<string, number>): NormalEvent[] {
  return events.map((e) => {
    const decoded = e.alcd !== undefined ? decodeAlcd(e.alcd) : { set: e.set!, category: e.category ?? 0 };
    return {
      senderId: e.id,
      alarmKey: String(e.alarmId),
      set: decoded.set,
      category: decoded.category > 0 ? decoded.category : null,
      text: e.text ? e.text : null,
      moduleId: e.module ? modules.get(e.module)! : null,
      at: new Date(e.at),
    };
  });
}

/** Creates the definitions seen for the first time; never overwrites what a technician set. */
async function ensureDefinitions(deps: AppDeps, toolId: number, events: NormalEvent[], transaction: Transaction) {
  const first = new Map<string, NormalEvent>();
  for (const e of events) {
    const known = first.get(e.alarmKey);
    if (!known || (!known.text && e.text) || (known.category === null && e.category !== null))
      first.set(e.alarmKey, { ...e, text: known?.text ?? e.text, category: known?.category ?? e.category });
  }
  const list = [...first.values()];
  const known = await AlarmDefinition.findAll({ where: { toolId, alarmKey: list.map((e) => e.alarmKey) }, transaction });
  const byKey = new Map(known.map((d) => [d.alarmKey, d]));
  const missing = list.filter((e) => !byKey.has(e.alarmKey));
  if (missing.length) {
    // The tool's lock is held, so nobody else inserts these keys meanwhile.
    await deps.sequelize.query(
      `INSERT INTO alarm_definitions (tool_id, alarm_key, text, category, module_id, created_at, updated_at) VALUES ${missing.map(() => '(?, ?, ?, ?, ?, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))').join(', ')}`,
      { replacements: missing.flatMap((e) => [toolId, e.alarmKey, e.text ?? `Alarm ${e.alarmKey}`, e.category, e.moduleId]), transaction },
    );
    for (const d of await AlarmDefinition.findAll({ where: { toolId, alarmKey: missing.map((e) => e.alarmKey) }, transaction }))
      byKey.set(d.alarmKey, d);
  }
  // A category learnt later fills an empty one; the text stays as first seen (or as edited).
  for (const e of list) {
    const d = byKey.get(e.alarmKey)!;
    if (d.category === null && e.category !== null) await d.update({ category: e.category }, { transaction });
  }
  return byKey;
}

export interface IngestOutcome extends IngestAnswer {
  toolId: number;
}

/** POST /api/ingest/v1/alarms for the tool that owns the key. */
export async function ingestAlarmEvents(
  deps: AppDeps,
  toolId: number,
  input: readonly AlarmEventInput[],
  now = new Date(),
): Promise<IngestOutcome> {
  const modules = await resolveModules(deps, toolId, input);
  const events = normalise(input, modules);
  return ingestTransaction(deps, toolId, async (transaction) => {
    const settings = await lockToolSettings(toolId, transaction);
    // The same id twice — in earlier requests or within this one — is stored once.
    const ids = [...new Set(events.map((e) => e.senderId))];
    const existing = await deps.sequelize.query<{ senderId: string }>(
      `SELECT sender_id AS senderId FROM alarm_events WHERE tool_id = :toolId AND sender_id IN (:ids)`,
      {
        replacements: { toolId, ids },
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    const seen = new Set(existing.map((r) => r.senderId));
    const fresh: NormalEvent[] = [];
    for (const e of events) {
      if (seen.has(e.senderId)) continue;
      seen.add(e.senderId);
      fresh.push(e);
    }
    const duplicates = events.length - fresh.length;
    if (fresh.length === 0) return { accepted: 0, duplicates, toolId };

    const defs = await ensureDefinitions(deps, toolId, fresh, transaction);
    await insertEvents(
      deps,
      toolId,
      fresh.map((e) => ({ ...e, definitionId: defs.get(e.alarmKey)!.id, source: 'tool' as const, actorId: null })),
      now,
      transaction,
    );

    const created: NewOccurrence[] = [];
    const cleared: ClearedOccurrence[] = [];
    const byDefinition = new Map<number, NormalEvent[]>();
    for (const e of fresh) {
      const id = defs.get(e.alarmKey)!.id;
      byDefinition.set(id, [...(byDefinition.get(id) ?? []), e]);
    }
    for (const [definitionId, list] of byDefinition) {
      const from = new Date(Math.min(...list.map((e) => e.at.getTime())));
      const result = await rebuildOccurrences(deps, toolId, definitionId, from, transaction);
      const definition = [...defs.values()].find((d) => d.id === definitionId)!;
      created.push(...result.created.map((c) => ({ ...c, definition })));
      cleared.push(...result.cleared);
    }
    await applyRules(deps, { toolId, settings, created, cleared, now }, transaction);
    announceAlarmChange(deps, toolId, transaction);
    return { accepted: fresh.length, duplicates, toolId };
  });
}

export async function insertEvents(
  deps: AppDeps,
  toolId: number,
  rows: (NormalEvent & { definitionId: number; source: 'tool' | 'person'; actorId: number | null })[],
  now: Date,
  transaction: Transaction,
) {
  const placeholders = rows.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ');
  await deps.sequelize.query(
    `INSERT INTO alarm_events (tool_id, sender_id, definition_id, is_set, category, text, module_id, source, actor_id, at, received_at) VALUES ${placeholders}`,
    {
      replacements: rows.flatMap((e) => [
        toolId,
        e.senderId,
        e.definitionId,
        e.set,
        e.category,
        e.text,
        e.moduleId,
        e.source,
        e.actorId,
        e.at,
        now,
      ]),
      transaction,
    },
  );
}

/** A person clears an alarm by hand (for alarms that never send a clear). */
export async function clearByHand(deps: AppDeps, occurrenceId: number, actorId: number, now = new Date()) {
  const occurrence = await AlarmOccurrence.findByPk(occurrenceId);
  if (!occurrence) throw badRequest('That alarm was not found.', { id: ['Unknown alarm occurrence.'] });
  if (occurrence.clearedAt) return { id: occurrence.id, clearedAt: occurrence.clearedAt.toISOString() };
  return ingestTransaction(deps, occurrence.toolId, async (transaction) => {
    const settings = await lockToolSettings(occurrence.toolId, transaction);
    const at = now < occurrence.setAt ? occurrence.setAt : now;
    await insertEvents(
      deps,
      occurrence.toolId,
      [
        {
          senderId: `person:${crypto.randomUUID()}`,
          alarmKey: '',
          set: false,
          category: null,
          text: null,
          moduleId: occurrence.moduleId,
          at,
          definitionId: occurrence.definitionId,
          source: 'person',
          actorId,
        },
      ],
      now,
      transaction,
    );
    const result = await rebuildOccurrences(deps, occurrence.toolId, occurrence.definitionId, occurrence.setAt, transaction);
    await applyRules(
      deps,
      { toolId: occurrence.toolId, settings, created: [], cleared: result.cleared.map((c) => ({ ...c, actorId })), now },
      transaction,
    );
    announceAlarmChange(deps, occurrence.toolId, transaction);
    return { id: occurrence.id, clearedAt: at.toISOString() };
  });
}

export interface ClearedOccurrence {
  occurrence: AlarmOccurrence;
  /** The alarm is not set again after this clear (the ticket hears "alarm cleared"). */
  lastOfAlarm: boolean;
  actorId?: number | null;
}

interface Interval {
  setAt: Date;
  moduleId: number | null;
  clearedAt: Date | null;
  clearedBy: 'tool' | 'person' | null;
}

/**
 * Re-derives the intervals of one alarm from `from` on. Starting at the interval that holds
 * `from` (if any), the raw events are walked in time order: a set opens an interval unless
 * one is open, a clear closes the open one. Adding an event never lowers the number of
 * intervals, so existing rows are matched by position and keep their ids and ticket links.
 */
export async function rebuildOccurrences(deps: AppDeps, toolId: number, definitionId: number, from: Date, transaction: Transaction) {
  const anchor = await AlarmOccurrence.findOne({
    where: deps.sequelize.and(
      { definitionId },
      deps.sequelize.literal(
        `set_at <= ${deps.sequelize.escape(from)} AND (cleared_at IS NULL OR cleared_at >= ${deps.sequelize.escape(from)})`,
      ),
    ),
    order: [['setAt', 'DESC']],
    transaction,
  });
  const start = anchor ? anchor.setAt : from;
  const existing = await AlarmOccurrence.findAll({
    where: deps.sequelize.and({ definitionId }, deps.sequelize.literal(`set_at >= ${deps.sequelize.escape(start)}`)),
    order: [
      ['setAt', 'ASC'],
      ['id', 'ASC'],
    ],
    transaction,
  });
  const events = await deps.sequelize.query<{ isSet: number; at: Date; moduleId: number | null; source: 'tool' | 'person' }>(
    `SELECT is_set AS isSet, at, module_id AS moduleId, source FROM alarm_events WHERE definition_id = :definitionId AND at >= :start ORDER BY at, id`,
    { replacements: { definitionId, start }, type: QueryTypes.SELECT, transaction },
  );
  const intervals: Interval[] = [];
  let open: Interval | null = null;
  for (const e of events) {
    const at = new Date(e.at);
    if (Number(e.isSet)) {
      if (!open) open = { setAt: at, moduleId: e.moduleId === null ? null : Number(e.moduleId), clearedAt: null, clearedBy: null };
    } else if (open) {
      open.clearedAt = at;
      open.clearedBy = e.source;
      intervals.push(open);
      open = null;
    }
  }
  if (open) intervals.push(open);

  const created: { occurrence: AlarmOccurrence; last: boolean }[] = [];
  const cleared: ClearedOccurrence[] = [];
  for (let i = 0; i < intervals.length; i++) {
    const want = intervals[i];
    const row = existing[i];
    if (!row) {
      const occurrence = await AlarmOccurrence.create(
        {
          toolId,
          definitionId,
          moduleId: want.moduleId,
          setAt: want.setAt,
          clearedAt: want.clearedAt,
          clearedBy: want.clearedBy,
          ticketId: null,
        },
        { transaction },
      );
      created.push({ occurrence, last: i === intervals.length - 1 });
      continue;
    }
    const wasOpen = row.clearedAt === null;
    const changed =
      row.setAt.getTime() !== want.setAt.getTime() ||
      (row.clearedAt?.getTime() ?? null) !== (want.clearedAt?.getTime() ?? null) ||
      row.clearedBy !== want.clearedBy;
    if (changed)
      await row.update(
        { setAt: want.setAt, clearedAt: want.clearedAt, clearedBy: want.clearedBy, moduleId: want.moduleId },
        { transaction },
      );
    if (wasOpen && want.clearedAt) cleared.push({ occurrence: row, lastOfAlarm: i === intervals.length - 1 });
  }
  // Only possible if events were removed by hand: rows without an interval of their own.
  for (const row of existing.slice(intervals.length)) {
    if (row.ticketId === null) await row.destroy({ transaction });
  }
  return { created, cleared };
}
