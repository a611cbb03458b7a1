import { hash, verify } from '@node-rs/argon2';
import { dictionary } from '@zxcvbn-ts/language-common';

// argon2id with OWASP's minimum: 19 MiB memory, 2 iterations, 1 lane (ASVS 11.4.2).
const ARGON2 = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2);
}

// Verified against when the e-mail is unknown, so a wrong e-mail takes as long as a wrong password.
let dummyHash: Promise<string> | null = null;

export async function verifyPassword(storedHash: string | null, password: string): Promise<boolean> {
  if (!storedHash) {
    dummyHash ??= hashPassword('not-a-real-password-just-timing');
    await verify(await dummyHash, password).catch(() => false);
    return false;
  }
  return verify(storedHash, password).catch(() => false);
}

const common = new Set<string>(dictionary.passwords as string[]);

/** A widely used password list (about 49,000 entries) that sign-up and reset refuse. */
export function isCommonPassword(password: string): boolean {
  return common.has(password.toLowerCase());
}
