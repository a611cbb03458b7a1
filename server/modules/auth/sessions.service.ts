import type { Transaction } from 'sequelize';
import { SessionRow } from './session.model';

/** Ends every session of a user (disabling an account, changing a role, resetting a password). */
export async function endAllSessions(userId: number, transaction?: Transaction) {
  await SessionRow.destroy({ where: { userId }, transaction });
}
