import { QueryTypes } from 'sequelize';
import { AlarmCategoryRule, AlarmDefinition, AlarmToolSettings } from './alarms.model';
import { categoryRules, effectiveRule } from './rules.service';
import { ingestTransaction, lockToolSettings } from './ingest.service';
import { findToolIdByCode } from '../facility/tools.service';
import { badRequest, notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { ALARM_CATEGORY_LABELS, alarmLoad, isStale, ALARM_TARGETS } from '../../../shared/alarms';
import {
  DEFAULT_CATEGORY_RULES,
  ALARM_TEXT_MAX,
  type AlarmDefinitionView,
  type AlarmOccurrenceView,
  type AlarmRule,
  type TicketAlarmView,
  type ToolAlarmsView,
} from '../../../shared/schemas/alarms';
import { announceAlarmChange } from './announce';

// What people read about alarms (tool page, ticket page, analytics) and what technicians
// edit (definitions, rules, thresholds, CSV import).

interface OccurrenceRow {
  id: number;
  definitionId: number;
  alarmKey: string;
  text: string;
  category: number | null;
  moduleId: number | null;
  setAt: Date;
  clearedAt: Date | null;
  clearedBy: 'tool' | 'person' | null;
  ticketId: number | null;
  chattering: number;
}

const OCCURRENCE_COLUMNS = `o.id, o.definition_id AS definitionId, d.alarm_key AS alarmKey, d.text, d.category, o.module_id AS moduleId,
  o.set_at AS setAt, o.cleared_at AS clearedAt, o.cleared_by AS clearedBy, o.ticket_id AS ticketId, o.chattering`;

function presentOccurrence(r: OccurrenceRow, now: Date, chatteringNow: Set<number>): AlarmOccurrenceView {
  const setAt = new Date(r.setAt);
  return {
    id: Number(r.id),
    definitionId: Number(r.definitionId),
    alarmId: r.alarmKey,
    text: r.text,
    category: r.category === null ? null : Number(r.category),
    moduleId: r.moduleId === null ? null : Number(r.moduleId),
    setAt: setAt.toISOString(),
    clearedAt: r.clearedAt ? new Date(r.clearedAt).toISOString() : null,
    clearedBy: r.clearedBy,
    ticketId: r.ticketId === null ? null : Number(r.ticketId),
    chattering: Boolean(Number(r.chattering)) || (r.clearedAt === null && chatteringNow.has(Number(r.definitionId))),
    stale: r.clearedAt === null && isStale(setAt.getTime(), now.getTime()),
  };
}

async function chatteringDefinitions(deps: AppDeps, toolId: number) {
  const rows = await deps.sequelize.query<{ id: number }>(
    `SELECT id FROM alarm_definitions WHERE tool_id = :toolId AND chattering_since IS NOT NULL`,
    { replacements: { toolId }, type: QueryTypes.SELECT },
  );
  return new Set(rows.map((r) => Number(r.id)));
}

export async function getToolAlarms(
  deps: AppDeps,
  code: string,
  query: { days: number; limit: number; offset: number },
  now = new Date(),
): Promise<ToolAlarmsView & { chatteringAlarms: string[] }> {
  const toolId = await findToolIdByCode(code);
  const since = new Date(now.getTime() - query.days * 86_400_000);
  const [active, history, total, frequent, settings, chattering] = await Promise.all([
    deps.sequelize.query<OccurrenceRow>(
      `SELECT ${OCCURRENCE_COLUMNS} FROM alarm_occurrences o JOIN alarm_definitions d ON d.id = o.definition_id WHERE o.cleared_at IS NULL AND o.tool_id = :toolId ORDER BY o.set_at DESC LIMIT 100`,
      { replacements: { toolId }, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<OccurrenceRow>(
      `SELECT ${OCCURRENCE_COLUMNS} FROM alarm_occurrences o JOIN alarm_definitions d ON d.id = o.definition_id WHERE o.tool_id = :toolId AND o.set_at >= :since ORDER BY o.set_at DESC, o.id DESC LIMIT :limit OFFSET :offset`,
      { replacements: { toolId, since, limit: query.limit, offset: query.offset }, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM alarm_occurrences WHERE tool_id = :toolId AND set_at >= :since`, {
      replacements: { toolId, since },
      type: QueryTypes.SELECT,
    }),
    deps.sequelize.query<{ alarmKey: string; text: string; n: number }>(
      `SELECT d.alarm_key AS alarmKey, d.text, COUNT(*) AS n FROM alarm_occurrences o JOIN alarm_definitions d ON d.id = o.definition_id
        WHERE o.tool_id = :toolId AND o.set_at >= :since GROUP BY d.id ORDER BY n DESC, d.alarm_key LIMIT 5`,
      { replacements: { toolId, since }, type: QueryTypes.SELECT },
    ),
    AlarmToolSettings.findByPk(toolId),
    chatteringDefinitions(deps, toolId),
  ]);
  const defs = chattering.size ? await AlarmDefinition.findAll({ where: { id: [...chattering] }, attributes: ['alarmKey'] }) : [];
  return {
    toolId,
    active: active.map((r) => presentOccurrence(r, now, chattering)),
    history: history.map((r) => presentOccurrence(r, now, chattering)),
    historyTotal: Number(total[0].n),
    frequent: frequent.map((f) => ({ alarmId: f.alarmKey, text: f.text, count: Number(f.n) })),
    flood: settings?.floodStartedAt ? { since: settings.floodStartedAt.toISOString() } : null,
    settings: {
      defaultRule: settings?.defaultRule ?? null,
      chatterCount: settings?.chatterCount ?? 3,
      chatterWindowSeconds: settings?.chatterWindowS ?? 60,
    },
    chatteringAlarms: defs.map((d) => d.alarmKey),
  };
}

/** The alarm behind a ticket: how often it set on this tool in 90 days, and earlier tickets. */
export async function getTicketAlarm(deps: AppDeps, ticketId: number, now = new Date()): Promise<{ alarm: TicketAlarmView | null }> {
  const [linked] = await deps.sequelize.query<{ definitionId: number; n: number; first: Date; last: Date; active: number }>(
    `SELECT definition_id AS definitionId, COUNT(*) AS n, MIN(set_at) AS first, MAX(set_at) AS last, SUM(cleared_at IS NULL) AS active
       FROM alarm_occurrences WHERE ticket_id = :ticketId GROUP BY definition_id ORDER BY n DESC LIMIT 1`,
    { replacements: { ticketId }, type: QueryTypes.SELECT },
  );
  if (!linked) return { alarm: null };
  const def = await AlarmDefinition.findByPk(linked.definitionId);
  if (!def) return { alarm: null };
  const since = new Date(now.getTime() - 90 * 86_400_000);
  const [count, tickets, occurrences] = await Promise.all([
    deps.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM alarm_occurrences WHERE definition_id = :id AND set_at >= :since`, {
      replacements: { id: def.id, since },
      type: QueryTypes.SELECT,
    }),
    deps.sequelize.query<{ ticketId: number }>(
      `SELECT DISTINCT ticket_id AS ticketId FROM alarm_occurrences WHERE definition_id = :id AND set_at >= :since AND ticket_id IS NOT NULL AND ticket_id <> :ticketId ORDER BY ticket_id DESC LIMIT 50`,
      { replacements: { id: def.id, since, ticketId }, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ id: number; setAt: Date; clearedAt: Date | null; ticketId: number | null }>(
      `SELECT id, set_at AS setAt, cleared_at AS clearedAt, ticket_id AS ticketId FROM alarm_occurrences WHERE definition_id = :id AND set_at >= :since ORDER BY set_at DESC LIMIT 100`,
      { replacements: { id: def.id, since }, type: QueryTypes.SELECT },
    ),
  ]);
  return {
    alarm: {
      alarmId: def.alarmKey,
      text: def.text,
      category: def.category,
      definitionId: def.id,
      toolId: def.toolId,
      count: Number(linked.n),
      firstSetAt: new Date(linked.first).toISOString(),
      lastSetAt: new Date(linked.last).toISOString(),
      active: Number(linked.active) > 0,
      chattering: def.chatteringSince !== null,
      setsIn90Days: Number(count[0].n),
      earlierTickets: tickets.map((t) => Number(t.ticketId)),
      occurrences: occurrences.map((o) => ({
        id: Number(o.id),
        setAt: new Date(o.setAt).toISOString(),
        clearedAt: o.clearedAt ? new Date(o.clearedAt).toISOString() : null,
        ticketId: o.ticketId === null ? null : Number(o.ticketId),
      })),
    },
  };
}

// ---- Definitions and rules (technicians) ----------------------------------------------------

export async function listDefinitions(
  code: string,
  query: { limit: number; offset: number },
): Promise<{ items: AlarmDefinitionView[]; total: number }> {
  const toolId = await findToolIdByCode(code);
  const [settings, byCategory, { rows, count }] = await Promise.all([
    AlarmToolSettings.findByPk(toolId),
    categoryRules(),
    AlarmDefinition.findAndCountAll({ where: { toolId }, order: [['alarmKey', 'ASC']], limit: query.limit, offset: query.offset }),
  ]);
  return {
    items: rows.map((d) => ({
      id: d.id,
      alarmId: d.alarmKey,
      text: d.text,
      category: d.category,
      rule: d.rule,
      effectiveRule: effectiveRule(d, settings?.defaultRule ?? null, byCategory),
      moduleId: d.moduleId,
      chattering: d.chatteringSince !== null,
    })),
    total: count,
  };
}

export async function updateDefinition(
  deps: AppDeps,
  id: number,
  input: { text?: string; category?: number | null; rule?: AlarmRule | null; moduleId?: number | null },
) {
  const def = await AlarmDefinition.findByPk(id);
  if (!def) throw notFound('Alarm');
  if (input.moduleId) {
    const rows = await deps.sequelize.query(`SELECT id FROM modules WHERE id = :id AND tool_id = :toolId AND retired_at IS NULL`, {
      replacements: { id: input.moduleId, toolId: def.toolId },
      type: QueryTypes.SELECT,
    });
    if (!rows.length) throw badRequest('That module does not belong to this tool.', { moduleId: ['Unknown module for this tool.'] });
  }
  await def.update({
    ...(input.text !== undefined ? { text: input.text } : {}),
    ...(input.category !== undefined ? { category: input.category } : {}),
    ...(input.rule !== undefined ? { rule: input.rule } : {}),
    ...(input.moduleId !== undefined ? { moduleId: input.moduleId } : {}),
  });
  announceAlarmChange(deps, def.toolId);
  return { id: def.id, alarmId: def.alarmKey, text: def.text, category: def.category, rule: def.rule, moduleId: def.moduleId };
}

export async function updateToolSettings(
  deps: AppDeps,
  code: string,
  input: { defaultRule?: AlarmRule | null; chatterCount?: number; chatterWindowSeconds?: number },
) {
  const toolId = await findToolIdByCode(code);
  return ingestTransaction(deps, toolId, async (transaction) => {
    const s = await lockToolSettings(toolId, transaction);
    if (input.defaultRule !== undefined) s.defaultRule = input.defaultRule;
    if (input.chatterCount !== undefined) s.chatterCount = input.chatterCount;
    if (input.chatterWindowSeconds !== undefined) s.chatterWindowS = input.chatterWindowSeconds;
    await s.save({ transaction });
    return { defaultRule: s.defaultRule, chatterCount: s.chatterCount, chatterWindowSeconds: s.chatterWindowS };
  });
}

export async function listCategoryRules() {
  const rules = await categoryRules();
  return {
    items: Object.keys(ALARM_CATEGORY_LABELS).map((c) => ({
      category: Number(c),
      label: ALARM_CATEGORY_LABELS[Number(c)],
      rule: rules.get(Number(c)) ?? DEFAULT_CATEGORY_RULES[Number(c)],
    })),
  };
}

export async function setCategoryRule(category: number, rule: AlarmRule) {
  await AlarmCategoryRule.upsert({ category, rule });
  return { category, rule };
}

/** Splits one CSV line (RFC 4180 quoting: "a, b" and "" for a quote). */
function csvFields(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out.map((f) => f.trim());
}

/**
 * CSV with columns alarm ID, text, category (a header line is recognised and skipped). All
 * lines are checked first; one bad line refuses the whole file with its line numbers.
 */
export async function importDefinitionsCsv(deps: AppDeps, code: string, csv: string) {
  const toolId = await findToolIdByCode(code);
  const lines = csv
    .split(/\r?\n/)
    .map((l, i) => ({ n: i + 1, l }))
    .filter((x) => x.l.trim() !== '');
  if (lines.length && /^\s*"?alarm/i.test(lines[0].l)) lines.shift();
  const fields: Record<string, string[]> = {};
  const rows: { alarmKey: string; text: string; category: number | null }[] = [];
  for (const { n, l } of lines) {
    const [id, text, category] = csvFields(l);
    const problems: string[] = [];
    if (!id || id.length > 64) problems.push('The alarm ID must be 1–64 characters.');
    if (!text || text.length > ALARM_TEXT_MAX) problems.push(`The text must be 1–${ALARM_TEXT_MAX} characters.`);
    const cat = category === undefined || category === '' ? null : Number(category);
    if (cat !== null && !(Number.isInteger(cat) && cat >= 0 && cat <= 8)) problems.push('The category must be 0–8 or empty.');
    if (problems.length) fields[`csv.line${n}`] = problems;
    else rows.push({ alarmKey: id, text, category: cat === 0 ? null : cat });
  }
  if (Object.keys(fields).length) throw badRequest('Some lines of the CSV need attention; nothing was imported.', fields);
  if (rows.length === 0) throw badRequest('The CSV has no alarm lines.', { csv: ['Give at least one line: alarm ID, text, category.'] });
  if (rows.length > 5000) throw badRequest('Import at most 5000 alarms at a time.', { csv: ['Too many lines.'] });
  await deps.sequelize.transaction(async (transaction) => {
    for (let i = 0; i < rows.length; i += 500) {
      const chunk = rows.slice(i, i + 500);
      await deps.sequelize.query(
        `INSERT INTO alarm_definitions (tool_id, alarm_key, text, category, created_at, updated_at) VALUES ${chunk.map(() => '(?, ?, ?, ?, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))').join(', ')}
         ON DUPLICATE KEY UPDATE text = VALUES(text), category = VALUES(category), updated_at = VALUES(updated_at)`,
        { replacements: chunk.flatMap((r) => [toolId, r.alarmKey, r.text, r.category]), transaction },
      );
    }
  });
  return { imported: rows.length };
}

// ---- Analytics (managers) ----------------------------------------------------------------

export interface AlarmLoadFigures {
  toolId: number | null;
  toolCode: string | null;
  toolName: string | null;
  count: number;
  perDay: number;
  per10Min: number;
  floodPct: number;
  floodPeriods: number;
  periods: number;
  chattering: number;
  stale: number;
  topTenSharePct: number;
}

/** Alarm load per tool and for the facility over [from, to), against the common-practice targets. */
export async function getAlarmLoad(deps: AppDeps, query: { from?: string; to?: string; toolId?: number }, now = new Date()) {
  const to = query.to ? new Date(query.to) : now;
  const from = query.from ? new Date(query.from) : new Date(to.getTime() - 30 * 86_400_000);
  if (!(from < to)) throw badRequest('The period must start before it ends.', { from: ['Start before the end.'] });
  if (to.getTime() - from.getTime() > 400 * 86_400_000)
    throw badRequest('Choose at most about a year.', { from: ['The period is too long.'] });
  const toolFilter = query.toolId ? 'AND o.tool_id = :toolId' : '';
  const replacements = { from, to, now, toolId: query.toolId ?? null };
  const [sets, chattering, stale, top, tools] = await Promise.all([
    deps.sequelize.query<{ toolId: number; setAt: Date }>(
      `SELECT o.tool_id AS toolId, o.set_at AS setAt FROM alarm_occurrences o WHERE o.set_at >= :from AND o.set_at < :to ${toolFilter}`,
      { replacements, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ toolId: number; n: number }>(
      `SELECT o.tool_id AS toolId, COUNT(DISTINCT o.definition_id) AS n FROM alarm_occurrences o WHERE o.chattering = 1 AND o.set_at >= :from AND o.set_at < :to ${toolFilter} GROUP BY o.tool_id`,
      { replacements, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ toolId: number; n: number }>(
      `SELECT o.tool_id AS toolId, COUNT(*) AS n FROM alarm_occurrences o WHERE o.set_at < :to AND TIMESTAMPDIFF(SECOND, o.set_at, COALESCE(o.cleared_at, :now)) > 86400 AND (o.cleared_at IS NULL OR o.cleared_at >= :from) ${toolFilter} GROUP BY o.tool_id`,
      { replacements, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ toolId: number; alarmKey: string; text: string; n: number; toolCode: string }>(
      `SELECT o.tool_id AS toolId, d.alarm_key AS alarmKey, d.text, t.code AS toolCode, COUNT(*) AS n FROM alarm_occurrences o JOIN alarm_definitions d ON d.id = o.definition_id JOIN tools t ON t.id = o.tool_id
        WHERE o.set_at >= :from AND o.set_at < :to ${toolFilter} GROUP BY o.definition_id ORDER BY n DESC LIMIT 10`,
      { replacements, type: QueryTypes.SELECT },
    ),
    deps.sequelize.query<{ id: number; code: string; name: string }>(
      `SELECT id, code, name FROM tools WHERE retired_at IS NULL ${query.toolId ? 'AND id = :toolId' : ''} ORDER BY name`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const byTool = new Map<number, number[]>();
  for (const s of sets) {
    const list = byTool.get(Number(s.toolId)) ?? [];
    list.push(new Date(s.setAt).getTime());
    byTool.set(Number(s.toolId), list);
  }
  const chatterBy = new Map(chattering.map((c) => [Number(c.toolId), Number(c.n)]));
  const staleBy = new Map(stale.map((c) => [Number(c.toolId), Number(c.n)]));
  const topShare = async (toolId: number, total: number) => {
    if (total === 0) return 0;
    const rows = await deps.sequelize.query<{ n: number }>(
      `SELECT COUNT(*) AS n FROM alarm_occurrences WHERE tool_id = :toolId AND set_at >= :from AND set_at < :to GROUP BY definition_id ORDER BY n DESC LIMIT 10`,
      { replacements: { toolId, from, to }, type: QueryTypes.SELECT },
    );
    return (rows.reduce((a, r) => a + Number(r.n), 0) / total) * 100;
  };
  const figures = (
    toolId: number | null,
    times: number[],
    chatter: number,
    staleCount: number,
    topTenSharePct: number,
    tool?: { code: string; name: string },
  ): AlarmLoadFigures => {
    const load = alarmLoad(times, from.getTime(), to.getTime());
    return {
      toolId,
      toolCode: tool?.code ?? null,
      toolName: tool?.name ?? null,
      count: load.count,
      perDay: load.perDay,
      per10Min: load.per10Min,
      floodPct: load.floodPct,
      floodPeriods: load.floodPeriods,
      periods: load.periods,
      chattering: chatter,
      stale: staleCount,
      topTenSharePct,
    };
  };
  const perTool: AlarmLoadFigures[] = [];
  for (const t of tools) {
    const times = byTool.get(Number(t.id)) ?? [];
    if (times.length === 0 && !staleBy.get(Number(t.id))) continue;
    perTool.push(
      figures(
        Number(t.id),
        times,
        chatterBy.get(Number(t.id)) ?? 0,
        staleBy.get(Number(t.id)) ?? 0,
        await topShare(Number(t.id), times.length),
        t,
      ),
    );
  }
  perTool.sort((a, b) => b.count - a.count);
  const all = sets.map((s) => new Date(s.setAt).getTime());
  const topTotal = top.reduce((a, r) => a + Number(r.n), 0);
  const facility = figures(
    null,
    all,
    [...chatterBy.values()].reduce((a, b) => a + b, 0),
    [...staleBy.values()].reduce((a, b) => a + b, 0),
    all.length ? (topTotal / all.length) * 100 : 0,
  );
  return {
    from: from.toISOString(),
    to: to.toISOString(),
    facility,
    tools: perTool.slice(0, 100),
    topTen: top.map((r) => ({
      toolCode: r.toolCode,
      alarmId: r.alarmKey,
      text: r.text,
      count: Number(r.n),
      sharePct: all.length ? (Number(r.n) / all.length) * 100 : 0,
    })),
    targets: ALARM_TARGETS,
  };
}
