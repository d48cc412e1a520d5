/** What a relief teacher needs: the lessons assigned to them, and who can be assigned. */
import { Router } from 'express';
import { and, asc, eq } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { classes, lessons, units, users } from '../db/schema/index.js';
import { forbidden } from '../http.js';
import { requireActor } from '../auth/session.js';
import { toLocal } from '../planning/format.js';
import { reliefDay } from '../sharing/today.js';

export function reliefRouter(ctx: AppContext): Router {
  const router = Router();

  // GET /api/relief/lessons: every lesson assigned to the signed-in relief teacher, in time order.
  router.get('/lessons', async (req, res) => {
    const actor = requireActor(req);
    if (actor.role !== 'relief') throw forbidden('Only relief teachers have assigned lessons.');
    const rows = await ctx.db
      .select({
        id: lessons.id,
        title: lessons.title,
        startsAt: lessons.startsAt,
        endsAt: lessons.endsAt,
        room: lessons.room,
        unitId: units.id,
        unitTitle: units.title,
        className: classes.name,
        reliefNotes: lessons.reliefNotes,
      })
      .from(lessons)
      .innerJoin(units, eq(units.id, lessons.unitId))
      .innerJoin(classes, eq(classes.id, lessons.classId))
      .where(and(eq(lessons.schoolId, actor.schoolId), eq(lessons.reliefTeacherId, actor.id)))
      .orderBy(asc(lessons.startsAt));
    res.json({
      lessons: rows.map((r) => ({
        ...r,
        startsAt: toLocal(r.startsAt),
        endsAt: toLocal(r.endsAt),
      })),
    });
  });

  // GET /api/relief/today: the relief teacher's lessons of today (school's timezone) in time
  // order, each with its room, class, notes, build instructions and the prep tasks still open.
  router.get('/today', async (req, res) => {
    const actor = requireActor(req);
    if (actor.role !== 'relief') throw forbidden('Only relief teachers have assigned lessons.');
    const now = new Date();
    res.json(
      await ctx.db.transaction((tx) => reliefDay(tx, actor, now), {
        isolationLevel: 'repeatable read',
        accessMode: 'read only',
      }),
    );
  });

  // GET /api/relief/teachers: the school's active relief teachers, for assigning a lesson.
  router.get('/teachers', async (req, res) => {
    const actor = requireActor(req);
    if (actor.role !== 'teacher' && actor.role !== 'admin') throw forbidden();
    const rows = await ctx.db
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(
        and(
          eq(users.schoolId, actor.schoolId),
          eq(users.role, 'relief'),
          eq(users.status, 'active'),
        ),
      )
      .orderBy(asc(users.name));
    res.json({ teachers: rows });
  });

  return router;
}
