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
import { lessons } from './units.js';
import { users } from './users.js';

/**
 * A lesson's tray key: the random value that, with the server's secret, derives every group's
 * tray token and short code. Printing the labels again derives the same codes; revoking replaces
 * the value, so every code printed before stops working at once.
 */
export const trayKeys = pgTable('tray_keys', {
  lessonId: uuid()
    .primaryKey()
    .references(() => lessons.id, { onDelete: 'cascade' }),
  nonce: text().notNull(),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

/**
 * A tray code handed out on a label. Only SHA-256 hashes of the token and the short code are
 * kept (for the lookup); the token itself is derived again and compared in constant time.
 * Revoked rows stay so that an old label answers 410 rather than 404.
 */
export const trayTokens = pgTable(
  'tray_tokens',
  {
    id: uuid().primaryKey().defaultRandom(),
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    groupNumber: integer().notNull(),
    nonce: text().notNull(),
    tokenHash: text().notNull().unique(),
    codeHash: text().notNull().unique(),
    revokedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('tray_tokens_lesson_idx').on(t.lessonId)],
);

/** A group's ticks and missing count for one line of its pull list during a lesson. */
export const trayLines = pgTable(
  'tray_lines',
  {
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    groupNumber: integer().notNull(),
    partCode: text().notNull(),
    out: boolean().notNull().default(false),
    back: boolean().notNull().default(false),
    missing: integer().notNull().default(0),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.lessonId, t.groupNumber, t.partCode] })],
);

/** A prep task of a lesson ticked done, shared by the lesson's teachers. */
export const prepTaskTicks = pgTable(
  'prep_task_ticks',
  {
    lessonId: uuid()
      .notNull()
      .references(() => lessons.id, { onDelete: 'cascade' }),
    /** The task's kind and label, which name it within the lesson's plan. */
    taskKey: text().notNull(),
    tickedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    tickedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.lessonId, t.taskKey] })],
);
