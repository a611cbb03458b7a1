import { Op, QueryTypes, type Transaction } from 'sequelize';
import { AlarmCategoryRule, AlarmDefinition, AlarmOccurrence, type AlarmToolSettings } from './alarms.model';
import type { ClearedOccurrence } from './ingest.service';
import type { AppDeps } from '../../lib/http';
import {
  openAlarmTicket,
  openTicketIds,
  recordAlarmCleared,
  recordAlarmRepeats,
  tellToolEngineers,
} from '../tickets/alarm-tickets.service';
import { ALARM_CATEGORY_LABELS, FLOOD_PERIOD_MS, FLOOD_THRESHOLD, SAFETY_CATEGORIES, isChattering } from '../../../shared/alarms';
import { DEFAULT_CATEGORY_RULES, type AlarmRule } from '../../../shared/schemas/alarms';

// What happens when alarms set: the rule of each alarm (record, tell the engineers, open a
// ticket, open a ticket and put the tool Down), and the quiet-by-design practice of alarm
// management — repeats fold into the open ticket, a chattering alarm and a flood hold their
// notifications back. Safety alarms are never held back.

export interface NewOccurrence {
  occurrence: AlarmOccurrence;
  definition: AlarmDefinition;
  /** The latest interval of its alarm (so a clear in it means the alarm is clear now). */
  last: boolean;
}

/** Alarms older than this that arrive already cleared are history: recorded, nobody is told. */
export const LATE_HISTORY_MS = 60 * 60_000;
/** A "tell the engineers" alarm mails once, then stays quiet for this long if it repeats. */
export const NOTIFY_FOLD_MS = 10 * 60_000;

export async function categoryRules(transaction?: Transaction): Promise<Map<number, AlarmRule>> {
  const rows = await AlarmCategoryRule.findAll({ transaction });
  return new Map(rows.map((r) => [Number(r.category), r.rule]));
}

export const isSafety = (category: number | null) => category !== null && SAFETY_CATEGORIES.includes(category);

/**
 * The rule of an alarm: its own, else the tool's default, else the facility's for its
 * category. Safety categories skip the tool-wide default: only a rule set on that very alarm
 * (a deliberate choice) can make a safety alarm quieter than the facility says.
 */
export function effectiveRule(
  def: Pick<AlarmDefinition, 'rule' | 'category'>,
  toolDefault: AlarmRule | null,
  byCategory: Map<number, AlarmRule>,
): AlarmRule {
  if (def.rule) return def.rule;
  const category = def.category ?? 0;
  const facility = byCategory.get(category) ?? DEFAULT_CATEGORY_RULES[category] ?? 'record';
  if (isSafety(def.category)) return facility;
  return toolDefault ?? facility;
}

interface RuleInput {
  toolId: number;
  settings: AlarmToolSettings;
  created: NewOccurrence[];
  cleared: ClearedOccurrence[];
  now: Date;
}

async function setTimes(deps: AppDeps, where: string, replacements: Record<string, unknown>, transaction: Transaction) {
  const rows = await deps.sequelize.query<{ setAt: Date }>(`SELECT set_at AS setAt FROM alarm_occurrences WHERE ${where}`, {
    replacements,
    type: QueryTypes.SELECT,
    transaction,
  });
  return rows.map((r) => new Date(r.setAt).getTime());
}

export async function applyRules(deps: AppDeps, input: RuleInput, transaction: Transaction) {
  const { toolId, settings, now } = input;
  const created = [...input.created].sort((a, b) => a.occurrence.setAt.getTime() - b.occurrence.setAt.getTime());
  const definitions = new Map(created.map((c) => [c.definition.id, c.definition]));

  // Chattering: judged per alarm over the new sets and their neighbours within the window.
  const windowMs = settings.chatterWindowS * 1000;
  for (const def of definitions.values()) {
    const mine = created.filter((c) => c.definition.id === def.id);
    const first = mine[0].occurrence.setAt.getTime();
    const last = mine[mine.length - 1].occurrence.setAt.getTime();
    const times = await setTimes(
      deps,
      'definition_id = :id AND set_at BETWEEN :from AND :to',
      { id: def.id, from: new Date(first - windowMs), to: new Date(last + windowMs) },
      transaction,
    );
    if (isChattering(times, { count: settings.chatterCount, windowMs })) {
      if (!def.chatteringSince) def.chatteringSince = new Date(Math.min(...times));
      for (const c of mine) c.occurrence.chattering = true;
      // The earlier sets that make up the chatter carry the mark too (tool page, analytics).
      await deps.sequelize.query(
        `UPDATE alarm_occurrences SET chattering = 1 WHERE definition_id = :id AND set_at BETWEEN :from AND :to AND chattering = 0`,
        {
          replacements: { id: def.id, from: new Date(first - windowMs), to: new Date(last + windowMs) },
          transaction,
        },
      );
    }
  }

  // Flood: more than 10 alarms from this tool in the 10 minutes up to its latest new set.
  let inFlood = false;
  if (created.length) {
    const latest = created[created.length - 1].occurrence.setAt;
    if (latest.getTime() > now.getTime() - FLOOD_PERIOD_MS) {
      const [row] = await deps.sequelize.query<{ n: number }>(
        `SELECT COUNT(*) AS n FROM alarm_occurrences WHERE tool_id = :toolId AND set_at > :from AND set_at <= :to`,
        {
          replacements: { toolId, from: new Date(latest.getTime() - FLOOD_PERIOD_MS), to: latest },
          type: QueryTypes.SELECT,
          transaction,
        },
      );
      const n = Number(row.n);
      if (n > FLOOD_THRESHOLD) {
        inFlood = true;
        if (!settings.floodStartedAt) {
          settings.floodStartedAt = latest;
          await tellToolEngineers(
            deps,
            {
              toolId,
              kind: 'alarm.flood',
              title: `Alarm flood on the tool: ${n} alarms in 10 minutes`,
              text: [
                `The tool has raised ${n} alarms in the last 10 minutes (more than ${FLOOD_THRESHOLD} is a flood).`,
                'Faultline keeps recording every alarm, but sends no notice per alarm until the flood has passed; this is the one notice for it.',
                'Safety alarms are still passed on at once.',
              ].join('\n'),
            },
            transaction,
          );
        }
      } else if (settings.floodStartedAt) {
        settings.floodStartedAt = null;
      }
    }
  }

  const byCategory = await categoryRules(transaction);
  const foldInto = new Map<number, number | null>(); // definition id → open ticket id (null: none)
  const repeats = new Map<number, { def: AlarmDefinition; lastAt: Date }>();
  const clearNotes = new Map<number, { alarmId: string; at: Date; by: 'tool' | 'person'; actorId: number | null }>();

  for (const { occurrence: o, definition: def, last } of created) {
    const rule = effectiveRule(def, settings.defaultRule, byCategory);
    const safety = isSafety(def.category);
    const recent = o.clearedAt === null || o.setAt.getTime() > now.getTime() - LATE_HISTORY_MS;
    const held = !safety && (def.chatteringSince !== null || inFlood);

    if (!foldInto.has(def.id)) foldInto.set(def.id, await openTicketOf(def.id, o.id, transaction));
    const openTicket = foldInto.get(def.id) ?? null;
    if (openTicket) {
      o.ticketId = openTicket;
      repeats.set(openTicket, { def, lastAt: o.setAt });
    } else if ((rule === 'ticket' || rule === 'ticket_down') && (recent || safety)) {
      const { ticketId } = await openAlarmTicket(
        deps,
        {
          toolId,
          moduleId: o.moduleId ?? def.moduleId,
          alarmId: def.alarmKey,
          alarmText: def.text,
          category: def.category,
          setAt: o.setAt,
          safety,
          takeDown: rule === 'ticket_down',
          notify: !held,
        },
        transaction,
      );
      o.ticketId = ticketId;
      foldInto.set(def.id, ticketId);
    } else if (rule === 'notify' && recent) {
      const folded = def.lastNotifiedAt !== null && now.getTime() - def.lastNotifiedAt.getTime() < NOTIFY_FOLD_MS;
      if (held || folded) {
        def.heldCount += 1;
      } else {
        await tellToolEngineers(
          deps,
          {
            toolId,
            kind: safety ? 'alarm.safety' : 'alarm.set',
            title: `${safety ? 'Safety alarm' : 'Alarm'} ${def.alarmKey}: ${def.text}`,
            text: [
              `The tool reported alarm ${def.alarmKey} at ${o.setAt.toISOString()}: ${def.text}`,
              def.category ? `Category: ${ALARM_CATEGORY_LABELS[def.category]}.` : null,
              'No ticket was opened (the rule for this alarm is to tell the engineers).',
            ]
              .filter(Boolean)
              .join('\n'),
            onCall: safety,
          },
          transaction,
        );
        def.lastNotifiedAt = now;
      }
    }
    if (o.ticketId && o.clearedAt && last)
      clearNotes.set(o.ticketId, { alarmId: def.alarmKey, at: o.clearedAt, by: o.clearedBy ?? 'tool', actorId: null });
    if (o.changed()) await o.save({ transaction });
  }

  for (const [ticketId, { def, lastAt }] of repeats) {
    const [row] = await deps.sequelize.query<{ n: number; since: Date }>(
      `SELECT COUNT(*) AS n, MIN(set_at) AS since FROM alarm_occurrences WHERE ticket_id = :ticketId`,
      {
        replacements: { ticketId },
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    await recordAlarmRepeats(
      deps,
      ticketId,
      { alarmId: def.alarmKey, count: Number(row.n), since: new Date(row.since), lastAt, chattering: def.chatteringSince !== null },
      transaction,
    );
  }
  const clearedDefs = input.cleared.map((c) => c.occurrence.definitionId).filter((id) => !definitions.has(id));
  if (clearedDefs.length)
    for (const d of await AlarmDefinition.findAll({ where: { id: clearedDefs }, transaction })) definitions.set(d.id, d);
  for (const c of input.cleared) {
    if (c.occurrence.ticketId && c.lastOfAlarm) {
      const def = definitions.get(c.occurrence.definitionId);
      clearNotes.set(c.occurrence.ticketId, {
        alarmId: def?.alarmKey ?? String(c.occurrence.definitionId),
        at: c.occurrence.clearedAt!,
        by: c.occurrence.clearedBy ?? 'tool',
        actorId: c.actorId ?? null,
      });
    }
  }
  for (const [ticketId, note] of clearNotes) await recordAlarmCleared(deps, ticketId, note, transaction);

  for (const def of definitions.values()) if (def.changed()) await def.save({ transaction });
  if (settings.changed()) await settings.save({ transaction });
}

/** The open ticket that this alarm's earlier sets went to, if it is still open. */
async function openTicketOf(definitionId: number, exceptId: number, transaction: Transaction): Promise<number | null> {
  const prior = await AlarmOccurrence.findOne({
    where: { definitionId, ticketId: { [Op.ne]: null }, id: { [Op.ne]: exceptId } },
    order: [['setAt', 'DESC']],
    attributes: ['ticketId'],
    transaction,
  });
  if (!prior?.ticketId) return null;
  const open = await openTicketIds([prior.ticketId], transaction);
  return open.has(prior.ticketId) ? prior.ticketId : null;
}
