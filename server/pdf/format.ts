/**
 * Dates and clock times as a teacher reads them on paper, always in the school's timezone.
 * Formats are unambiguous in any English locale: the month is a word, times carry am/pm.
 */
import { DateTime } from 'luxon';

const LOCALE = 'en-AU';

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

/** `11:10 am` of an instant (ISO with offset) in the zone. */
export function clockTime(iso: string, timezone: string): string {
  return zoned(iso, timezone).toFormat('h:mm a');
}

/** `11:10 am` of a wall-clock `2026-07-28T11:10`. */
export function localClockTime(value: string, timezone: string): string {
  return local(value, timezone).toFormat('h:mm a');
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
    ? dt.toFormat('h:mm a')
    : dt.toFormat('ccc d LLL, h:mm a');
}

/** `Tue 28 Jul 2026, 6:32 pm ACST`: when a file was made, in the school's zone. */
export function generatedLabel(generatedAt: string, timezone: string): string {
  return zoned(generatedAt, timezone).toFormat('ccc d LLL yyyy, h:mm a ZZZZ');
}

/** `3 students`, `1 student`. */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** `a, b and c`. */
export function listing(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
