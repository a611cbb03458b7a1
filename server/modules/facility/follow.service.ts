import crypto from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { Tool, ToolFollow, ToolModule } from './facility.model';
import { AppError, notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { queueMail, type MailMessage } from '../../lib/mailer';
import { createNotices } from '../notices/notices.service';
import { onStateChanged, type StateChangeResult } from './state.service';
import { loadBoardTools } from './board.service';
import { BOARD_LABELS, E10_LABELS, REASON_LABELS, boardStatusOf, type E10State, type StateReason } from '../../../shared/equipment-state';

// "Tell me when it's back": a follower hears of every state change of the tool (or one of
// its modules) by e-mail and as an in-app notice, both written in the transaction of the
// change, so a change that rolls back tells nobody.

/** 32 random bytes as base64url: 43 characters, unguessable, one per follow. */
export const newUnfollowToken = () => crypto.randomBytes(32).toString('base64url');

export async function followTool(deps: AppDeps, userId: number, toolId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const tool = await Tool.findByPk(toolId, { transaction, attributes: ['id', 'retiredAt'] });
    if (!tool) throw notFound('Tool');
    if (tool.retiredAt) throw new AppError(409, 'tool_retired', 'This tool is retired; there is nothing more to follow.');
    // Following twice is following once: the first token stays valid.
    await deps.sequelize.query(
      `INSERT INTO tool_follows (user_id, tool_id, unfollow_token, created_at) VALUES (:userId, :toolId, :token, :now)
       ON DUPLICATE KEY UPDATE user_id = user_id`,
      { replacements: { userId, toolId, token: newUnfollowToken(), now: new Date() }, transaction },
    );
    return { following: true };
  });
}

/** "Tools I follow": the person's followed tools as board entries, by name. */
export async function listFollowedTools(deps: AppDeps, userId: number) {
  const follows = await ToolFollow.findAll({ where: { userId }, attributes: ['toolId'], limit: 500 });
  if (follows.length === 0) return { items: [] };
  const tools = await loadBoardTools(deps.sequelize, { toolIds: follows.map((f) => f.toolId), includeRetired: false });
  return { items: tools.sort((a, b) => a.name.localeCompare(b.name)) };
}

/** Who follows the tool (ids only; the users module says who they are). */
export async function toolFollowerIds(toolId: number, transaction?: Transaction): Promise<number[]> {
  const rows = await ToolFollow.findAll({ where: { toolId }, attributes: ['userId'], transaction });
  return rows.map((f) => f.userId);
}

export async function unfollowTool(userId: number, toolId: number) {
  if (!(await Tool.findByPk(toolId, { attributes: ['id'] }))) throw notFound('Tool');
  await ToolFollow.destroy({ where: { userId, toolId } });
  return { following: false };
}

/** The link in the e-mail: whoever holds the token may stop that one follow, signed in or not. */
export async function unfollowByToken(token: string) {
  const follow = await ToolFollow.findOne({ where: { unfollowToken: token } });
  if (!follow)
    throw new AppError(404, 'unfollow_link_unknown', 'This link is not valid any more. You may have stopped following the tool already.');
  const tool = await Tool.findByPk(follow.toolId, { attributes: ['id', 'code', 'name'] });
  await ToolFollow.destroy({ where: { userId: follow.userId, toolId: follow.toolId } });
  return { tool: tool ? { id: tool.id, code: tool.code, name: tool.name } : null };
}

const RUNNING: readonly E10State[] = ['productive', 'standby'];

/**
 * Followers hear when the board's word for the tool changes (Down → Running, Running →
 * Limited…). Productive ↔ standby is the tool going busy or idle, and a Down whose reason
 * moves from repair to waiting is still Down: telling followers of those would bury the
 * changes they care about ("changed from Down to Down").
 */
export function isWorthTelling(change: StateChangeResult): boolean {
  const { previous, current } = change;
  if (!previous) return false;
  const sameWord = boardStatusOf(previous.state) === boardStatusOf(current.state);
  const sameRestriction = (previous.restriction ?? null) === (current.restriction ?? null);
  return !(sameWord && (sameRestriction || !RUNNING.includes(current.state)));
}

interface Follower {
  userId: number;
  token: string;
  email: string;
  name: string;
}

/**
 * A change made by a ticket is told to that ticket's reporters by the ticket's own notices
 * (acknowledged, fixed and back in service…); a reporter who also follows the tool is not
 * told a second time.
 */
const TICKET_PEOPLE_EXCLUDED = `AND f.user_id NOT IN (
  SELECT t.reporter_id FROM tickets t WHERE (t.id = :ticketId OR t.merged_into_id = :ticketId) AND t.reporter_id IS NOT NULL
  UNION SELECT e.actor_id FROM ticket_events e JOIN tickets t ON t.id = e.ticket_id
   WHERE (t.id = :ticketId OR t.merged_into_id = :ticketId) AND e.kind = 'added_report' AND e.actor_id IS NOT NULL)`;

function formatTime(d: Date, timeZone: string) {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(d) + ` (${timeZone})`;
}

async function notifyFollowers(change: StateChangeResult, transaction: Transaction, deps: AppDeps) {
  if (!isWorthTelling(change)) return;
  const { current, previous } = change;
  const followers = await deps.sequelize.query<Follower>(
    `SELECT f.user_id AS userId, f.unfollow_token AS token, u.email, u.name
       FROM tool_follows f JOIN users u ON u.id = f.user_id
      WHERE f.tool_id = :toolId AND u.active = 1 ${current.setById ? 'AND f.user_id <> :actorId' : ''}
        ${current.ticketId ? TICKET_PEOPLE_EXCLUDED : ''}`,
    {
      type: QueryTypes.SELECT,
      replacements: { toolId: current.toolId, actorId: current.setById, ticketId: current.ticketId },
      transaction,
    },
  );
  if (followers.length === 0) return;

  const [tool] = await loadBoardTools(deps.sequelize, { toolIds: [current.toolId], includeRetired: true }, transaction);
  const mod = current.moduleId ? await ToolModule.findByPk(current.moduleId, { transaction, attributes: ['name'] }) : null;
  const { config } = deps;
  const subjectOf = mod ? `${mod.name} of ${tool.name}` : tool.name;
  const toWord = BOARD_LABELS[boardStatusOf(current.state)];
  const fromWord = previous ? BOARD_LABELS[boardStatusOf(previous.state)] : null;
  const title = `${subjectOf} (${tool.code}) is now ${toWord}`;
  const link = `/tools/${encodeURIComponent(tool.code)}`;

  const lines = [
    `${subjectOf} changed ${fromWord ? `from ${fromWord} ` : ''}to ${toWord} (${E10_LABELS[current.state]}) at ${formatTime(current.startedAt, config.FACILITY_TIME_ZONE)}.`,
    mod ? `The tool as a whole now reads: ${BOARD_LABELS[tool.status]}.` : null,
    current.reason !== 'none' ? `Reason: ${REASON_LABELS[current.reason as StateReason]}.` : null,
    current.note ? `Note: ${current.note}` : null,
    current.restriction ? `Restriction in force: ${current.restriction}` : null,
    current.expectedReturnAt ? `Expected back: ${formatTime(current.expectedReturnAt, config.FACILITY_TIME_ZONE)}.` : null,
  ].filter((l): l is string => Boolean(l));

  const mails: MailMessage[] = followers.map((f) => ({
    to: f.email,
    subject: `Faultline: ${title}`,
    text: [
      `Hello ${f.name},`,
      '',
      ...lines,
      '',
      `See the tool: ${config.publicUrl}${link}`,
      '',
      `You get this because you follow ${tool.name}. To stop, open: ${config.publicUrl}/unfollow/${f.token}`,
    ].join('\n'),
  }));
  await queueMail(mails, transaction);
  // "It's back" is worth waking a phone for; other changes wait in the app and the mail.
  const back = boardStatusOf(current.state) === 'running' && !current.moduleId;
  await createNotices(
    deps,
    followers.map((f) => f.userId),
    { kind: 'tool_state', title, body: lines.slice(0, 4).join(' '), link, push: back },
    transaction,
  );
}

onStateChanged(notifyFollowers);
