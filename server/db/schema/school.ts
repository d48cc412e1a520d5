import { date, integer, jsonb, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';

/** The school's prep allowances (PREP-RULES.md settings); missing keys take the defaults. */
export const schoolSettings = pgTable('school_settings', {
  schoolId: uuid()
    .primaryKey()
    .references(() => schools.id, { onDelete: 'cascade' }),
  prep: jsonb().notNull().default({}),
  version: integer().notNull().default(1),
});

export const terms = pgTable('terms', {
  id: uuid().primaryKey().defaultRandom(),
  schoolId: uuid()
    .notNull()
    .references(() => schools.id, { onDelete: 'cascade' }),
  name: text().notNull(),
  startsOn: date({ mode: 'string' }).notNull(),
  endsOn: date({ mode: 'string' }).notNull(),
});

/** Named periods of the school day, wall-clock `HH:MM` in the school's timezone. */
export const bellPeriods = pgTable('bell_periods', {
  id: uuid().primaryKey().defaultRandom(),
  schoolId: uuid()
    .notNull()
    .references(() => schools.id, { onDelete: 'cascade' }),
  position: integer().notNull(),
  name: text().notNull(),
  startsAt: text().notNull(),
  endsAt: text().notNull(),
});

export const nonTeachingDays = pgTable('non_teaching_days', {
  id: uuid().primaryKey().defaultRandom(),
  schoolId: uuid()
    .notNull()
    .references(() => schools.id, { onDelete: 'cascade' }),
  date: date({ mode: 'string' }).notNull(),
  reason: text().notNull().default(''),
});
