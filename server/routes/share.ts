/**
 * What a share link opens, without an account or a cookie (API.md, "Relief without an
 * account"): the lesson as the relief page shows it, its lesson pack, and its build
 * instructions. The token in the path is the credential; it is checked by openShareLink (hashed,
 * constant-time, 404 unknown, 410 withdrawn or run out) and never logged.
 */
import { Router } from 'express';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { activities, attachments } from '../db/schema/index.js';
import { notFound, parseParams } from '../http.js';
import { uuidSchema } from '../../shared/schemas/common.js';
import { loadLessonPack, loadPrintContext } from '../pdf/load.js';
import { attachment, lessonFileStem, sendDownload } from '../downloads.js';
import { renderForResponse } from '../pdf/respond.js';
import { notPlannable } from '../prep/plan-lesson.js';
import { loadPackAttachments } from '../pdf/load-attachments.js';
import { openShareLink } from '../sharing/links.js';
import { activitiesWithAttachments, sharedLesson } from '../sharing/view.js';

const tokenParams = z.object({ token: z.string().max(200) });
const attachmentParams = tokenParams.extend({ attachmentId: uuidSchema });

export function shareRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = <T>(work: (tx: Tx) => Promise<T>) =>
    ctx.db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });

  router.get('/:token', async (req, res) => {
    const { token } = parseParams(tokenParams, req);
    const body = await snapshot(async (tx) => {
      const link = await openShareLink(tx, token);
      const lesson = await loadLessonPack(tx, link.lessonId);
      if (!lesson) throw notFound('That lesson');
      const print = await loadPrintContext(tx, link.schoolId, new Date());
      const list = await activitiesWithAttachments(tx, link.lessonId);
      return sharedLesson(lesson, print.schoolName, list, link.expiresAt);
    });
    res.json(body);
  });

  router.get('/:token/pack.pdf', async (req, res) => {
    const { token } = parseParams(tokenParams, req);
    const generatedAt = new Date();
    const { lesson, print, files } = await snapshot(async (tx) => {
      const link = await openShareLink(tx, token);
      const lesson = await loadLessonPack(tx, link.lessonId);
      if (!lesson) throw notFound('That lesson');
      return {
        lesson,
        print: await loadPrintContext(tx, link.schoolId, generatedAt),
        files: await loadPackAttachments(tx, [link.lessonId]),
      };
    });
    if (!lesson.plan) {
      throw notPlannable(
        lesson.problems.map((message) => ({ path: '', message })),
        'This lesson cannot be planned yet, so there is nothing to print. Ask its teacher.',
      );
    }
    const bytes = await renderForResponse(res, {
      kind: 'lesson-pack',
      print,
      lesson,
      attachments: files,
    });
    if (bytes) sendDownload(res, 'application/pdf', `${lessonFileStem(lesson)}.pdf`, bytes);
  });

  // GET /api/share/:token/attachments/:attachmentId: a build instruction of the shared lesson.
  router.get('/:token/attachments/:attachmentId', async (req, res) => {
    const { token, attachmentId } = parseParams(attachmentParams, req);
    const file = await snapshot(async (tx) => {
      const link = await openShareLink(tx, token);
      const [row] = await tx
        .select({
          filename: attachments.filename,
          contentType: attachments.contentType,
          bytes: attachments.bytes,
        })
        .from(attachments)
        .innerJoin(activities, eq(activities.id, attachments.activityId))
        .where(and(eq(attachments.id, attachmentId), eq(activities.lessonId, link.lessonId)));
      // An attachment of another lesson is as unknown here as one that does not exist.
      if (!row) throw notFound('That attachment');
      return row;
    });
    res.setHeader('Content-Type', file.contentType);
    res.setHeader('Content-Length', String(file.bytes.length));
    res.setHeader('Content-Disposition', attachment(file.filename));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.end(file.bytes);
  });

  return router;
}
