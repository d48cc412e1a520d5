/**
 * Activities: read, edit with a version (materials replaced whole), delete; and their
 * attachments (build instructions as PDF or images): upload, download, delete. Downloads are
 * under `/api/activities/attachments/:id`.
 */
import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { activities, attachments } from '../db/schema/index.js';
import { HttpError, notFound, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_TYPES } from '../../shared/schemas/lessons.js';
import { activityAccess, attachmentAccess } from '../planning/access.js';
import { updateActivity } from '../planning/activity-write.js';
import { activityDetail } from '../planning/lessons.js';
import { safeFilename } from '../planning/upload.js';
import { attachment } from '../downloads.js';
import { requireFile, singleFileUpload, sniffUpload } from '../uploads/index.js';
import { deleteVersion, stale } from '../db/versions.js';
import { lockedLesson, recordActivityChange } from '../reuse/record.js';
import { loadLessonSnapshot } from '../reuse/snapshot.js';

/** More than this many files on one activity is a mistake, not build instructions. */
const MAX_ATTACHMENTS = 20;

export function activitiesRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/attachments/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await attachmentAccess(ctx.db, actor, id, 'read');
    const [file] = await ctx.db.select().from(attachments).where(eq(attachments.id, id));
    if (!file) throw notFound('That attachment');
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Length', String(file.bytes.length));
    res.setHeader('Content-Disposition', attachment(file.filename));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Cache-Control', 'private, no-store');
    res.end(file.bytes);
  });

  router.delete('/attachments/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await ctx.db.transaction(async (tx) => {
      const { activityId, lesson } = await attachmentAccess(tx, actor, id, 'edit');
      const before = await lockedLesson(tx, lesson.id);
      await tx.delete(attachments).where(eq(attachments.id, id));
      const after = await loadLessonSnapshot(tx, lesson.id);
      await recordActivityChange(tx, actor, lesson.unitId, activityId, before, after);
    });
    res.status(204).end();
  });

  router.get('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await activityAccess(ctx.db, actor, id, 'read');
    res.json(await activityDetail(ctx.db, id));
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const activity = await ctx.db.transaction(async (tx) => {
      const lesson = await activityAccess(tx, actor, id, 'edit');
      // The lesson is locked first, as updateActivity locks it, so two edits never deadlock.
      const before = await lockedLesson(tx, lesson.id);
      const activity = await updateActivity(tx, lesson, id, req.body);
      const after = await loadLessonSnapshot(tx, lesson.id);
      await recordActivityChange(tx, actor, lesson.unitId, id, before, after);
      return activity;
    });
    res.json(activity);
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const version = deleteVersion(req.query);
    await ctx.db.transaction(async (tx) => {
      const lesson = await activityAccess(tx, actor, id, 'edit');
      const before = await lockedLesson(tx, lesson.id);
      const [row] = await tx
        .select({ version: activities.version })
        .from(activities)
        .where(eq(activities.id, id))
        .for('update');
      if (version !== undefined && row?.version !== version)
        throw stale('activity', await activityDetail(tx, id));
      await tx.delete(activities).where(eq(activities.id, id));
      await recordActivityChange(tx, actor, lesson.unitId, id, before, null);
    });
    res.status(204).end();
  });

  // Access is checked before the upload is read, so nobody else's 10 MB is ever buffered.
  router.post(
    '/:id/attachments',
    async (req, _res, next) => {
      const actor = requireActor(req);
      await activityAccess(ctx.db, actor, parseParams(idParamsSchema, req).id, 'check');
      next();
    },
    singleFileUpload({ maxBytes: ATTACHMENT_MAX_BYTES }),
    async (req, res) => {
      const actor = requireActor(req);
      const { id } = parseParams(idParamsSchema, req);
      const file = requireFile(req);
      const contentType = await sniffUpload(file.buffer, ATTACHMENT_TYPES);
      const filename = safeFilename(file.originalname, contentType);
      const saved = await ctx.db.transaction(async (tx) => {
        const lesson = await activityAccess(tx, actor, id, 'edit');
        const before = await lockedLesson(tx, lesson.id);
        // Counted under the activity's row lock so two uploads cannot both pass the limit.
        await tx
          .select({ id: activities.id })
          .from(activities)
          .where(eq(activities.id, id))
          .for('update');
        const existing = await tx
          .select({ id: attachments.id })
          .from(attachments)
          .where(eq(attachments.activityId, id));
        if (existing.length >= MAX_ATTACHMENTS) {
          throw new HttpError(
            409,
            'too-many-attachments',
            `An activity holds at most ${MAX_ATTACHMENTS} attachments. Remove one first.`,
          );
        }
        const [row] = await tx
          .insert(attachments)
          .values({ activityId: id, filename, contentType, size: file.size, bytes: file.buffer })
          .returning({
            id: attachments.id,
            filename: attachments.filename,
            size: attachments.size,
            contentType: attachments.contentType,
          });
        const after = await loadLessonSnapshot(tx, lesson.id);
        await recordActivityChange(tx, actor, lesson.unitId, id, before, after);
        return row!;
      });
      res.status(201).json(saved);
    },
  );

  return router;
}
