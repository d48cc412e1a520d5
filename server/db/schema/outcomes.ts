import { pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';

export const outcomeFrameworks = pgTable(
  'outcome_frameworks',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique('frameworks_school_name').on(t.schoolId, t.name)],
);

export const outcomes = pgTable(
  'outcomes',
  {
    id: uuid().primaryKey().defaultRandom(),
    frameworkId: uuid()
      .notNull()
      .references(() => outcomeFrameworks.id, { onDelete: 'cascade' }),
    code: text().notNull(),
    description: text().notNull(),
    strand: text().notNull().default(''),
    yearBand: text().notNull().default(''),
  },
  (t) => [unique('outcomes_framework_code').on(t.frameworkId, t.code)],
);
