/** The replacement list of a kit type: missing pieces per part summed over its tubs, tubs named. */
import { Router } from 'express';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { stringify } from 'csv-stringify/sync';
import type { AppContext } from '../context.js';
import { kitTypes, parts, tubMissing, tubs } from '../db/schema/index.js';
import { notFound, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { authorize, type Actor } from '../auth/policy.js';
import { idParamsSchema } from '../../shared/schemas/common.js';

export interface ReplacementLine {
  partCode: string;
  name: string;
  missing: number;
  tubs: { label: string; count: number }[];
}

async function replacementList(ctx: AppContext, actor: Actor, kitTypeId: string) {
  const [kit] = await ctx.db
    .select()
    .from(kitTypes)
    .where(and(eq(kitTypes.id, kitTypeId), eq(kitTypes.schoolId, actor.schoolId)));
  if (!kit) throw notFound('That kit type');
  const partRows = await ctx.db
    .select()
    .from(parts)
    .where(eq(parts.kitTypeId, kit.id))
    .orderBy(asc(parts.position));
  const tubRows = await ctx.db.select().from(tubs).where(eq(tubs.kitTypeId, kit.id));
  const missing = tubRows.length
    ? await ctx.db
        .select()
        .from(tubMissing)
        .where(
          inArray(
            tubMissing.tubId,
            tubRows.map((t) => t.id),
          ),
        )
    : [];
  const label = new Map(tubRows.map((t) => [t.id, t.label]));
  const collator = new Intl.Collator('en', { numeric: true });
  const lines: ReplacementLine[] = [];
  for (const p of partRows) {
    const here = missing
      .filter((m) => m.partCode === p.code && m.count > 0)
      .map((m) => ({ label: label.get(m.tubId)!, count: m.count }))
      .sort((a, b) => collator.compare(a.label, b.label));
    if (here.length) {
      lines.push({
        partCode: p.code,
        name: p.name,
        missing: here.reduce((n, x) => n + x.count, 0),
        tubs: here,
      });
    }
  }
  return { kit, lines };
}

export function replacementsRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/:id/replacements', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    const { kit, lines } = await replacementList(ctx, actor, id);
    res.json({ kitTypeId: kit.id, kitTypeName: kit.name, lines });
  });
  router.get('/:id/replacements.csv', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    const { kit, lines } = await replacementList(ctx, actor, id);
    const csv = stringify(
      lines.map((l) => [
        l.partCode,
        l.name,
        l.missing,
        l.tubs.map((t) => `${t.label} (${t.count})`).join('; '),
      ]),
      { header: true, columns: ['code', 'name', 'missing', 'tubs'], record_delimiter: '\r\n' },
    );
    const slug =
      kit.name
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-|-$/g, '') || 'kit';
    res.type('text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${slug}-replacements.csv"`);
    res.send(csv);
  });
  return router;
}
