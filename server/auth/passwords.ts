import { hash, verify } from '@node-rs/argon2';
import { dictionary } from '@zxcvbn-ts/language-common';
import { PASSWORD_MIN } from '../../shared/schemas/auth.js';

/**
 * argon2id at OWASP's Password Storage Cheat Sheet minimum: m = 19456 KiB, t = 2, p = 1.
 * `algorithm` 2 is argon2id (the package's enum is a const enum, undefined at run time).
 */
export const ARGON2_OPTIONS = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(phc: string | null, password: string): Promise<boolean> {
  if (!phc) return false;
  try {
    return await verify(phc, password);
  } catch {
    return false;
  }
}

/** A hash of a random password, verified against when the e-mail is unknown so timing matches. */
let dummyHash: Promise<string> | null = null;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword(`no-such-account-${Math.random()}`);
  return dummyHash;
}

// The common-password list bundled with @zxcvbn-ts/language-common; NIST SP 800-63B §5.1.1.2
// asks that passwords found in lists of commonly used or compromised values be refused.
const common = new Set(
  (dictionary['passwords-common'] as string[])
    .filter((p) => p.length >= PASSWORD_MIN)
    .map((p) => p.toLowerCase()),
);

/** Why a new password is refused beyond its length (checked by zod), or null when it is fine. */
export function passwordProblem(password: string, email?: string): string | null {
  const lower = password.toLowerCase();
  if (common.has(lower))
    return 'That password is on a list of commonly used passwords. Choose another.';
  if (email && lower === email.toLowerCase())
    return 'Do not use your e-mail address as the password.';
  if (/^(.)\1+$/.test(password))
    return 'A password of one repeated character is too easy to guess.';
  if (lower.includes('trayplan') && lower.replace(/[^a-z]/g, '').length <= 12) {
    return 'A password made from the product name is too easy to guess.';
  }
  return null;
}
