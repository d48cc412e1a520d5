/**
 * GET /api/bookings?from=&to=: the school's tub bookings day by day, each lesson with the tubs it
 * books and whether another lesson at an overlapping time books one of them too. Which lessons
 * show follows the conflicts view (the lessons the actor may read, through the policy); whether a
 * booking is double-booked comes from the one conflict query (prep/booking-conflicts.ts).
 */
import { Router } from 'express';
import { asc, eq, inArray } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { kitTypes, lessonTubs, tubs } from '../db/schema/index.js';
import { parse } from '../http.js';
import { requireActor } from '../auth/session.js';
import { authorize } from '../auth/policy.js';
import { toLocal } from '../planning/format.js';
import { bookingConflictsOf } from '../prep/booking-conflicts.js';
import { naturalCompare } from '../../shared/prep/index.js';
import {
  bookingsQuerySchema,
  type Booking,
  type BookingsResponse,
} from '../../shared/schemas/bookings.js';
import { readableLessons } from './agenda.js';

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
        const rows = await readableLessons(tx, actor, q.from, q.to, false);
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
