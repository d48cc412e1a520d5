/**
 * GET /api/bookings?from=&to=: the school's tub bookings day by day, each lesson with the tubs it
 * books and whether another lesson at an overlapping time books one of them too. Admins, leads
 * and teachers see every lesson of their school that books tubs; a relief teacher the lessons
 * they may read (policy.ts, `seesSchoolBookings`); another school's lessons never. Whether a
 * booking is double-booked comes from the one conflict query (prep/booking-conflicts.ts).
 */
import { Router } from 'express';
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import {
  classes,
  kitTypes,
  lessons,
  lessonTubs,
  tubs,
  unitCoauthors,
  units,
} from '../db/schema/index.js';
import { parse } from '../http.js';
import { requireActor } from '../auth/session.js';
import { authorize, canReadLesson, seesSchoolBookings, type Actor } from '../auth/policy.js';
import { toLocal } from '../planning/format.js';
import { bookingConflictsOf } from '../prep/booking-conflicts.js';
import { naturalCompare } from '../../shared/prep/index.js';
import {
  bookingsQuerySchema,
  type Booking,
  type BookingsResponse,
} from '../../shared/schemas/bookings.js';

interface BookedLesson {
  id: string;
  title: string;
  startsAt: string;
  endsAt: string;
  unitTitle: string;
  className: string;
  /** Whether the actor may open the lesson. */
  readable: boolean;
}

/** The school's lessons starting in [from, to) that the actor sees here, in time order. */
async function bookedLessons(
  tx: Tx,
  actor: Actor,
  from: string,
  to: string,
): Promise<BookedLesson[]> {
  const rows = await tx
    .select({
      id: lessons.id,
      title: lessons.title,
      startsAt: lessons.startsAt,
      endsAt: lessons.endsAt,
      reliefTeacherId: lessons.reliefTeacherId,
      unitId: units.id,
      unitTitle: units.title,
      ownerId: units.ownerId,
      visibility: units.visibility,
      className: classes.name,
    })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .where(
      and(
        eq(lessons.schoolId, actor.schoolId),
        gte(lessons.startsAt, from),
        lt(lessons.startsAt, to),
      ),
    )
    .orderBy(asc(lessons.startsAt), asc(lessons.id));
  const unitIds = [...new Set(rows.map((r) => r.unitId))];
  const co = unitIds.length
    ? await tx.select().from(unitCoauthors).where(inArray(unitCoauthors.unitId, unitIds))
    : [];
  const school = seesSchoolBookings(actor, actor.schoolId);
  return rows.flatMap((r) => {
    const facts = {
      schoolId: actor.schoolId,
      ownerId: r.ownerId,
      visibility: r.visibility,
      coauthorIds: co.filter((c) => c.unitId === r.unitId).map((c) => c.userId),
    };
    const readable = canReadLesson(actor, facts, r);
    if (!readable && !school) return [];
    return [
      {
        id: r.id,
        title: r.title,
        startsAt: r.startsAt,
        endsAt: r.endsAt,
        unitTitle: readable ? r.unitTitle : '',
        className: r.className,
        readable,
      },
    ];
  });
}

/** Every local date in [from, to), as `YYYY-MM-DD` (calendar dates: UTC arithmetic). */
function datesBetween(from: string, to: string): string[] {
  const out: string[] = [];
  for (let t = Date.parse(`${from}T00:00:00Z`); t < Date.parse(`${to}T00:00:00Z`); t += 86_400_000)
    out.push(new Date(t).toISOString().slice(0, 10));
  return out;
}

export function bookingsRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const q = parse(bookingsQuerySchema, req.query);
    const body = await ctx.db.transaction(
      async (tx): Promise<BookingsResponse> => {
        const rows = await bookedLessons(tx, actor, q.from, q.to);
        const ids = rows.map((r) => r.id);
        const booked = ids.length
          ? await tx
              .select({
                lessonId: lessonTubs.lessonId,
                id: tubs.id,
                label: tubs.label,
                kitTypeName: kitTypes.name,
              })
              .from(lessonTubs)
              .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
              .innerJoin(kitTypes, eq(kitTypes.id, tubs.kitTypeId))
              .where(inArray(lessonTubs.lessonId, ids))
              .orderBy(asc(tubs.id))
          : [];
        const conflicts = await bookingConflictsOf(tx, ids);
        const days = new Map(datesBetween(q.from, q.to).map((d) => [d, [] as Booking[]]));
        // readableLessons answers in time order, so each day's list is in time order too.
        for (const r of rows) {
          const startsAt = toLocal(r.startsAt);
          const mine = conflicts.get(r.id) ?? [];
          days.get(startsAt.slice(0, 10))?.push({
            lessonId: r.id,
            lessonTitle: r.title,
            unitTitle: r.unitTitle,
            readable: r.readable,
            className: r.className,
            startsAt,
            endsAt: toLocal(r.endsAt),
            tubs: booked
              .filter((b) => b.lessonId === r.id)
              .map(({ id, label, kitTypeName }) => ({ id, label, kitTypeName }))
              .sort((a, b) => naturalCompare(a.label, b.label)),
            conflict: mine.length > 0,
            conflicts: mine,
          });
        }
        return { days: [...days].map(([date, bookings]) => ({ date, bookings })) };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    res.json(body);
  });
  return router;
}
