/**
 * Reminder e-mails a person opts into on the Account page: "start charging … by …" a chosen lead
 * time before each charge task of the lessons they run, and a morning summary of the day's prep.
 */
import * as z from 'zod';
import { VERSION_MAX } from './text.js';

/** Lead times offered (minutes); the server takes any whole number in this range. */
export const LEAD_MINUTES_MIN = 5;
export const LEAD_MINUTES_MAX = 720;
export const LEAD_MINUTE_CHOICES = [15, 30, 45, 60, 90, 120, 180, 240] as const;

const CLOCK = /^([01]\d|2[0-3]):[0-5]\d$/;
const CLOCK_MESSAGE = 'Give a time of day like 07:00.';
const LEAD_MESSAGE = `Use a whole number of minutes from ${LEAD_MINUTES_MIN} to ${LEAD_MINUTES_MAX}.`;

/** GET /api/account/reminders (and the PATCH's answer); version 0 until first saved. */
export const reminderPreferencesSchema = z.object({
  chargeReminders: z.boolean(),
  leadMinutes: z.int(),
  morningSummary: z.boolean(),
  /** `HH:MM` on the school's clock. */
  summaryTime: z.string(),
  version: z.int().min(0),
});
export type ReminderPreferences = z.infer<typeof reminderPreferencesSchema>;

/** PATCH /api/account/reminders: the version read (0 when never saved) and what changes. */
export const reminderPreferencesUpdateSchema = z.strictObject({
  version: z
    .int({ error: 'Send the version you loaded.' })
    .min(0, { error: 'Send the version you loaded.' })
    .max(VERSION_MAX, { error: 'Send the version you loaded.' }),
  chargeReminders: z.boolean({ error: 'Turn charging reminders on or off.' }).optional(),
  leadMinutes: z
    .int({ error: LEAD_MESSAGE })
    .min(LEAD_MINUTES_MIN, { error: LEAD_MESSAGE })
    .max(LEAD_MINUTES_MAX, { error: LEAD_MESSAGE })
    .optional(),
  morningSummary: z.boolean({ error: 'Turn the morning summary on or off.' }).optional(),
  summaryTime: z.string({ error: CLOCK_MESSAGE }).regex(CLOCK, { error: CLOCK_MESSAGE }).optional(),
});
export type ReminderPreferencesUpdate = z.infer<typeof reminderPreferencesUpdateSchema>;

/** What a person who never saved their choices has: everything off. */
export const DEFAULT_REMINDER_PREFERENCES: ReminderPreferences = {
  chargeReminders: false,
  leadMinutes: 30,
  morningSummary: false,
  summaryTime: '07:00',
  version: 0,
};
