import { Router } from 'express';
import type { AppContext } from '../context.js';
import { notFound, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { readableLesson } from '../planning/access.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import type { LessonPrep } from '../../shared/prep/index.js';
import { notPlannable, planLesson } from '../prep/plan-lesson.js';

/**
 * `GET /:id/prep` inside the lessons router: the lesson's prep plan as stored now, with the name,
 * colour and compartment of each part it mentions (same policy as reading the lesson).
 */
export function prepRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/:id/prep', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const planned = await ctx.db.transaction(
      async (tx) => {
        await readableLesson(tx, actor, id);
        return planLesson(tx, id);
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    if (!planned) throw notFound('That lesson');
    if (!planned.plannable) throw notPlannable(planned.problems);
    const answer: LessonPrep = {
      ...planned.plan,
      partNames: planned.partNames,
      parts: planned.parts,
    };
    res.json(answer);
  });
  return router;
}
