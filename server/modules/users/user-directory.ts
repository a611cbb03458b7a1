import { Op, type Transaction } from 'sequelize';
import { User } from './user.model';
import { likePattern } from '../../lib/like-pattern';
import type { Role } from '../../../shared/roles';

// What other modules may ask of the users module: who someone is, who is staff or on call,
// and the account fields auth works with. They get plain objects, never the models.

export interface Person {
  id: number;
  name: string;
  email: string;
  role: Role;
}

export interface Account extends Person {
  active: boolean;
  passwordHash: string | null;
}

const PERSON = ['id', 'name', 'email', 'role'] as const;
const person = (u: User): Person => ({ id: u.id, name: u.name, email: u.email, role: u.role });
// Technicians, managers and admins (roles above member, see shared/roles.ts).
const STAFF = { [Op.ne]: 'member' };

export async function findAccountByEmail(email: string, transaction?: Transaction): Promise<Account | null> {
  const u = await User.findOne({ where: { email: email.toLowerCase() }, transaction });
  return u ? { ...person(u), active: u.active, passwordHash: u.passwordHash } : null;
}

export async function findAccountById(id: number): Promise<Account | null> {
  const u = await User.findByPk(id);
  return u ? { ...person(u), active: u.active, passwordHash: u.passwordHash } : null;
}

export async function recordSignIn(userId: number, at: Date) {
  await User.update({ lastSignInAt: at }, { where: { id: userId } });
}

/** People by id, any state (names on old records stay readable after someone leaves). */
export async function peopleByIds(ids: readonly (number | null | undefined)[], transaction?: Transaction): Promise<Map<number, Person>> {
  const wanted = [...new Set(ids.filter((id): id is number => typeof id === 'number'))];
  if (wanted.length === 0) return new Map();
  const rows = await User.findAll({ where: { id: wanted }, attributes: [...PERSON], transaction });
  return new Map(rows.map((u) => [u.id, person(u)]));
}

/** The active people among `ids`; with `staffOnly`, only technicians, managers and admins. */
export async function activePeople(
  ids: readonly number[],
  opts: { staffOnly?: boolean; transaction?: Transaction } = {},
): Promise<Person[]> {
  if (ids.length === 0) return [];
  const rows = await User.findAll({
    where: { id: [...ids], active: true, ...(opts.staffOnly ? { role: STAFF } : {}) },
    attributes: [...PERSON],
    transaction: opts.transaction,
  });
  return rows.map(person);
}

export async function activeAdmins(transaction?: Transaction): Promise<Person[]> {
  const rows = await User.findAll({ where: { role: 'admin', active: true }, attributes: [...PERSON], transaction });
  return rows.map(person);
}

export async function onCallPeople(transaction?: Transaction): Promise<Person[]> {
  const rows = await User.findAll({ where: { onCall: true, active: true }, attributes: [...PERSON], transaction });
  return rows.map(person);
}

/** Active staff by name (and e-mail, with `byEmail`), for pickers. */
export async function searchStaff(query: { search?: string; byEmail?: boolean; limit: number; offset?: number }) {
  const where = {
    active: true,
    role: STAFF,
    ...(query.search
      ? {
          [Op.or]: [
            { name: { [Op.like]: likePattern(query.search) } },
            ...(query.byEmail ? [{ email: { [Op.like]: likePattern(query.search) } }] : []),
          ],
        }
      : {}),
  };
  const { rows, count } = await User.findAndCountAll({
    where,
    attributes: [...PERSON],
    order: [['name', 'ASC']],
    limit: query.limit,
    offset: query.offset ?? 0,
  });
  return { items: rows.map(person), total: count };
}

/** Sets a new password hash (a reset or invitation link was used), in the caller's transaction. */
export async function setPasswordHash(userId: number, passwordHash: string, transaction: Transaction) {
  await User.update({ passwordHash }, { where: { id: userId }, transaction });
}
