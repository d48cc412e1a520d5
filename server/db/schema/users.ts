import { sql } from 'drizzle-orm';
import { index, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { schools } from './schools.js';
import { ROLES } from '../../../shared/schemas/common.js';
import { MEMBER_STATUSES } from '../../../shared/schemas/members.js';

/** A person with a role in one school. `status` is active, invited or deactivated. */
export const users = pgTable(
  'users',
  {
    id: uuid().primaryKey().defaultRandom(),
    schoolId: uuid()
      .notNull()
      .references(() => schools.id, { onDelete: 'cascade' }),
    /**
     * Stored lower-case. A person has one joined account across Trayplan; invitations of the same
     * address may wait in several schools (an admin must not learn that the address belongs to
     * another school), and only one of them can ever be accepted.
     */
    email: text().notNull(),
    name: text().notNull().default(''),
    role: text({ enum: ROLES }).notNull(),
    status: text({ enum: MEMBER_STATUSES }).notNull().default('active'),
    /** PHC string of an argon2id hash; null until an invitation is accepted. */
    passwordHash: text(),
    lastSignInAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('users_school_idx').on(t.schoolId),
    uniqueIndex('users_school_email_idx').on(t.schoolId, t.email),
    uniqueIndex('users_joined_email_idx')
      .on(t.email)
      .where(sql`${t.status} <> 'invited'`),
  ],
);

/** One-time invitation links; only the SHA-256 of the token is stored. */
export const invitations = pgTable('invitations', {
  id: uuid().primaryKey().defaultRandom(),
  userId: uuid()
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text().notNull().unique(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  usedAt: timestamp({ withTimezone: true }),
  invitedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

/** One-time password reset links; only the SHA-256 of the token is stored. */
export const passwordResets = pgTable('password_resets', {
  id: uuid().primaryKey().defaultRandom(),
  userId: uuid()
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text().notNull().unique(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  usedAt: timestamp({ withTimezone: true }),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
