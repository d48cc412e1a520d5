/**
 * Tubs under /api/tubs: the physical kits of a kit type, what each is known to be missing, and
 * the pack-away audits that change that. The data logic is in server/kits/tubs.ts; this file
 * parses, authorises and answers.
 */
import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { parse, parseParams } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema, uuidSchema } from '../../shared/schemas/common.js';
import {
  tubAuditCreateSchema,
  tubCreateSchema,
  tubUpdateSchema,
} from '../../shared/schemas/kits.js';
import { schoolKitType } from '../kits/kit-types.js';
import {
  createTub,
  deleteTub,
  listTubs,
  oneTub,
  recordAudit,
  tubAuditList,
  updateTub,
  withUniqueLabel,
} from '../kits/tubs.js';

const listQuerySchema = z.object({ kitTypeId: uuidSchema.optional() });

/** Tubs and their pack-away audits under /api/tubs. */
export function tubsRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const query = parse(listQuerySchema, req.query);
    if (query.kitTypeId) await schoolKitType(ctx.db, actor.schoolId, query.kitTypeId);
    res.json({ tubs: await listTubs(ctx.db, actor.schoolId, { kitTypeId: query.kitTypeId }) });
  });

  router.get('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    res.json({ tub: await oneTub(ctx.db, actor, id) });
  });

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const body = parse(tubCreateSchema, req.body);
    const tub = await withUniqueLabel(() => ctx.db.transaction((tx) => createTub(tx, actor, body)));
    res.status(201).json({ tub });
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(tubUpdateSchema, req.body);
    const tub = await withUniqueLabel(() =>
      ctx.db.transaction((tx) => updateTub(tx, actor, id, body)),
    );
    res.json({ tub });
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const { id } = parseParams(idParamsSchema, req);
    await ctx.db.transaction((tx) => deleteTub(tx, actor, id));
    res.status(204).end();
  });

  router.get('/:id/audits', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    res.json({ audits: await tubAuditList(ctx.db, actor, id) });
  });

  router.post('/:id/audits', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'tubs.audit');
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(tubAuditCreateSchema, req.body);
    const result = await ctx.db.transaction((tx) => recordAudit(tx, actor, id, body));
    res.status(201).json(result);
  });

  return router;
}
