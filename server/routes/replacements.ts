/**
 * `GET /:id/replacements(.csv)` inside the kit-types router: the replacement list
 * (server/kits/replacements.ts) as JSON or CSV.
 */
import { Router } from 'express';
import type { AppContext } from '../context.js';
import { parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { authorize } from '../auth/policy.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { replacementList } from '../kits/replacements.js';
import { sendDownload, slug } from '../downloads.js';
import { writeCsv } from '../csv/index.js';

export function replacementsRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/:id/replacements', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    const { kit, lines } = await replacementList(ctx.db, actor.schoolId, id);
    res.json({ kitTypeId: kit.id, kitTypeName: kit.name, lines });
  });
  router.get('/:id/replacements.csv', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    const { kit, lines } = await replacementList(ctx.db, actor.schoolId, id);
    const csv = writeCsv(
      ['code', 'name', 'missing', 'tubs'],
      lines.map((l) => [
        l.partCode,
        l.name,
        l.missing,
        l.tubs.map((t) => `${t.label} (${t.count})`).join('; '),
      ]),
    );
    sendDownload(res, 'text/csv; charset=utf-8', `${slug(kit.name, 'kit')}-replacements.csv`, csv);
  });
  return router;
}
