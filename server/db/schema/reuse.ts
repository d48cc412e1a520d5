import { integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { units } from './units.js';

/**
 * Where a copied unit came from: the original's id, version, title and owner's name as they were
 * at the moment of copying (the original may since have changed, been hidden or deleted, so
 * nothing here points at it with a foreign key), and a snapshot of its content then, against
 * which "what changed in the original since" is worked out.
 */
export const unitCopies = pgTable('unit_copies', {
  unitId: uuid()
    .primaryKey()
    .references(() => units.id, { onDelete: 'cascade' }),
  sourceUnitId: uuid().notNull(),
  sourceVersion: integer().notNull(),
  sourceTitle: text().notNull(),
  sourceOwnerName: text().notNull(),
  copiedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  /** The original's content when copied (a UnitSnapshot of server/reuse/snapshot.ts). */
  snapshot: jsonb().notNull(),
});
