/**
 * Share links of a lesson (API.md, "Relief without an account"): make one (copied, or e-mailed
 * through the outbox in the same transaction), list them (never their tokens), withdraw one.
 * `lessonShareLinksRouter` is mounted inside the lessons router at /:lessonId/share-links,
 * `shareLinksRouter` at /share-links.
 */
import { Router } from 'express';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { classes, lessons, schools, shareLinks } from '../db/schema/index.js';
import { notFound, parse, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { newToken } from '../auth/tokens.js';
import { idParamsSchema, uuidSchema } from '../../shared/schemas/common.js';
import { shareLinkCreateSchema } from '../../shared/schemas/sharing.js';
import { enqueueMail } from '../mail/outbox.js';
import { toLocal } from '../planning/format.js';
import { shareableLesson } from '../sharing/access.js';
import { checkShareExpiry, defaultShareExpiry } from '../sharing/links.js';
import { shareLinkMail } from '../sharing/mail.js';

const lessonParams = z.object({ lessonId: uuidSchema });

const listed = (row: typeof shareLinks.$inferSelect) => ({
  id: row.id,
  expiresAt: row.expiresAt.toISOString(),
  email: row.email,
  revokedAt: row.revokedAt?.toISOString() ?? null,
});

export function lessonShareLinksRouter(ctx: AppContext): Router {
  const router = Router({ mergeParams: true });
  const appUrl = ctx.config.appUrl.replace(/\/+$/, '');

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    const { lessonId } = parseParams(lessonParams, req);
    const now = new Date();
    let mailed = false;
    const created = await ctx.db.transaction(async (tx) => {
      await shareableLesson(tx, actor, lessonId);
      const body = parse(shareLinkCreateSchema, req.body ?? {});
      const [lesson] = await tx
        .select({
          title: lessons.title,
          startsAt: lessons.startsAt,
          room: lessons.room,
          className: classes.name,
          timezone: schools.timezone,
          schoolName: schools.name,
        })
        .from(lessons)
        .innerJoin(classes, eq(classes.id, lessons.classId))
        .innerJoin(schools, eq(schools.id, lessons.schoolId))
        .where(eq(lessons.id, lessonId));
      if (!lesson) throw notFound('That lesson');
      const startsAt = toLocal(lesson.startsAt);
      const expiresAt = body.expiresAt
        ? checkShareExpiry(body.expiresAt, now)
        : defaultShareExpiry(startsAt, lesson.timezone, now);
      const { token, hash } = newToken();
      const [row] = await tx
        .insert(shareLinks)
        .values({
          schoolId: actor.schoolId,
          lessonId,
          tokenHash: hash,
          email: body.email ?? null,
          expiresAt,
          createdBy: actor.id,
        })
        .returning();
      const url = `${appUrl}/pack/${token}`;
      if (body.email) {
        await enqueueMail(
          tx,
          shareLinkMail({
            to: body.email,
            sender: actor.name || actor.email,
            schoolName: lesson.schoolName,
            lessonTitle: lesson.title,
            className: lesson.className,
            startsAt,
            room: lesson.room,
            url,
            expiresAt,
            timezone: lesson.timezone,
          }),
        );
        mailed = true;
      }
      return { id: row!.id, url, expiresAt: row!.expiresAt.toISOString() };
    });
    if (mailed) ctx.kickMail();
    res.status(201).json(created);
  });

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    const { lessonId } = parseParams(lessonParams, req);
    const rows = await ctx.db.transaction(async (tx) => {
      await shareableLesson(tx, actor, lessonId);
      return tx
        .select()
        .from(shareLinks)
        .where(eq(shareLinks.lessonId, lessonId))
        .orderBy(desc(shareLinks.createdAt), desc(shareLinks.id));
    });
    res.json({ links: rows.map(listed) });
  });

  return router;
}

export function shareLinksRouter(ctx: AppContext): Router {
  const router = Router();

  // DELETE /api/share-links/:id: withdraws the link; it answers 410 from then on.
  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await ctx.db.transaction(async (tx) => {
      const [link] = await tx
        .select({ lessonId: shareLinks.lessonId, schoolId: shareLinks.schoolId })
        .from(shareLinks)
        .where(eq(shareLinks.id, id));
      if (!link || link.schoolId !== actor.schoolId) throw notFound('That link');
      await shareableLesson(tx, actor, link.lessonId);
      // Withdrawing twice keeps the first time.
      await tx
        .update(shareLinks)
        .set({ revokedAt: new Date() })
        .where(and(eq(shareLinks.id, id), isNull(shareLinks.revokedAt)));
    });
    res.status(204).end();
  });

  return router;
}
