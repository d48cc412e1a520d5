/**
 * Units: create, list ("My units" and the school's library), read, edit with a version, delete
 * with their lessons, reorder lessons, and add a lesson. Who may do what is the policy's answer
 * (server/auth/policy.ts) through server/planning/access.ts. The unit pack and prep calendar
 * (./printables.ts), copies and history (./reuse.ts) and review steps and comments
 * (./review.ts) are sub-routers of this one.
 */
import { Router } from 'express';
import { asc, eq, inArray, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { lessons, unitCoauthors, unitOutcomes, units, users } from '../db/schema/index.js';
import type { Tx } from '../db/client.js';
import { enqueueMail } from '../mail/outbox.js';
import { coauthorMail } from '../mail/messages.js';
import { forbidden, parse, parseParams } from '../http.js';
import { authorize, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import {
  lessonOrderSchema,
  unitCreateSchema,
  unitListQuerySchema,
  unitUpdateSchema,
} from '../../shared/schemas/units.js';
import { editableUnit, readableUnit } from '../planning/access.js';
import { check, invalid } from '../planning/checks.js';
import { createLesson } from '../planning/lesson-write.js';
import { listUnits, unitDetail } from '../planning/units.js';
import { unitPrintablesRouter } from './printables.js';
import { reuseRouter } from './reuse.js';
import { unitReviewRouter } from './review.js';
import { coauthorProblems, outcomeProblems } from '../planning/unit-checks.js';
import {
  deleteVersion,
  sameMembers,
  stale,
  staleOrder,
  versionedUpdate,
  writeOrder,
} from '../db/versions.js';
import {
  lockedUnitState,
  recordCreated,
  recordLessonAdded,
  recordLessonsReordered,
  recordUnitEdit,
} from '../reuse/record.js';

/** Tells each teacher newly added as a co-author, through the outbox (sent after commit). */
async function mailNewCoauthors(
  ctx: AppContext,
  tx: Tx,
  actor: Actor,
  unitId: string,
  title: string,
  before: readonly string[],
  after: readonly string[],
): Promise<void> {
  const added = after.filter((userId) => !before.includes(userId));
  if (added.length === 0) return;
  const people = await tx
    .select({ email: users.email, name: users.name })
    .from(users)
    .where(inArray(users.id, added));
  for (const p of people) {
    await enqueueMail(
      tx,
      coauthorMail(ctx.config.appUrl, p.email, p.name, title, actor.name || actor.email, unitId),
    );
  }
}

export function unitsRouter(ctx: AppContext): Router {
  const router = Router();
  router.use(unitPrintablesRouter(ctx));
  router.use(unitReviewRouter(ctx));
  router.use(reuseRouter(ctx));

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'units.create');
    const body = parse(unitCreateSchema, req.body);
    const unit = await ctx.db.transaction(async (tx) => {
      const [row] = await tx
        .insert(units)
        .values({ ...body, schoolId: actor.schoolId, ownerId: actor.id })
        .returning({ id: units.id });
      await recordCreated(tx, actor, row!.id);
      return unitDetail(tx, actor, row!.id);
    });
    res.status(201).json(unit);
  });

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'units.read');
    const query = parse(unitListQuerySchema, req.query);
    res.json({ units: await listUnits(ctx.db, actor, query) });
  });

  router.get('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await readableUnit(ctx.db, actor, id);
    res.json(await unitDetail(ctx.db, actor, id));
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const unit = await ctx.db.transaction(async (tx) => {
      const facts = await editableUnit(tx, actor, id);
      // Locked before anything is read, so the history compares with what this edit replaced.
      const before = await lockedUnitState(tx, id);
      const { data, details } = check(unitUpdateSchema, req.body);
      // Only the owner changes who co-authors (a list equal to the current one is no change).
      if (
        data?.coauthorIds &&
        facts.ownerId !== actor.id &&
        !sameMembers(data.coauthorIds, facts.coauthorIds)
      ) {
        throw forbidden('Only the unit’s owner changes who co-authors it.');
      }
      const raw = (req.body ?? {}) as Record<string, unknown>;
      details.push(...(await outcomeProblems(tx, actor.schoolId, raw.outcomeIds)));
      details.push(...(await coauthorProblems(tx, actor.schoolId, facts.ownerId, raw.coauthorIds)));
      if (!data || details.length) throw invalid(details);
      const { version, outcomeIds, coauthorIds, ...fields } = data;
      const updated = await versionedUpdate(tx, units, eq(units.id, id), version, {
        ...fields,
        updatedAt: sql`now()`,
      });
      if (!updated) throw stale('unit', await unitDetail(tx, actor, id));
      if (outcomeIds) {
        await tx.delete(unitOutcomes).where(eq(unitOutcomes.unitId, id));
        if (outcomeIds.length)
          await tx
            .insert(unitOutcomes)
            .values(outcomeIds.map((outcomeId) => ({ unitId: id, outcomeId })));
      }
      if (coauthorIds) {
        await tx.delete(unitCoauthors).where(eq(unitCoauthors.unitId, id));
        if (coauthorIds.length)
          await tx
            .insert(unitCoauthors)
            .values(coauthorIds.map((userId) => ({ unitId: id, userId })));
      }
      const after = await lockedUnitState(tx, id);
      if (before && after) {
        await recordUnitEdit(tx, actor, id, before, after);
        await mailNewCoauthors(
          ctx,
          tx,
          actor,
          id,
          after.title,
          before.coauthorIds,
          after.coauthorIds,
        );
      }
      return unitDetail(tx, actor, id);
    });
    ctx.kickMail();
    res.json(unit);
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const version = deleteVersion(req.query);
    await ctx.db.transaction(async (tx) => {
      const facts = await editableUnit(tx, actor, id);
      if (facts.ownerId !== actor.id) throw forbidden('Only the unit’s owner can delete it.');
      const [row] = await tx
        .select({ version: units.version })
        .from(units)
        .where(eq(units.id, id))
        .for('update');
      if (version !== undefined && row?.version !== version)
        throw stale('unit', await unitDetail(tx, actor, id));
      // Lessons first, explicitly: the unit and all its lessons go together or not at all.
      await tx.delete(lessons).where(eq(lessons.unitId, id));
      await tx.delete(units).where(eq(units.id, id));
    });
    res.status(204).end();
  });

  router.put('/:id/lesson-order', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const unit = await ctx.db.transaction(async (tx) => {
      await editableUnit(tx, actor, id);
      const body = parse(lessonOrderSchema, req.body);
      // Locked until commit: no lesson is appended or edited into the unit meanwhile.
      const [row] = await tx
        .select({ version: units.version })
        .from(units)
        .where(eq(units.id, id))
        .for('update');
      if (row?.version !== body.version) throw stale('unit', await unitDetail(tx, actor, id));
      const current = await tx
        .select({ id: lessons.id })
        .from(lessons)
        .where(eq(lessons.unitId, id));
      if (
        !sameMembers(
          body.lessonIds,
          current.map((l) => l.id),
        )
      ) {
        throw staleOrder('unit', 'lessons', await unitDetail(tx, actor, id));
      }
      const was = await tx
        .select({ id: lessons.id })
        .from(lessons)
        .where(eq(lessons.unitId, id))
        .orderBy(asc(lessons.position), asc(lessons.createdAt), asc(lessons.id));
      if (was.some((l, i) => l.id !== body.lessonIds[i]))
        await recordLessonsReordered(tx, actor, id);
      await writeOrder(tx, lessons, body.lessonIds);
      await tx
        .update(units)
        .set({ version: sql`${units.version} + 1`, updatedAt: sql`now()` })
        .where(eq(units.id, id));
      return unitDetail(tx, actor, id);
    });
    res.json(unit);
  });

  router.post('/:id/lessons', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const lesson = await ctx.db.transaction(async (tx) => {
      await editableUnit(tx, actor, id);
      const lesson = await createLesson(tx, actor, id, req.body);
      await recordLessonAdded(tx, actor, id, lesson.id);
      return lesson;
    });
    res.status(201).json(lesson);
  });

  return router;
}
