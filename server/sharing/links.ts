/**
 * Share links: their expiry rule, and opening one by its token. The token is the credential, so
 * it is only ever hashed (SHA-256) before it touches the database, compared in constant time, and
 * never written to a log or an error.
 */
import { timingSafeEqual } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Db, Tx } from '../db/client.js';
import { shareLinks } from '../db/schema/index.js';
import { hashToken } from '../auth/tokens.js';
import { HttpError } from '../http.js';
import { SHARE_LINK_MAX_DAYS } from '../../shared/schemas/sharing.js';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** What the tokens look like: base64url of 32 random bytes (43 characters); 22 at least. */
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{22,128}$/;

/**
 * The default end of a link (API.md): the end of the lesson's school day in the school's
 * timezone (midnight after it), cut to 14 days from now when later, and 24 hours from now when
 * that day is already over.
 */
export function defaultShareExpiry(lessonStartsAt: string, timezone: string, now: Date): Date {
  const dayEnd = DateTime.fromISO(lessonStartsAt, { zone: timezone })
    .startOf('day')
    .plus({ days: 1 })
    .toMillis();
  if (dayEnd <= now.getTime()) return new Date(now.getTime() + DAY);
  return new Date(Math.min(dayEnd, now.getTime() + SHARE_LINK_MAX_DAYS * DAY));
}

/** An explicit end must lie after now and at most 14 days ahead; else the field's 400. */
export function checkShareExpiry(expiresAt: string, now: Date): Date {
  const at = new Date(expiresAt);
  const problem =
    at.getTime() <= now.getTime()
      ? 'Choose an end in the future.'
      : at.getTime() > now.getTime() + SHARE_LINK_MAX_DAYS * DAY
        ? `A link can last at most ${SHARE_LINK_MAX_DAYS} days.`
        : null;
  if (problem) {
    throw new HttpError(400, 'invalid-input', 'Some fields need attention.', [
      { path: 'expiresAt', message: problem },
    ]);
  }
  return at;
}

/**
 * Whether a stored token hash is the one just computed, compared in constant time. Lookups go by
 * the hash (its timing tells nothing about the token itself); this compare is the final word.
 */
export function sameHash(stored: string, computed: string): boolean {
  const a = Buffer.from(stored, 'hex');
  const b = Buffer.from(computed, 'hex');
  return a.length === b.length && timingSafeEqual(a, b);
}

/** Whether a token has the shape Trayplan makes (base64url, 22 to 128 characters). */
export function tokenShaped(token: string): boolean {
  return TOKEN_SHAPE.test(token);
}

/** An open link: the lesson it shows and until when. */
export interface OpenShareLink {
  id: string;
  lessonId: string;
  schoolId: string;
  expiresAt: Date;
}

const unknownLink = () =>
  new HttpError(404, 'not-found', 'This link is not known. Check that it was copied whole.');

/**
 * The link a token opens: 404 when no link has it, 410 when it was withdrawn or has run out
 * (in words a relief teacher can act on).
 */
export async function openShareLink(db: Db | Tx, token: string): Promise<OpenShareLink> {
  if (!tokenShaped(token)) throw unknownLink();
  const hash = hashToken(token);
  const [row] = await db.select().from(shareLinks).where(eq(shareLinks.tokenHash, hash));
  if (!row || !sameHash(row.tokenHash, hash)) throw unknownLink();
  if (row.revokedAt) {
    throw new HttpError(
      410,
      'link-revoked',
      'This link has been withdrawn by the teacher who shared it. Ask them for a new one.',
    );
  }
  if (row.expiresAt.getTime() <= Date.now()) {
    throw new HttpError(
      410,
      'link-expired',
      'This link has run out. Ask the teacher who shared the lesson for a new one.',
    );
  }
  return { id: row.id, lessonId: row.lessonId, schoolId: row.schoolId, expiresAt: row.expiresAt };
}
