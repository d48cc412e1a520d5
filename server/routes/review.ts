/**
 * Review: a unit's review steps and comments (`unitReviewRouter`, inside the units router at
 * /api/units), and the review queue, a unit's review page and the lead's summary
 * (`reviewRouter` at /api/review). Rules in API.md, "Review and coverage"; who may do what is
 * server/auth/policy.ts through server/review/access.ts.
 */
import { Router } from 'express';
import type { AppContext } from '../context.js';
import { forbidden, parse, parseParams } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import {
  commentCreateSchema,
  reviewQueueQuerySchema,
  reviewStepSchema,
} from '../../shared/schemas/review.js';
import { unitDetail } from '../planning/units.js';
import { reviewableUnit, standing } from '../review/access.js';
import { takeReviewStep } from '../review/steps.js';
import { addComment, lessonOfUnit, listComments } from '../review/comments.js';
import { commentMail, commentRecipients, enqueueAll } from '../review/mail.js';
import { possibleSteps } from '../review/transitions.js';
import { lessonPrepSummary } from '../review/prep-summary.js';
import { reviewQueue, reviewSummary } from '../review/queue.js';

/** One read-only snapshot for a read that spans several queries. */
function snapshotOf(ctx: AppContext) {
  return <T>(work: Parameters<typeof ctx.db.transaction<T>>[0]) =>
    ctx.db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });
}

/** `/:id/review` and `/:id/comments` of a unit, mounted inside the units router. */
export function unitReviewRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = snapshotOf(ctx);

  router.post('/:id/review', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const unit = await ctx.db.transaction(async (tx) => {
      // Seen first (404 before 400): a stranger learns nothing of the unit from the answer.
      await reviewableUnit(tx, actor, id);
      const step = parse(reviewStepSchema, req.body);
      return takeReviewStep(tx, actor, id, step, ctx.config.appUrl);
    });
    ctx.kickMail();
    res.json(unit);
  });

  router.get('/:id/comments', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const comments = await snapshot(async (tx) => {
      await reviewableUnit(tx, actor, id);
      return listComments(tx, id);
    });
    res.json({ comments });
  });

  router.post('/:id/comments', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const comment = await ctx.db.transaction(async (tx) => {
      const unit = await reviewableUnit(tx, actor, id);
      if (actor.role === 'relief') throw forbidden('Relief teachers do not comment on units.');
      const body = parse(commentCreateSchema, req.body);
      const lessonTitle = body.lessonId ? await lessonOfUnit(tx, id, body.lessonId) : null;
      const saved = await addComment(tx, actor, unit, body.body, body.lessonId ?? null, null);
      const recipients = await commentRecipients(tx, actor, unit);
      await enqueueAll(
        tx,
        recipients.map((r) =>
          commentMail(ctx.config.appUrl, r, actor, unit, body.body, lessonTitle),
        ),
      );
      return saved;
    });
    ctx.kickMail();
    res.status(201).json(comment);
  });

  return router;
}

/** The review queue, a unit's review page and the lead's summary, at /api/review. */
export function reviewRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = snapshotOf(ctx);

  router.get('/queue', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'units.review');
    const query = parse(reviewQueueQuerySchema, req.query);
    res.json({ units: await snapshot((tx) => reviewQueue(tx, actor, query)) });
  });

  router.get('/summary', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'units.review');
    res.json(await snapshot((tx) => reviewSummary(tx, actor)));
  });

  router.get('/units/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const answer = await snapshot(async (tx) => {
      const facts = await reviewableUnit(tx, actor, id);
      const unit = await unitDetail(tx, actor, id);
      const lessons = [];
      for (const lesson of unit.lessons) lessons.push(await lessonPrepSummary(tx, lesson));
      return { unit, lessons, actions: possibleSteps(facts.status, standing(actor, facts)) };
    });
    res.json(answer);
  });

  return router;
}
