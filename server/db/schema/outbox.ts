import { index, integer, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

/**
 * E-mail waiting to be sent. Written in the same transaction as the action that causes it and
 * delivered after commit, so an SMTP outage delays a message but never loses it.
 */
export const outbox = pgTable(
  'outbox',
  {
    id: uuid().primaryKey().defaultRandom(),
    toAddress: text().notNull(),
    subject: text().notNull(),
    textBody: text().notNull(),
    htmlBody: text(),
    /** pending, sending (claimed by one worker), sent or failed (gave up after the last retry). */
    status: text().notNull().default('pending'),
    attempts: integer().notNull().default(0),
    nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    lastError: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp({ withTimezone: true }),
    /** When a worker claimed it for sending; a claim older than a few minutes was lost in a crash. */
    claimedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index('outbox_due_idx').on(t.status, t.nextAttemptAt)],
);
