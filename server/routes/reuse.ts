/**
 * Reuse (API.md, "Reuse"), mounted beside the units router: copy a unit into one's own units,
 * read a unit's history, and list what changed in the original since a copy was made.
 */
import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { units } from '../db/schema/index.js';
import { notFound, parse, parseParams } from '../http.js';
import { authorize, canReadUnit } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { unitCopySchema, type Upstream } from '../../shared/schemas/reuse.js';
import { loadUnitFacts, readableUnit } from '../planning/access.js';
import { unitDetail } from '../planning/units.js';
import { basedOnOf, copyRow } from '../reuse/based-on.js';
import { unitChanges } from '../reuse/changes.js';
import { copyUnit } from '../reuse/copy.js';
import { unitHistory } from '../reuse/history.js';
import { loadUnitSnapshot, type UnitSnapshot } from '../reuse/snapshot.js';

export function reuseRouter(ctx: AppContext): Router {
  const router = Router();

  router.post('/:id/copy', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'units.copy');
    const { id } = parseParams(idParamsSchema, req);
    const unit = await ctx.db.transaction(
      async (tx) => {
        await readableUnit(tx, actor, id);
        // No body at all is a copy with every default.
        const body = parse(unitCopySchema, req.body ?? {});
        const { unitId, summary } = await copyUnit(tx, {
          ...body,
          sourceUnitId: id,
          ownerId: actor.id,
          schoolId: actor.schoolId,
        });
        return { ...(await unitDetail(tx, actor, unitId)), copySummary: summary };
      },
      // One snapshot of the original: a colleague saving meanwhile never gives a half-old copy.
      { isolationLevel: 'repeatable read' },
    );
    res.status(201).json(unit);
  });

  router.get('/:id/history', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await readableUnit(ctx.db, actor, id);
    res.json({ events: await unitHistory(ctx.db, id) });
  });

  router.get('/:id/upstream', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const answer = await ctx.db.transaction(
      async (tx): Promise<Upstream> => {
        await readableUnit(tx, actor, id);
        const row = await copyRow(tx, id);
        if (!row) throw notFound('The original of this unit');
        const facts = await loadUnitFacts(tx, row.sourceUnitId);
        if (!facts || !canReadUnit(actor, facts)) throw notFound('The original of this unit');
        const [source] = await tx
          .select({ version: units.version })
          .from(units)
          .where(eq(units.id, row.sourceUnitId));
        const now = await loadUnitSnapshot(tx, row.sourceUnitId);
        if (!source || !now) throw notFound('The original of this unit');
        const changes = unitChanges(row.snapshot as UnitSnapshot, now, { contentOnly: true });
        return {
          basedOn: (await basedOnOf(tx, actor, id))!,
          sourceVersion: source.version,
          changed: changes.length > 0,
          changes: changes.map((summary) => ({ summary })),
        };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    res.json(answer);
  });

  return router;
}
