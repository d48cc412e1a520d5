import { integer, pgTable, primaryKey, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';
import { users } from './users.js';

export const classes = pgTable(
  'classes',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    yearLevel: integer().notNull(),
    studentCount: integer().notNull(),
    devices: integer().notNull().default(0),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique('classes_school_name').on(t.schoolId, t.name)],
);

export const classTeachers = pgTable(
  'class_teachers',
  {
    classId: uuid()
      .notNull()
      .references(() => classes.id, { onDelete: 'cascade' }),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.classId, t.userId] })],
);
