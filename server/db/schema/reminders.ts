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
 * A person's reminder e-mails, off until they turn them on (Account page). No row means never
 * saved: the defaults, answered as version 0.
 */
export const reminderPreferences = pgTable('reminder_preferences', {
  userId: uuid()
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  /** Whether "start charging … by …" is sent before each charge task of their lessons. */
  chargeReminders: boolean().notNull().default(false),
  /** How long before a charge task's start its reminder is sent. */
  leadMinutes: integer().notNull().default(30),
  /** Whether a summary of the day's prep is sent each morning there is any. */
  morningSummary: boolean().notNull().default(false),
  /** When the morning summary is sent, `HH:MM` on the school's clock. */
  summaryTime: text().notNull().default('07:00'),
  version: integer().notNull().default(1),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

/**
 * Every reminder sent, claimed by INSERT … ON CONFLICT DO NOTHING in the transaction that queues
 * its e-mail: of any number of sweeps on any number of instances exactly one sends it.
 * `reminderKey` names it: `charge|<lesson>|<task key>|<start>` or `summary|<school date>`.
 */
export const sentReminders = pgTable(
  'sent_reminders',
  {
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    reminderKey: text().notNull(),
    kind: text({ enum: ['charge', 'summary'] }).notNull(),
    lessonId: uuid().references(() => lessons.id, { onDelete: 'cascade' }),
    dueAt: timestamp({ withTimezone: true }).notNull(),
    sentAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.userId, t.reminderKey] }),
    index('sent_reminders_sent_at_idx').on(t.sentAt),
  ],
);
