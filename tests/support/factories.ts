import crypto from 'node:crypto';
import { User } from '../../server/modules/users/user.model';
import { hashPassword } from '../../server/modules/users/password';
import type { Role } from '../../shared/roles';
import { TestClient } from './client';

export const unique = (prefix = 'x') => `${prefix}-${crypto.randomBytes(5).toString('hex')}`;

export const TEST_PASSWORD = 'correct-horse-battery-7';

/** A user with a unique e-mail and the shared test password. */
export async function createUser(role: Role = 'member', extra: Partial<{ name: string; onCall: boolean; active: boolean }> = {}) {
  const email = `${unique(role)}@test.faultline.test`;
  return User.create({
    email,
    name: extra.name ?? `Test ${role}`,
    role,
    passwordHash: await hashPassword(TEST_PASSWORD),
    lastSignInAt: null,
    onCall: extra.onCall ?? false,
    active: extra.active ?? true,
  });
}

/** A signed-in client for a new user of the given role. */
export async function signedInClient(baseUrl: string, role: Role = 'member') {
  const user = await createUser(role);
  const client = new TestClient(baseUrl);
  const r = await client.signIn(user.email, TEST_PASSWORD);
  if (r.status !== 200) throw new Error(`sign-in failed: ${r.status} ${r.text}`);
  return { client, user };
}
