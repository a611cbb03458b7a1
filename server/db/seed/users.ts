import type { Transaction } from 'sequelize';
import { User } from '../../modules/users/user.model';
import { hashPassword } from '../../modules/users/password';
import type { Role } from '../../../shared/roles';

/**
 * Demo accounts, one per role, plus more invented staff and users for the history.
 * They exist only when the demo seed ran; the README lists the sign-ins.
 * All names are invented for the demo.
 */
export const DEMO_SIGN_INS: { role: Role; email: string; password: string; name: string }[] = [
  { role: 'member', email: 'member@demo.faultline.test', password: 'demo-member-wafer', name: 'Noor Halvorsen' },
  { role: 'technician', email: 'technician@demo.faultline.test', password: 'demo-technician-wrench', name: 'Tomas Okonkwo-Reyes' },
  { role: 'manager', email: 'manager@demo.faultline.test', password: 'demo-manager-trends', name: 'Ilse Marchetti' },
  { role: 'admin', email: 'admin@demo.faultline.test', password: 'demo-admin-keys', name: 'Raf Delacroix-Ube' },
];

const MORE_STAFF = ['Keiko Brandvold', 'Emeka Lindgren', 'Sunniva Patak', 'Dario Feldkamp'];
const MORE_MEMBERS = [
  'Anouk Terzic',
  'Bao Quigley',
  'Celeste Ruhnke',
  'Dmitri Ansah',
  'Esme Varga',
  'Farid Lowenthal',
  'Greta Oyelaran',
  'Hamish Zeller',
  'Ines Kowalczuk',
  'Jonah Mbeki-Hart',
  'Kaia Renwick',
  'Leander Sato',
];

const slug = (name: string) =>
  name
    .toLowerCase()
    .replace(/[^a-z]+/g, '.')
    .replace(/^\.|\.$/g, '');

export async function seedUsers(transaction: Transaction) {
  const created: Record<string, User> = {};
  for (const u of DEMO_SIGN_INS) {
    created[u.role] = await User.create(
      {
        email: u.email,
        name: u.name,
        role: u.role,
        passwordHash: await hashPassword(u.password),
        lastSignInAt: null,
        onCall: u.role === 'technician',
      },
      { transaction },
    );
  }
  // Invented extra people sign in with no password (they have none) — they give the history its cast.
  const staff = [created.technician];
  for (const name of MORE_STAFF) {
    staff.push(
      await User.create(
        {
          email: `${slug(name)}@demo.faultline.test`,
          name,
          role: 'technician',
          passwordHash: null,
          lastSignInAt: null,
          onCall: name === MORE_STAFF[0],
        },
        { transaction },
      ),
    );
  }
  const members = [created.member];
  for (const name of MORE_MEMBERS) {
    members.push(
      await User.create(
        { email: `${slug(name)}@demo.faultline.test`, name, role: 'member', passwordHash: null, lastSignInAt: null },
        { transaction },
      ),
    );
  }
  return { byRole: created, staff, members };
}
