import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';
import { users } from './users.js';
import { units } from './units.js';

/**
 * A unit's history: who changed what, when. One row per change, written in the same transaction
 * as the change itself (see server/planning/history.ts), read newest first.
 */
export const unitEvents = pgTable(
  'unit_events',
  {
    id: uuid().primaryKey().defaultRandom(),
    unitId: uuid()
      .notNull()
      .references(() => units.id, { onDelete: 'cascade' }),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    /** Null once the person's account is gone; the history stays. */
    actorId: uuid().references(() => users.id, { onDelete: 'set null' }),
    /** What kind of change: see UnitEventAction in server/planning/history.ts. */
    action: text().notNull(),
    /** One short line a teacher reads, e.g. "group size 3 → 4" or "added activity Test run". */
    summary: text().notNull(),
    /** The lesson the change was about, when it was about one. */
    lessonId: uuid(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('unit_events_unit_at_idx').on(t.unitId, t.at)],
);
