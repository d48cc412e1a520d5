/**
 * A person's calendar feed: the prep tasks of their lessons (units they author, lessons they
 * cover as relief) from today to eight weeks ahead in the school's timezone, through the same
 * prep calendar as a lesson's own .ics file (alarms included).
 */
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Tx } from '../db/client.js';
import { lessons, schools, unitCoauthors, units } from '../db/schema/index.js';
import { authorsUnit, type Actor } from '../auth/policy.js';
import { loadLessonPack, loadPrintContext } from '../pdf/load.js';
import type { LessonPackModel } from '../pdf/model.js';
import { prepCalendar } from './prep-calendar.js';

/** How far ahead the feed looks. */
export const FEED_WEEKS = 8;

/** The lessons that are the person's own from today to eight weeks ahead, in time order. */
async function ownLessons(tx: Tx, actor: Actor, from: string, to: string): Promise<string[]> {
  const rows = await tx
    .select({
      id: lessons.id,
      unitId: units.id,
      ownerId: units.ownerId,
      visibility: units.visibility,
      reliefTeacherId: lessons.reliefTeacherId,
    })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .where(
      and(
        eq(lessons.schoolId, actor.schoolId),
        gte(lessons.startsAt, from),
        lt(lessons.startsAt, to),
      ),
    )
    .orderBy(asc(lessons.startsAt));
  const unitIds = [...new Set(rows.map((r) => r.unitId))];
  const co = unitIds.length
    ? await tx.select().from(unitCoauthors).where(inArray(unitCoauthors.unitId, unitIds))
    : [];
  return rows
    .filter(
      (r) =>
        r.reliefTeacherId === actor.id ||
        authorsUnit(actor, {
          schoolId: actor.schoolId,
          ownerId: r.ownerId,
          visibility: r.visibility,
          coauthorIds: co.filter((c) => c.unitId === r.unitId).map((c) => c.userId),
        }),
    )
    .map((r) => r.id);
}

/** The iCalendar text of a person's feed at `now`. */
export async function feedCalendar(
  tx: Tx,
  actor: Actor,
  now: Date,
  appUrl: string,
): Promise<string> {
  const [school] = await tx
    .select({ timezone: schools.timezone })
    .from(schools)
    .where(eq(schools.id, actor.schoolId));
  const zone = school?.timezone ?? 'UTC';
  const today = DateTime.fromJSDate(now, { zone }).startOf('day');
  const ids = await ownLessons(
    tx,
    actor,
    today.toISODate()!,
    today.plus({ weeks: FEED_WEEKS }).toISODate()!,
  );
  const packs: LessonPackModel[] = [];
  for (const id of ids) {
    const pack = await loadLessonPack(tx, id);
    if (pack) packs.push(pack);
  }
  const print = await loadPrintContext(tx, actor.schoolId, now);
  return prepCalendar({
    name: `Trayplan prep: ${actor.name || actor.email}`,
    timezone: print.timezone,
    generatedAt: print.generatedAt,
    lessons: packs,
    lessonUrl: (id) => `${appUrl}/lessons/${id}/prep`,
  });
}
