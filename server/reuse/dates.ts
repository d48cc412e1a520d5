/**
 * Moving a copied unit's lessons to a new first date: every lesson by the same number of whole
 * days on the school's calendar, keeping its time of day, even across a daylight-saving change
 * (where the elapsed time between old and new is then a whole number of days ± an hour).
 */
import { DateTime } from 'luxon';

/** Whole calendar days from `from` to `to` (both `YYYY-MM-DD`); negative when `to` is earlier. */
export function daysBetween(from: string, to: string): number {
  const a = DateTime.fromISO(from, { zone: 'utc' });
  const b = DateTime.fromISO(to, { zone: 'utc' });
  return Math.round(b.diff(a, 'days').days);
}

/**
 * A local `YYYY-MM-DDTHH:MM` in `zone` moved by `days` calendar days, same wall-clock time. A
 * time that does not exist on the new day (inside a spring-forward gap) comes out as Luxon
 * normalises it, an hour later; lessons are never planned at that hour in practice.
 */
export function shiftLocal(local: string, days: number, zone: string): string {
  if (days === 0) return local;
  const moved = DateTime.fromISO(local, { zone }).plus({ days });
  return moved.toFormat("yyyy-MM-dd'T'HH:mm");
}

export interface SchoolCalendar {
  /** Listed non-teaching days: date → reason. */
  nonTeaching: Map<string, string>;
  /** The school's terms (none listed means every weekday is a teaching day). */
  terms: { name: string; startsOn: string; endsOn: string }[];
}

/** Why `date` (`YYYY-MM-DD`) is not a teaching day at the school, or null when it is one. */
export function notTeachingReason(date: string, calendar: SchoolCalendar): string | null {
  const weekday = DateTime.fromISO(date, { zone: 'utc' }).weekday;
  if (weekday === 6) return 'a Saturday';
  if (weekday === 7) return 'a Sunday';
  const listed = calendar.nonTeaching.get(date);
  if (listed !== undefined) return listed ? `a non-teaching day (${listed})` : 'a non-teaching day';
  if (calendar.terms.length && !calendar.terms.some((t) => t.startsOn <= date && date <= t.endsOn))
    return 'outside the school’s terms';
  return null;
}
