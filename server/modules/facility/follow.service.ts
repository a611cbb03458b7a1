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
 * Productive ↔ standby is the tool going busy or idle; both read Running, and telling
 * followers of every wafer lot would bury the changes they care about.
 */
export function isWorthTelling(change: StateChangeResult): boolean {
  const { previous, current } = change;
  if (!previous) return false;
  const quietFlip =
    RUNNING.includes(previous.state) && RUNNING.includes(current.state) && (previous.restriction ?? null) === (current.restriction ?? null);
  return !quietFlip;
}

interface Follower {
  userId: number;
  token: string;
  email: string;
  name: string;
}

function formatTime(d: Date, timeZone: string) {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(d) + ` (${timeZone})`;
}

async function notifyFollowers(change: StateChangeResult, transaction: Transaction, deps: AppDeps) {
  if (!isWorthTelling(change)) return;
  const { current, previous } = change;
  const followers = await deps.sequelize.query<Follower>(
    `SELECT f.user_id AS userId, f.unfollow_token AS token, u.email, u.name
       FROM tool_follows f JOIN users u ON u.id = f.user_id
      WHERE f.tool_id = :toolId AND u.active = 1 ${current.setById ? 'AND f.user_id <> :actorId' : ''}`,
    { type: QueryTypes.SELECT, replacements: { toolId: current.toolId, actorId: current.setById }, transaction },
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
  await createNotices(
    deps,
    followers.map((f) => f.userId),
    { kind: 'tool_state', title, body: lines.slice(0, 4).join(' '), link },
    transaction,
  );
}

onStateChanged(notifyFollowers);
