import { index, json, pgTable, timestamp, varchar } from 'drizzle-orm/pg-core';

/** connect-pg-simple's table, made by a migration (its own creation reads a file at run time). */
export const session = pgTable(
  'session',
  {
    sid: varchar().primaryKey(),
    sess: json().notNull(),
    expire: timestamp({ precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);
