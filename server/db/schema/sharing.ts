import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';
import { users } from './users.js';
import { lessons } from './units.js';

/**
 * A time-limited link that shows one lesson and its pack without an account. Only the SHA-256
 * of the token is kept: a copy of the database opens no lesson.
 */
export const shareLinks = pgTable(
  'share_links',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    tokenHash: text().notNull().unique(),
    /** Where the link was e-mailed, or null when it was only copied. */
    email: text(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    revokedAt: timestamp({ withTimezone: true }),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('share_links_lesson_idx').on(t.lessonId)],
);

/**
 * A person's private calendar feed address: one per person, replaced (not added to) when they
 * ask for a new one, so the old address stops working. Only the SHA-256 of the token is kept.
 */
export const calendarFeeds = pgTable('calendar_feeds', {
  userId: uuid()
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text().notNull().unique(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
