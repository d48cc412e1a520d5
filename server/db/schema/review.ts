import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';
import { users } from './users.js';
import { lessons, units } from './units.js';

/**
 * A comment in a unit's review: on the unit, or on one of its lessons. Markdown, stored as
 * written and sanitised where it is shown. A review step's comment ("request changes: …") is
 * kept here too, with the step it came with, so the conversation reads in one place.
 */
export const unitComments = pgTable(
  'unit_comments',
  {
    id: uuid().primaryKey().defaultRandom(),
    unitId: uuid()
      .notNull()
      .references(() => units.id, { onDelete: 'cascade' }),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    /** The lesson the comment is about; null for the unit as a whole. */
    lessonId: uuid().references(() => lessons.id, { onDelete: 'cascade' }),
    /** Null once the person's account is gone; the comment stays. */
    authorId: uuid().references(() => users.id, { onDelete: 'set null' }),
    body: text().notNull(),
    /** The review step the comment came with (submit, request-changes, …); null for a comment alone. */
    step: text(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('unit_comments_unit_at_idx').on(t.unitId, t.at)],
);
