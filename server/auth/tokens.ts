import { createHash, randomBytes } from 'node:crypto';

/** A one-time token for a link, and the SHA-256 that is all the database keeps of it. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export const INVITATION_DAYS = 7;
export const RESET_MINUTES = 60;
