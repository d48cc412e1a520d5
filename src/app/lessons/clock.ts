/**
 * Wall-clock formatting of the times the API sends. Prep times are ISO 8601 with the school's
 * offset (`2026-07-28T07:55:00+09:30`) and lesson times are local (`2026-07-28T11:10`): both
 * already carry the school's wall-clock digits, so they are read from the text and never
 * converted to the browser's own timezone (a teacher abroad still sees the school's times).
 */

import { clockTime as schoolClock } from '../../../shared/text/clock';

const PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})/;
const DAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
}

function read(value: string): WallClock | null {
  const m = PATTERN.exec(value);
  if (!m) return null;
  const [year, month, day, hour, minute] = m.slice(1).map(Number) as [
    number,
    number,
    number,
    number,
    number,
  ];
  return { year, month, day, hour, minute };
}

/**
 * `7:55 am`, `12:00 pm`: the one clock style of app and printables (shared/text/clock.ts, the
 * school's locale through Intl).
 */
export function clockTime(value: string): string {
  return schoolClock(value);
}

/** `Tue 28 Jul 2026`; the weekday comes from the calendar date alone (no timezone involved). */
export function dayLabel(value: string, withYear = true): string {
  const t = read(value);
  if (!t) return value;
  const weekday = DAYS[new Date(Date.UTC(t.year, t.month - 1, t.day)).getUTCDay()];
  const base = `${weekday} ${t.day} ${MONTHS[t.month - 1]}`;
  return withYear ? `${base} ${t.year}` : base;
}

/** The `YYYY-MM-DD` part of a local or offset date-time. */
export function datePart(value: string): string {
  return value.slice(0, 10);
}

/** The clock time, with the day in front when it is not `sameDayAs`'s day (a charge the day before). */
export function clockOn(value: string, sameDayAs: string): string {
  return datePart(value) === datePart(sameDayAs)
    ? clockTime(value)
    : `${dayLabel(value, false)}, ${clockTime(value)}`;
}
