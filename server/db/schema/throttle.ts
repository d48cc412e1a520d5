import { integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/**
 * Counters of failed attempts in a fixed window (sign-in per account+address, per account, per
 * address; reset requests per account). Kept in PostgreSQL so every instance counts together;
 * each attempt is one upsert. Rows whose window ended are pruned by a scheduled job.
 */
export const attemptCounters = pgTable('attempt_counters', {
  /** `pair:<email>|<address>`, `account:<email>`, `address:<address>` or `reset:<email>`. */
  key: text().primaryKey(),
  failures: integer().notNull().default(0),
  windowStart: timestamp({ withTimezone: true }).notNull().defaultNow(),
  /** When the account's owner was last warned (at most once per window). */
  notifiedAt: timestamp({ withTimezone: true }),
});
