/**
 * Dates and clock times as a teacher reads them on paper, always in the school's timezone.
 * Formats are unambiguous in any English locale: the month is a word, times carry am/pm.
 */
import { DateTime } from 'luxon';
import { clockTime as schoolClock, SCHOOL_LOCALE } from '../../shared/text/clock.js';

const LOCALE = SCHOOL_LOCALE;

function zoned(iso: string, timezone: string): DateTime {
  const dt = DateTime.fromISO(iso, { setZone: true });
  if (!dt.isValid) throw new RangeError(`Not an ISO date-time: ${iso}`);
  return dt.setZone(timezone).setLocale(LOCALE);
}

/** A wall-clock `2026-07-28T11:10` of the school, as a DateTime in its zone. */
function local(value: string, timezone: string): DateTime {
  const dt = DateTime.fromISO(value, { zone: timezone });
  if (!dt.isValid) throw new RangeError(`Not a local date-time: ${value}`);
  return dt.setLocale(LOCALE);
}

/** The wall-clock digits of a DateTime, for the one clock style of app and printables. */
const wall = (dt: DateTime) => schoolClock(dt.toFormat("yyyy-MM-dd'T'HH:mm"));

/** `11:10 am` of an instant (ISO with offset) in the zone. */
export function clockTime(iso: string, timezone: string): string {
  return wall(zoned(iso, timezone));
}

/** `11:10 am` of a wall-clock `2026-07-28T11:10`. */
export function localClockTime(value: string, timezone: string): string {
  return wall(local(value, timezone));
}

/** `Tuesday 28 July 2026` of a wall-clock date-time or date. */
export function longDate(value: string, timezone: string): string {
  return local(value, timezone).toFormat('cccc d LLLL yyyy');
}

/** `Tue 28 Jul 2026` of a wall-clock date-time or date. */
export function shortDate(value: string, timezone: string): string {
  return local(value, timezone).toFormat('ccc d LLL yyyy');
}

/**
 * A task's time: `7:55 am` on the lesson's own day, `Mon 27 Jul, 4:10 pm` on another day (a
 * long charge can start the afternoon before).
 */
export function taskTime(iso: string, lessonDay: string, timezone: string): string {
  const dt = zoned(iso, timezone);
  return dt.toISODate() === lessonDay.slice(0, 10)
    ? wall(dt)
    : `${dt.toFormat('ccc d LLL')}, ${wall(dt)}`;
}

/** `Tue 28 Jul 2026, 6:32 pm ACST`: when a file was made, in the school's zone. */
export function generatedLabel(generatedAt: string, timezone: string): string {
  const dt = zoned(generatedAt, timezone);
  return `${dt.toFormat('ccc d LLL yyyy')}, ${wall(dt)} ${dt.toFormat('ZZZZ')}`;
}

// The one plural and list helper of app and printables.
export { plural, listWords as listing } from '../../shared/text/plural.js';
