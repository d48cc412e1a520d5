/**
 * Tray tokens and short codes (API.md, "The group's tray and pack-away"). Both are derived, not
 * drawn: HMAC-SHA-256 under a key made from the server's secret, of the lesson, the group and the
 * lesson's tray nonce. Printing the labels again derives the same codes, so labels already stuck
 * on trays keep working; revoking replaces the nonce, so every earlier code stops at once.
 *
 * The database keeps only SHA-256 hashes of the token and the code (for the lookup) with the
 * nonce that made them; on every use the token is derived again and compared in constant time.
 * A token or code is never logged and never put into an error message.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { and, eq, isNull, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Db, Tx } from '../db/client.js';
import { lessons, schools, trayKeys, trayTokens } from '../db/schema/index.js';
import { HttpError } from '../http.js';
import { TRAY_CODE_LENGTH, TRAY_TOKEN_PATTERN } from '../../shared/schemas/trays.js';

/** 18 bytes of the HMAC: 144 bits, 24 base64url characters (API.md asks for at least 22). */
const TOKEN_BYTES = 18;
/** Crockford's base32 alphabet: no I, L, O or U, so a code read aloud or typed is not misread. */
const CROCKFORD = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** The HMAC key of tray codes, kept apart from the session key by its own label. */
export function trayKey(serverSecret: string): Buffer {
  return createHmac('sha256', serverSecret).update('trayplan tray codes v1').digest();
}

function mac(key: Buffer, purpose: string, lessonId: string, group: number, nonce: string) {
  return createHmac('sha256', key).update(`${purpose}|${lessonId}|${group}|${nonce}`).digest();
}

/** The group's token: base64url of the first 18 bytes of the HMAC. */
export function deriveToken(key: Buffer, lessonId: string, group: number, nonce: string): string {
  return mac(key, 'token', lessonId, group, nonce).subarray(0, TOKEN_BYTES).toString('base64url');
}

/** The group's short code: 40 bits of another HMAC as 8 Crockford base32 characters. */
export function deriveCode(key: Buffer, lessonId: string, group: number, nonce: string): string {
  const bytes = mac(key, 'code', lessonId, group, nonce);
  let bits = 0n;
  for (const b of bytes.subarray(0, 5)) bits = (bits << 8n) | BigInt(b);
  let code = '';
  for (let i = TRAY_CODE_LENGTH - 1; i >= 0; i--)
    code += CROCKFORD[Number((bits >> BigInt(i * 5)) & 31n)];
  return code;
}

/** `K7QM3XPA` → `K7QM-3XPA`, as printed under the QR code. */
export function formatCode(code: string): string {
  return `${code.slice(0, 4)}-${code.slice(4)}`;
}

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

/** A group's printed codes. */
export interface TrayCode {
  group: number;
  token: string;
  code: string;
}

/** The lesson's current nonce, made on first use (two printers at once agree on one). */
async function lessonNonce(tx: Tx, lessonId: string): Promise<string> {
  await tx
    .insert(trayKeys)
    .values({ lessonId, nonce: randomBytes(16).toString('base64url') })
    .onConflictDoNothing();
  const [row] = await tx.select().from(trayKeys).where(eq(trayKeys.lessonId, lessonId));
  return row!.nonce;
}

/**
 * The codes of the lesson's groups, recorded so they can be opened; run when labels are made.
 * Idempotent: the same lesson, groups and nonce give the same rows.
 */
export async function issueTrayCodes(
  db: Db,
  key: Buffer,
  lessonId: string,
  groups: readonly number[],
): Promise<TrayCode[]> {
  return db.transaction(async (tx) => {
    const nonce = await lessonNonce(tx, lessonId);
    const codes = groups.map((group) => ({
      group,
      token: deriveToken(key, lessonId, group, nonce),
      code: deriveCode(key, lessonId, group, nonce),
    }));
    if (codes.length) {
      await tx
        .insert(trayTokens)
        .values(
          codes.map((c) => ({
            lessonId,
            groupNumber: c.group,
            nonce,
            tokenHash: sha256(c.token),
            codeHash: sha256(c.code),
          })),
        )
        .onConflictDoNothing();
    }
    return codes;
  });
}

/**
 * Revokes every code of the lesson: the rows are marked (so old labels answer 410) and the nonce
 * replaced (so labels printed from now on carry new codes). Returns how many codes stopped.
 */
export async function revokeTrayCodes(db: Db, lessonId: string): Promise<number> {
  return db.transaction(async (tx) => {
    const revoked = await tx
      .update(trayTokens)
      .set({ revokedAt: sql`now()` })
      .where(and(eq(trayTokens.lessonId, lessonId), isNull(trayTokens.revokedAt)))
      .returning({ id: trayTokens.id });
    await tx
      .insert(trayKeys)
      .values({ lessonId, nonce: randomBytes(16).toString('base64url') })
      .onConflictDoUpdate({
        target: trayKeys.lessonId,
        set: { nonce: randomBytes(16).toString('base64url'), createdAt: sql`now()` },
      });
    return revoked.length;
  });
}

/** What an open tray token gives access to. */
export interface OpenTray {
  lessonId: string;
  schoolId: string;
  group: number;
  /** The end of the lesson's school day in the school's timezone. */
  expiresAt: Date;
}

/** The end of the lesson's school day (midnight after it) in the school's timezone (IANA). */
export function trayExpiry(lessonStartsAt: string, timezone: string): Date {
  return DateTime.fromISO(lessonStartsAt.replace(' ', 'T'), { zone: timezone })
    .startOf('day')
    .plus({ days: 1 })
    .toJSDate();
}

const unknownTray = () =>
  new HttpError(404, 'not-found', 'This tray code is not known. Check it against the label.');

/** Opens a row found by hash: the constant-time check, then revoked and expired as 410. */
async function openRow(
  tx: Tx,
  row: typeof trayTokens.$inferSelect | undefined,
  derive: (r: typeof trayTokens.$inferSelect) => string,
  presented: string,
  now: Date,
): Promise<OpenTray> {
  if (!row) throw unknownTray();
  const expected = Buffer.from(derive(row));
  const given = Buffer.from(presented);
  if (expected.length !== given.length || !timingSafeEqual(expected, given)) throw unknownTray();
  if (row.revokedAt) {
    throw new HttpError(
      410,
      'tray-revoked',
      'This tray code has been replaced by the teacher. Ask for the new label.',
    );
  }
  const [lesson] = await tx
    .select({ startsAt: lessons.startsAt, schoolId: lessons.schoolId, timezone: schools.timezone })
    .from(lessons)
    .innerJoin(schools, eq(schools.id, lessons.schoolId))
    .where(eq(lessons.id, row.lessonId));
  if (!lesson) throw unknownTray();
  const expiresAt = trayExpiry(lesson.startsAt, lesson.timezone);
  if (expiresAt.getTime() <= now.getTime()) {
    throw new HttpError(410, 'tray-expired', 'This tray code was for a lesson day that is over.');
  }
  return { lessonId: row.lessonId, schoolId: lesson.schoolId, group: row.groupNumber, expiresAt };
}

/** Opens a tray by its token: 404 unknown, 410 revoked or past the lesson's day. */
export async function openTrayToken(
  tx: Tx,
  key: Buffer,
  token: string,
  now = new Date(),
): Promise<OpenTray> {
  if (!TRAY_TOKEN_PATTERN.test(token)) throw unknownTray();
  const [row] = await tx
    .select()
    .from(trayTokens)
    .where(eq(trayTokens.tokenHash, sha256(token)));
  return openRow(tx, row, (r) => deriveToken(key, r.lessonId, r.groupNumber, r.nonce), token, now);
}

/** The token of a short code (already normalised): 404 unknown, 410 revoked or expired. */
export async function tokenOfCode(
  tx: Tx,
  key: Buffer,
  code: string,
  now = new Date(),
): Promise<string> {
  const [row] = await tx
    .select()
    .from(trayTokens)
    .where(eq(trayTokens.codeHash, sha256(code)));
  await openRow(tx, row, (r) => deriveCode(key, r.lessonId, r.groupNumber, r.nonce), code, now);
  return deriveToken(key, row!.lessonId, row!.groupNumber, row!.nonce);
}
