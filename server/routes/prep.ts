import { Router } from 'express';
import type { AppContext } from '../context.js';
import { HttpError, notFound, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { canReadLesson } from '../auth/policy.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { computePrepPlan, PrepInputError } from '../../shared/prep/index.js';
import { lessonFacts, loadPrepInput } from '../prep/load.js';

/** `GET /api/lessons/:id/prep`: the lesson's prep plan as stored now (same policy as reading it). */
export function prepRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/:id/prep', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const facts = await lessonFacts(ctx.db, id);
    if (!facts || !canReadLesson(actor, facts.unit, facts)) throw notFound('That lesson');
    const input = await ctx.db.transaction(async (tx) => loadPrepInput(tx, id), {
      isolationLevel: 'repeatable read',
      accessMode: 'read only',
    });
    if (!input) throw notFound('That lesson');
    try {
      res.json(computePrepPlan(input));
    } catch (err) {
      if (err instanceof PrepInputError) {
        // Stored data the engine refuses (e.g. a material whose part left the parts list).
        throw new HttpError(
          422,
          'lesson-not-plannable',
          'This lesson cannot be planned yet.',
          err.issues.map((i) => ({
            path: i.path.map(String).join('.'),
            message: i.message,
          })),
        );
      }
      throw err;
    }
  });
  return router;
}
