/**
 * Sign-in throttling (API.md "Sign-in throttling", after OWASP's Authentication Cheat Sheet):
 * at most 5 wrong passwords per account and address in 15 minutes, then 429 for that pair only;
 * failures of one account from many addresses slow its answers and warn its owner once, but never
 * lock out the right password from elsewhere; at most 100 failures per address (a school behind
 * one NAT address). Counted in PostgreSQL (attempt_counters) so every instance sees the same.
 *
 * An attempt reserves its place in all three counters with one upsert before the password is
 * checked, so a burst of parallel guesses cannot slip past the limit; a right password gives its
 * reservation back, so only wrong passwords count.
 */
import { sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client.js';
import { attemptCounters } from '../db/schema/index.js';
import { HttpError } from '../http.js';

export const WINDOW_MINUTES = 15;
export const PER_ACCOUNT_AND_ADDRESS = 5;
export const PER_ADDRESS = 100;
/** Failures of one account (from anywhere) after which its answers are slowed (our choice). */
export const ACCOUNT_SLOW_AFTER = 5;
/** Failures of one account after which its owner is e-mailed, once per window (our choice). */
export const ACCOUNT_WARN_AT = 10;
/** Delay added per failure beyond ACCOUNT_SLOW_AFTER, and its ceiling. */
export const SLOW_STEP_MS = 250;
export const SLOW_MAX_MS = 3000;

const WINDOW = sql.raw(`interval '${WINDOW_MINUTES} minutes'`);

export interface SignInKeys {
  pair: string;
  account: string;
  address: string;
}

export function signInKeys(email: string, address: string): SignInKeys {
  return {
    pair: `pair:${email}|${address}`,
    account: `account:${email}`,
    address: `address:${address}`,
  };
}

interface Count {
  key: string;
  failures: number;
  /** Seconds until the counter's window ends. */
  secondsLeft: number;
}

/** Adds `by` to each counter in one upsert; a counter whose window ended starts again. */
export async function bump(db: Tx, keys: string[], by = 1): Promise<Map<string, Count>> {
  const expired = sql`${attemptCounters.windowStart} <= now() - ${WINDOW}`;
  const rows = await db
    .insert(attemptCounters)
    .values(keys.map((key) => ({ key, failures: Math.max(by, 0) })))
    .onConflictDoUpdate({
      target: attemptCounters.key,
      set: {
        failures: sql`CASE WHEN ${expired} THEN ${Math.max(by, 0)}
          ELSE greatest(${attemptCounters.failures} + ${by}, 0) END`,
        windowStart: sql`CASE WHEN ${expired} THEN now() ELSE ${attemptCounters.windowStart} END`,
      },
    })
    .returning({
      key: attemptCounters.key,
      failures: attemptCounters.failures,
      secondsLeft: sql<number>`greatest(1, ceil(extract(epoch from
        ${attemptCounters.windowStart} + ${WINDOW} - now())))::int`,
    });
  return new Map(rows.map((r) => [r.key, r]));
}

/** 429 with Retry-After (RFC 6585 §4, RFC 9110 §10.2.3) in the API's error shape. */
export function throttled(seconds: number): HttpError {
  const minutes = Math.max(1, Math.ceil(seconds / 60));
  return new HttpError(
    429,
    'throttled',
    `Too many attempts. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    undefined,
    { headers: { 'Retry-After': String(seconds) } },
  );
}

export interface Reservation {
  /** Milliseconds to wait before answering (the account is under attack from many places). */
  delayMs: number;
  /** Gives the reservation back: the password was right. */
  release: () => Promise<void>;
  /** Whether this failure is the one that should warn the owner (true exactly once a window). */
  shouldWarn: () => Promise<boolean>;
}

/** Reserves a sign-in attempt; throws 429 when the pair or the address is over its limit. */
export async function reserveSignIn(db: Db, keys: SignInKeys): Promise<Reservation> {
  const all = [keys.pair, keys.account, keys.address];
  const counts = await bump(db, all);
  const pair = counts.get(keys.pair)!;
  const address = counts.get(keys.address)!;
  const account = counts.get(keys.account)!;
  if (pair.failures > PER_ACCOUNT_AND_ADDRESS || address.failures > PER_ADDRESS) {
    // A refused attempt checks no password, so it is not a failure: give the place back.
    await bump(db, all, -1);
    const over = [pair, address].filter(
      (c) => c.failures > (c === pair ? PER_ACCOUNT_AND_ADDRESS : PER_ADDRESS),
    );
    throw throttled(Math.max(...over.map((c) => c.secondsLeft)));
  }
  const earlier = account.failures - 1;
  const delayMs =
    earlier >= ACCOUNT_SLOW_AFTER
      ? Math.min((earlier - ACCOUNT_SLOW_AFTER + 1) * SLOW_STEP_MS, SLOW_MAX_MS)
      : 0;
  return {
    delayMs,
    release: async () => {
      await bump(db, all, -1);
    },
    shouldWarn: async () => {
      // One conditional UPDATE: only one failure per window can set notified_at.
      const rows = await db
        .update(attemptCounters)
        .set({ notifiedAt: sql`now()` })
        .where(
          sql`${attemptCounters.key} = ${keys.account}
            AND ${attemptCounters.failures} >= ${ACCOUNT_WARN_AT}
            AND (${attemptCounters.notifiedAt} IS NULL
              OR ${attemptCounters.notifiedAt} < ${attemptCounters.windowStart})`,
        )
        .returning({ key: attemptCounters.key });
      return rows.length === 1;
    },
  };
}

/** Counts one request against a plain limit (password-reset requests); 429 when over it. */
export async function countRequest(db: Db, key: string, limit: number): Promise<void> {
  const count = (await bump(db, [key])).get(key)!;
  if (count.failures > limit) throw throttled(count.secondsLeft);
}

/** Deletes counters whose window ended (run by a scheduled job). */
export async function pruneCounters(db: Db): Promise<number> {
  const rows = await db
    .delete(attemptCounters)
    .where(sql`${attemptCounters.windowStart} <= now() - ${WINDOW}`)
    .returning({ key: attemptCounters.key });
  return rows.length;
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
