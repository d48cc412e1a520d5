/**
 * A relief teacher's day: the lessons assigned to them today (school's timezone) in time order,
 * with what they need to run each one: room, class, notes, build instructions by name, and the
 * prep tasks not yet past their done-by time.
 */
import { and, asc, eq, gte, lt } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Tx } from '../db/client.js';
import { lessons, schools } from '../db/schema/index.js';
import type { Actor } from '../auth/policy.js';
import { loadLessonPack } from '../pdf/load.js';
import type { ReliefDay } from '../../shared/schemas/sharing.js';
import { activitiesWithAttachments } from './view.js';

export async function reliefDay(tx: Tx, actor: Actor, now: Date): Promise<ReliefDay> {
  const [school] = await tx
    .select({ timezone: schools.timezone })
    .from(schools)
    .where(eq(schools.id, actor.schoolId));
  const zone = school?.timezone ?? 'UTC';
  const today = DateTime.fromJSDate(now, { zone }).startOf('day');
  const rows = await tx
    .select({ id: lessons.id })
    .from(lessons)
    .where(
      and(
        eq(lessons.schoolId, actor.schoolId),
        eq(lessons.reliefTeacherId, actor.id),
        gte(lessons.startsAt, today.toISODate()!),
        lt(lessons.startsAt, today.plus({ days: 1 }).toISODate()!),
      ),
    )
    .orderBy(asc(lessons.startsAt));
  const day: ReliefDay = { date: today.toISODate()!, lessons: [] };
  for (const { id } of rows) {
    const pack = await loadLessonPack(tx, id);
    if (!pack) continue;
    day.lessons.push({
      id,
      title: pack.title,
      unitTitle: pack.unitTitle,
      className: pack.className,
      startsAt: pack.startsAt,
      endsAt: pack.endsAt,
      periodName: pack.periodName,
      room: pack.room,
      reliefNotes: pack.reliefNotes,
      plannable: pack.plan !== null,
      openTasks: (pack.plan?.tasks ?? []).filter((t) => Date.parse(t.doneBy) > now.getTime()),
      activities: await activitiesWithAttachments(tx, id),
    });
  }
  return day;
}
