import { Router } from 'express';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { readableLesson } from '../planning/access.js';
import { runnableLesson } from '../trays/access.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { groupControllers, type LessonPrep } from '../../shared/prep/index.js';
import { prepTickUpdateSchema, type PrepTicks } from '../../shared/schemas/prep-ticks.js';
import { notPlannable, planLesson } from '../prep/plan-lesson.js';
import { readTicks, setTick } from '../prep/ticks.js';
import { planTag } from '../prep/plan-tag.js';
import { cachedPlan, keepPlan } from '../prep/plan-cache.js';

/** The lesson's plan as stored now (404 when gone, 422 when the engine refuses it). */
async function plannedLesson(tx: Tx, id: string) {
  const planned = await planLesson(tx, id);
  if (!planned) throw notFound('That lesson');
  if (!planned.plannable) throw notPlannable(planned.problems);
  return planned;
}

/**
 * Inside the lessons router: `GET /:id/prep`, the lesson's prep plan as stored now, with the
 * name, colour and compartment of each part it mentions and the tasks' ticks (same policy as
 * reading the lesson); and the ticks alone, read and set by the lesson's teachers.
 */
export function prepRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = <T>(work: (tx: Tx) => Promise<T>) =>
    ctx.db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });

  router.get('/:id/prep', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    // The browser keeps the plan and asks again with If-None-Match (RFC 9111 §5.2.2.4 no-cache;
    // RFC 9110 §13.1.2): an unchanged plan costs the access check and one digest query.
    res.setHeader('Cache-Control', 'private, no-cache');
    // Access and tag outside a transaction (two queries, no BEGIN/COMMIT): a plan computed
    // afterwards in its own snapshot is as new as the tag or newer, never older, so a 304 never
    // confirms a plan older than the data (a newer one only costs one more full answer).
    await readableLesson(ctx.db, actor, id);
    const tag = await planTag(ctx.db, id);
    if (tag) {
      res.setHeader('ETag', tag);
      // req.fresh compares If-None-Match with the ETag just set (Express, RFC 9110 §13.1.2).
      if (req.fresh) {
        res.status(304).end();
        return;
      }
    }
    // The same tag was answered before (by anyone allowed to read it): the same answer.
    const cached = tag ? cachedPlan(tag) : undefined;
    if (cached) {
      res.json(cached);
      return;
    }
    const { answer, snapshotTag } = await snapshot(async (tx) => {
      const { plan, partNames, parts, input } = await plannedLesson(tx, id);
      const ticks = await readTicks(
        tx,
        id,
        plan.tasks.map((t) => t.key),
      );
      const answer: LessonPrep = {
        ...plan,
        partNames,
        parts,
        controllers: groupControllers(plan, input),
        ticks,
      };
      // Kept under the tag of this very snapshot, so an entry always matches its tag.
      return { answer, snapshotTag: await planTag(tx, id) };
    });
    if (snapshotTag) keepPlan(snapshotTag, answer);
    res.json(answer);
  });

  // GET /:id/prep/ticks: whoever reads the lesson sees which prep tasks are done.
  router.get('/:id/prep/ticks', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const answer: PrepTicks = await snapshot(async (tx) => {
      await readableLesson(tx, actor, id);
      const { plan } = await plannedLesson(tx, id);
      return {
        ticks: await readTicks(
          tx,
          id,
          plan.tasks.map((t) => t.key),
        ),
      };
    });
    res.json(answer);
  });

  /**
   * PUT /:id/prep/ticks `{ taskKey, done }`: the lesson's teachers (its unit's authors and its
   * relief teacher) tick or clear a task of the plan as stored now; answers every tick.
   */
  router.put('/:id/prep/ticks', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(prepTickUpdateSchema, req.body);
    const answer: PrepTicks = await ctx.db.transaction(async (tx) => {
      await runnableLesson(tx, actor, id);
      const keys = (await plannedLesson(tx, id)).plan.tasks.map((t) => t.key);
      if (!keys.includes(body.taskKey)) {
        throw new HttpError(400, 'invalid-input', 'That task is not in the lesson’s prep plan.', [
          { path: 'taskKey', message: 'This lesson’s prep plan has no task with that key.' },
        ]);
      }
      await setTick(tx, actor.id, id, body.taskKey, body.done);
      return { ticks: await readTicks(tx, id, keys) };
    });
    res.json(answer);
  });
  return router;
}
