/**
 * Lessons: read (with activities, materials and attachments in order), edit with a version,
 * delete, reorder activities, and add an activity. A lesson is read as its unit is (or by the
 * relief teacher it is assigned to) and edited by its unit's authors. The lesson's prep plan
 * (./prep.ts), printables (./printables.ts) and share links (./share-links.ts) are sub-routers
 * of this one.
 */
import { Router } from 'express';
import { eq, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { activities, lessons } from '../db/schema/index.js';
import { parse, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { activityOrderSchema } from '../../shared/schemas/lessons.js';
import { editableLesson, readableLesson } from '../planning/access.js';
import { createActivity } from '../planning/activity-write.js';
import { updateLesson } from '../planning/lesson-write.js';
import { lessonDetail } from '../planning/lessons.js';
import { prepRouter } from './prep.js';
import { lessonPrintablesRouter } from './printables.js';
import { lessonTraysRouter } from './lesson-trays.js';
import { lessonShareLinksRouter } from './share-links.js';
import { deleteVersion, sameMembers, stale, staleOrder, writeOrder } from '../db/versions.js';
import {
  lockedLesson,
  recordActivitiesReordered,
  recordActivityChange,
  recordLessonEdit,
  recordLessonRemoved,
} from '../reuse/record.js';
import { loadLessonSnapshot } from '../reuse/snapshot.js';

export function lessonsRouter(ctx: AppContext): Router {
  const router = Router();
  router.use(prepRouter(ctx));
  router.use(lessonPrintablesRouter(ctx));
  router.use(lessonTraysRouter(ctx));
  router.use('/:lessonId/share-links', lessonShareLinksRouter(ctx));

  router.get('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const lesson = await ctx.db.transaction(
      async (tx) => {
        await readableLesson(tx, actor, id);
        return lessonDetail(tx, actor, id);
      },
      // One snapshot: the activities and their materials are read as of the same moment.
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    res.json(lesson);
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const lesson = await ctx.db.transaction(async (tx) => {
      const facts = await editableLesson(tx, actor, id);
      const before = await lockedLesson(tx, id);
      const lesson = await updateLesson(tx, actor, id, req.body);
      if (before)
        await recordLessonEdit(tx, actor, facts.unitId, before, await loadLessonSnapshot(tx, id));
      return lesson;
    });
    res.json(lesson);
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const version = deleteVersion(req.query);
    await ctx.db.transaction(async (tx) => {
      const facts = await editableLesson(tx, actor, id);
      const [row] = await tx
        .select({ version: lessons.version })
        .from(lessons)
        .where(eq(lessons.id, id))
        .for('update');
      if (version !== undefined && row?.version !== version)
        throw stale('lesson', await lessonDetail(tx, actor, id));
      const before = await loadLessonSnapshot(tx, id);
      if (before) await recordLessonRemoved(tx, actor, facts.unitId, before);
      // Activities, materials, attachments and bookings go with it (foreign keys cascade).
      await tx.delete(lessons).where(eq(lessons.id, id));
    });
    res.status(204).end();
  });

  router.put('/:id/activity-order', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const lesson = await ctx.db.transaction(async (tx) => {
      const facts = await editableLesson(tx, actor, id);
      const body = parse(activityOrderSchema, req.body);
      // Locked until commit: no activity is appended meanwhile.
      const [row] = await tx
        .select({ version: lessons.version })
        .from(lessons)
        .where(eq(lessons.id, id))
        .for('update');
      if (row?.version !== body.version) throw stale('lesson', await lessonDetail(tx, actor, id));
      const current = await tx
        .select({ id: activities.id })
        .from(activities)
        .where(eq(activities.lessonId, id));
      if (
        !sameMembers(
          body.activityIds,
          current.map((a) => a.id),
        )
      ) {
        throw staleOrder('lesson', 'activities', await lessonDetail(tx, actor, id));
      }
      const before = await loadLessonSnapshot(tx, id);
      if (before && before.activities.some((a, i) => a.id !== body.activityIds[i]))
        await recordActivitiesReordered(tx, actor, facts.unitId, before);
      await writeOrder(tx, activities, body.activityIds);
      await tx
        .update(lessons)
        .set({ version: sql`${lessons.version} + 1`, updatedAt: sql`now()` })
        .where(eq(lessons.id, id));
      return lessonDetail(tx, actor, id);
    });
    res.json(lesson);
  });

  router.post('/:id/activities', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const activity = await ctx.db.transaction(async (tx) => {
      const lesson = await editableLesson(tx, actor, id);
      const activity = await createActivity(tx, lesson, req.body);
      const after = await loadLessonSnapshot(tx, id);
      await recordActivityChange(tx, actor, lesson.unitId, activity.id, null, after);
      return activity;
    });
    res.status(201).json(activity);
  });

  return router;
}
