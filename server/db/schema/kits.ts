import {
  boolean,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';
import { TUB_STATUSES } from '../../../shared/definitions.js';
import { PART_CATEGORIES } from '../../../shared/schemas/kits.js';
import { schools } from './schools.js';
import { users } from './users.js';
import { bytea } from './bytea.js';

export const kitTypes = pgTable(
  'kit_types',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    description: text().notNull().default(''),
    archivedAt: timestamp({ withTimezone: true }),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique('kit_types_school_name').on(t.schoolId, t.name)],
);

/** A line of a kit type's parts list; `qty` is how many one full tub holds. */
export const parts = pgTable(
  'parts',
  {
    id: uuid().primaryKey().defaultRandom(),
    kitTypeId: uuid()
      .notNull()
      .references(() => kitTypes.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    code: text().notNull(),
    name: text().notNull(),
    colour: text(),
    category: text({ enum: PART_CATEGORIES }).notNull().default('other'),
    qty: integer().notNull(),
    compartment: text(),
    small: boolean().notNull().default(false),
    /** Minutes from empty to full for a rechargeable part; null when not rechargeable. */
    chargeMinutes: integer(),
  },
  (t) => [unique('parts_kit_code').on(t.kitTypeId, t.code)],
);

/** Photos are keyed by kit type and part code so they survive a re-import of the parts list. */
export const partPhotos = pgTable(
  'part_photos',
  {
    kitTypeId: uuid()
      .notNull()
      .references(() => kitTypes.id, { onDelete: 'cascade' }),
    partCode: text().notNull(),
    contentType: text().notNull(),
    bytes: bytea().notNull(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.kitTypeId, t.partCode] })],
);

export const tubs = pgTable(
  'tubs',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    kitTypeId: uuid()
      .notNull()
      .references(() => kitTypes.id, { onDelete: 'restrict' }),
    label: text().notNull(),
    controllerLabel: text(),
    /** ready, needs-sorting, on-loan or retired. */
    status: text({ enum: TUB_STATUSES }).notNull().default('ready'),
    version: integer().notNull().default(1),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique('tubs_kit_label').on(t.kitTypeId, t.label),
    index('tubs_school_idx').on(t.schoolId),
  ],
);

/** What a tub is known to be missing, per part code (stock = the kit's qty − count). */
export const tubMissing = pgTable(
  'tub_missing',
  {
    tubId: uuid()
      .notNull()
      .references(() => tubs.id, { onDelete: 'cascade' }),
    partCode: text().notNull(),
    count: integer().notNull(),
  },
  (t) => [primaryKey({ columns: [t.tubId, t.partCode] })],
);

/** The history of pack-away audits of a tub. */
export const tubAudits = pgTable('tub_audits', {
  id: uuid().primaryKey().defaultRandom(),
  tubId: uuid()
    .notNull()
    .references(() => tubs.id, { onDelete: 'cascade' }),
  lessonId: uuid(),
  userId: uuid().references(() => users.id, { onDelete: 'set null' }),
  missing: jsonb().notNull().default([]),
  found: jsonb().notNull().default([]),
  note: text().notNull().default(''),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
