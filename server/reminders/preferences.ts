/** A person's reminder choices, read and saved with a version (409 on a stale one). */
import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client.js';
import { reminderPreferences } from '../db/schema/index.js';
import { stale, versionedUpdate } from '../db/versions.js';
import {
  DEFAULT_REMINDER_PREFERENCES,
  type ReminderPreferences,
  type ReminderPreferencesUpdate,
} from '../../shared/schemas/reminders.js';

export async function readPreferences(db: Db | Tx, userId: string): Promise<ReminderPreferences> {
  const [row] = await db
    .select()
    .from(reminderPreferences)
    .where(eq(reminderPreferences.userId, userId));
  if (!row) return DEFAULT_REMINDER_PREFERENCES;
  return {
    chargeReminders: row.chargeReminders,
    leadMinutes: row.leadMinutes,
    morningSummary: row.morningSummary,
    summaryTime: row.summaryTime,
    version: row.version,
  };
}

/**
 * Saves the changes on the version read. Version 0 (never saved) inserts the first row; if
 * someone saved meanwhile (another tab) the insert finds it and the edit is stale, as any other.
 */
export async function savePreferences(
  tx: Tx,
  userId: string,
  { version, ...change }: ReminderPreferencesUpdate,
): Promise<ReminderPreferences> {
  const saved =
    version === 0
      ? (
          await tx
            .insert(reminderPreferences)
            .values({ ...DEFAULT_REMINDER_PREFERENCES, ...change, userId, version: 1 })
            .onConflictDoNothing()
            .returning()
        ).length > 0
      : await versionedUpdate(
          tx,
          reminderPreferences,
          eq(reminderPreferences.userId, userId),
          version,
          {
            ...change,
            updatedAt: new Date(),
          },
        );
  const current = await readPreferences(tx, userId);
  if (!saved) throw stale('reminder setting', current);
  return current;
}
