import {
  boolean,
  index,
  integer,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from 'drizzle-orm/pg-core';
import { ACTIVITY_KINDS, MATERIAL_PER } from '../../../shared/definitions.js';
import { UNIT_STATUSES, UNIT_VISIBILITIES } from '../../../shared/schemas/units.js';
import { schools } from './schools.js';
import { users } from './users.js';
import { classes } from './classes.js';
import { kitTypes, tubs } from './kits.js';
import { outcomes } from './outcomes.js';
import { bellPeriods } from './school.js';
import { bytea } from './bytea.js';

export const units = pgTable(
  'units',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    ownerId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    title: text().notNull(),
    yearLevel: integer().notNull(),
    learningArea: text().notNull().default(''),
    term: integer(),
    overview: text().notNull().default(''),
    /** draft, in-review, changes-requested or endorsed. */
    status: text({ enum: UNIT_STATUSES }).notNull().default('draft'),
    /** private or school. */
    visibility: text({ enum: UNIT_VISIBILITIES }).notNull().default('private'),
    copiedFromId: uuid(),
    /** When it was last sent for review (the review queue's "waiting since"); null if never. */
    submittedAt: timestamp({ withTimezone: true }),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('units_school_idx').on(t.schoolId)],
);

export const unitOutcomes = pgTable(
  'unit_outcomes',
  {
    unitId: uuid()
      .notNull()
      .references(() => units.id, { onDelete: 'cascade' }),
    outcomeId: uuid()
      .notNull()
      .references(() => outcomes.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.unitId, t.outcomeId] })],
);

export const unitCoauthors = pgTable(
  'unit_coauthors',
  {
    unitId: uuid()
      .notNull()
      .references(() => units.id, { onDelete: 'cascade' }),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.unitId, t.userId] })],
);

/** A lesson; `startsAt`/`endsAt` are wall-clock times in the school's timezone (no offset). */
export const lessons = pgTable(
  'lessons',
  {
    id: uuid().primaryKey().defaultRandom(),
    unitId: uuid()
      .notNull()
      .references(() => units.id, { onDelete: 'cascade' }),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    title: text().notNull(),
    classId: uuid()
      .notNull()
      .references(() => classes.id, { onDelete: 'restrict' }),
    kitTypeId: uuid()
      .notNull()
      .references(() => kitTypes.id, { onDelete: 'restrict' }),
    startsAt: timestamp({ mode: 'string' }).notNull(),
    endsAt: timestamp({ mode: 'string' }).notNull(),
    periodId: uuid().references(() => bellPeriods.id, { onDelete: 'set null' }),
    room: text().notNull().default(''),
    groupSize: integer().notNull(),
    learningIntention: text().notNull().default(''),
    successCriteria: text().notNull().default(''),
    reliefNotes: text().notNull().default(''),
    reliefTeacherId: uuid().references(() => users.id, { onDelete: 'set null' }),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('lessons_unit_idx').on(t.unitId),
    index('lessons_school_start_idx').on(t.schoolId, t.startsAt),
  ],
);

export const lessonTubs = pgTable(
  'lesson_tubs',
  {
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    tubId: uuid()
      .notNull()
      .references(() => tubs.id, { onDelete: 'restrict' }),
  },
  (t) => [primaryKey({ columns: [t.lessonId, t.tubId] })],
);

export const activities = pgTable(
  'activities',
  {
    id: uuid().primaryKey().defaultRandom(),
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    title: text().notNull(),
    /** intro, build, code, test, reflect or other. */
    kind: text({ enum: ACTIVITY_KINDS }).notNull(),
    minutes: integer().notNull(),
    version: integer().notNull().default(1),
  },
  (t) => [index('activities_lesson_idx').on(t.lessonId)],
);

/** A line of an activity's bill of materials: a part of the kit type (by code) or a consumable. */
export const materials = pgTable(
  'materials',
  {
    id: uuid().primaryKey().defaultRandom(),
    activityId: uuid()
      .notNull()
      .references(() => activities.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    partCode: text(),
    consumable: text(),
    qty: integer().notNull(),
    /** group, student or class. */
    per: text({ enum: MATERIAL_PER }).notNull(),
    returnable: boolean().notNull(),
  },
  (t) => [index('materials_activity_idx').on(t.activityId)],
);

export const attachments = pgTable('attachments', {
  id: uuid().primaryKey().defaultRandom(),
  activityId: uuid()
    .notNull()
    .references(() => activities.id, { onDelete: 'cascade' }),
  filename: text().notNull(),
  contentType: text().notNull(),
  size: integer().notNull(),
  bytes: bytea().notNull(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
