import { pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

/** A school: every record of Trayplan belongs to exactly one. */
export const schools = pgTable('schools', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  /** IANA timezone name; every wall-clock time of the school is read in it. */
  timezone: text().notNull().default('Australia/Adelaide'),
  paperSize: text().notNull().default('A4'),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
