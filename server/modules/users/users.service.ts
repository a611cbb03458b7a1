import { Op, type WhereOptions } from 'sequelize';
import { User } from './user.model';
import { createAccountLink, LINK_LIFETIME_MS } from '../auth/account-links.service';
import { endAllSessions } from '../auth/sessions.service';
import { likePattern } from '../../lib/like-pattern';
import { queueMail } from '../../lib/mailer';
import { disconnectUser } from '../../lib/realtime';
import { notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { allowedUserActions, authorizeUserUpdate } from './user.policy';
import type { InviteUserInput, UpdateUserInput } from '../../../shared/schemas/users';
import type { Role } from '../../../shared/roles';

export function presentUser(u: User, viewer: AuthUser) {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    onCall: u.onCall,
    invited: !u.passwordHash,
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    createdAt: u.createdAt.toISOString(),
    allowedActions: allowedUserActions(viewer, u),
  };
}

export async function listUsers(viewer: AuthUser, query: { q?: string; role?: Role; limit: number; offset: number }) {
  const where: WhereOptions<User> = {};
  if (query.role) Object.assign(where, { role: query.role });
  if (query.q)
    Object.assign(where, { [Op.or]: [{ name: { [Op.like]: likePattern(query.q) } }, { email: { [Op.like]: likePattern(query.q) } }] });
  const { rows, count } = await User.findAndCountAll({ where, order: [['name', 'ASC']], limit: query.limit, offset: query.offset });
  return { items: rows.map((u) => presentUser(u, viewer)), total: count };
}

/** Creates the account without a password and e-mails a link to choose one (valid 7 days). */
export async function inviteUser(deps: AppDeps, input: InviteUserInput, invitedBy: AuthUser) {
  return deps.sequelize.transaction(async (transaction) => {
    const user = await User.create(
      {
        email: input.email.toLowerCase(),
        name: input.name,
        role: input.role,
        onCall: input.onCall ?? false,
        passwordHash: null,
        lastSignInAt: null,
      },
      { transaction },
    );
    const token = await createAccountLink(user.id, 'invite', transaction);
    await queueMail(
      {
        to: user.email,
        subject: 'You are invited to Faultline',
        text: `Hello ${user.name},\n\n${invitedBy.name} invited you to Faultline, the fault and maintenance desk of the cleanroom.\nChoose your password here (the link works once, for ${LINK_LIFETIME_MS.invite / 86_400_000} days):\n\n${deps.config.publicUrl}/reset-password/${token}\n`,
      },
      transaction,
    );
    return presentUser(user, invitedBy);
  });
}

/** Changes a user; disabling ends every session and socket of that user at once. */
export async function updateUser(deps: AppDeps, id: number, input: UpdateUserInput, actor: AuthUser) {
  const user = await User.findByPk(id);
  if (!user) throw notFound('User');
  authorizeUserUpdate(actor, user, input);
  await deps.sequelize.transaction(async (transaction) => {
    await user.update(input, { transaction });
    if (input.active === false || input.role) await endAllSessions(id, transaction);
  });
  if (input.active === false || input.role) disconnectUser(id);
  return presentUser(user, actor);
}
