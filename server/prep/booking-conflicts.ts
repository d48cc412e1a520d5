/**
 * Booking conflicts of one lesson (PREP-RULES.md, "Across lessons"): other lessons of the school
 * whose [startsAt, endsAt) overlaps this one's and that book a tub it books too. Lesson times are
 * wall-clock times of one school, so they compare as they are.
 */
import { sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { naturalCompare } from '../../shared/prep/index.js';
import { listWords } from '../../shared/text/plural.js';
import { clockSpan } from '../../shared/text/clock.js';
import type { BookingConflict } from '../../shared/schemas/lessons.js';

/** `2026-07-28 11:10:00` or a Date from the driver, as local `2026-07-28T11:10`. */
function local(value: unknown): string {
  return String(value).replace(' ', 'T').slice(0, 16);
}

/** `Tue 28 Jul` of a local date-time (a calendar date: UTC in, UTC out). */
function day(value: string): string {
  const [y, m, d] = value.slice(0, 10).split('-').map(Number) as [number, number, number];
  return new Intl.DateTimeFormat('en-AU', {
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    timeZone: 'UTC',
  })
    .format(Date.UTC(y, m - 1, d))
    .replace(',', '');
}

/** Plain code-unit order: the same on every machine, whatever its locale. */
const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Earliest first, then by what the message shows (end, class, title, tubs), then by lesson id:
 * a total order, so two lessons booked alike list the same warnings in the same order (a copy's
 * plan equals the same lesson written from scratch), and a reload never reshuffles them.
 */
function byWhenThenId(a: BookingConflict, b: BookingConflict): number {
  return (
    cmp(a.startsAt, b.startsAt) ||
    cmp(a.endsAt, b.endsAt) ||
    cmp(a.className, b.className) ||
    cmp(a.title, b.title) ||
    cmp(a.tubs.join('\n'), b.tubs.join('\n')) ||
    cmp(a.lessonId, b.lessonId)
  );
}

/** The lessons that double-book this lesson's tubs, earliest first, each with its message. */
export async function bookingConflicts(tx: Tx, lessonId: string): Promise<BookingConflict[]> {
  return (await bookingConflictsOf(tx, [lessonId])).get(lessonId) ?? [];
}

/**
 * The same for many lessons in one query (the school-wide bookings view): each lesson id that has
 * conflicts maps to them, earliest first; a lesson without any is absent from the map.
 */
export async function bookingConflictsOf(
  tx: Tx,
  lessonIds: readonly string[],
): Promise<Map<string, BookingConflict[]>> {
  const out = new Map<string, BookingConflict[]>();
  if (lessonIds.length === 0) return out;
  const ids = sql.join(
    lessonIds.map((id) => sql`${id}`),
    sql`, `,
  );
  const result = await tx.execute(sql`
    SELECT l.id AS of_id, o.id, o.title, c.name AS class_name,
           to_char(o.starts_at, 'YYYY-MM-DD"T"HH24:MI') AS starts_at,
           to_char(o.ends_at, 'YYYY-MM-DD"T"HH24:MI') AS ends_at,
           array_agg(DISTINCT t.label) AS tubs
      FROM lessons l
      JOIN lesson_tubs lt ON lt.lesson_id = l.id
      JOIN lesson_tubs ot ON ot.tub_id = lt.tub_id AND ot.lesson_id <> l.id
      JOIN lessons o ON o.id = ot.lesson_id AND o.school_id = l.school_id
      JOIN classes c ON c.id = o.class_id
      JOIN tubs t ON t.id = lt.tub_id
     WHERE l.id IN (${ids})
       AND o.starts_at < l.ends_at AND l.starts_at < o.ends_at
     GROUP BY l.id, o.id, o.title, c.name, o.starts_at, o.ends_at
     ORDER BY l.id, o.starts_at, o.id`);
  const rows = result.rows as {
    of_id: string;
    id: string;
    title: string;
    class_name: string;
    starts_at: string;
    ends_at: string;
    tubs: string[];
  }[];
  for (const r of rows) {
    const tubs = [...r.tubs].sort(naturalCompare);
    const startsAt = local(r.starts_at);
    const endsAt = local(r.ends_at);
    const list = out.get(r.of_id) ?? [];
    list.push({
      lessonId: r.id,
      title: r.title,
      className: r.class_name,
      startsAt,
      endsAt,
      tubs,
      message:
        `Double-booked: ${listWords(tubs)} ${tubs.length === 1 ? 'is' : 'are'} also booked for ` +
        `“${r.title}” (${r.class_name}, ${day(startsAt)}, ${clockSpan(startsAt, endsAt)}). ` +
        'Move one lesson or book other tubs.',
    });
    out.set(r.of_id, list);
  }
  for (const list of out.values()) list.sort(byWhenThenId);
  return out;
}
