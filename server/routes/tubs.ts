/**
 * Tubs under /api/tubs: the physical kits of a kit type, what each is known to be missing, and
 * the pack-away audits that change that. Stock per part = the kit's quantity − missing, ≥ 0.
 */
import { Router } from 'express';
import { and, asc, desc, eq, inArray, ne, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import {
  kitTypes,
  lessons,
  parts,
  tubAudits,
  tubMissing,
  tubs,
  users,
} from '../db/schema/index.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { authorize, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema, uuidSchema, type ApiErrorDetail } from '../../shared/schemas/common.js';
import {
  tubAuditCreateSchema,
  tubCreateSchema,
  tubUpdateSchema,
  type MissingLine,
  type Tub,
  type TubAudit,
  type TubStatus,
  type TubSummary,
} from '../../shared/schemas/kits.js';

function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

const labelTaken = () =>
  new HttpError(409, 'label-taken', 'Another tub of this kit type already has this label.', [
    { path: 'label', message: 'Another tub of this kit type has this label.' },
  ]);

const byLabel = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

const listQuerySchema = z.object({ kitTypeId: uuidSchema.optional() });

/** The school's tubs (of one kit type, or one tub), by kit type and label, with what is missing. */
export async function listTubs(
  tx: Tx,
  schoolId: string,
  by: { kitTypeId?: string; id?: string } = {},
): Promise<TubSummary[]> {
  const rows = await tx
    .select({
      id: tubs.id,
      kitTypeId: tubs.kitTypeId,
      kitTypeName: kitTypes.name,
      label: tubs.label,
      controllerLabel: tubs.controllerLabel,
      status: tubs.status,
      version: tubs.version,
      lessonCount: sql<number>`(SELECT count(*)::int FROM lesson_tubs lt
        WHERE lt.tub_id = tubs.id)`,
    })
    .from(tubs)
    .innerJoin(kitTypes, eq(kitTypes.id, tubs.kitTypeId))
    .where(
      and(
        eq(tubs.schoolId, schoolId),
        by.kitTypeId ? eq(tubs.kitTypeId, by.kitTypeId) : undefined,
        by.id ? eq(tubs.id, by.id) : undefined,
      ),
    )
    .orderBy(asc(kitTypes.name), asc(tubs.label));
  if (!rows.length) return [];
  // Labels in reading order, numbers as numbers: Tub 2 before Tub 10.
  rows.sort(
    (a, b) => byLabel.compare(a.kitTypeName, b.kitTypeName) || byLabel.compare(a.label, b.label),
  );
  // Only codes on the parts list count (an import drops the others), in parts-list order.
  const missing = await tx
    .select({
      tubId: tubMissing.tubId,
      partCode: tubMissing.partCode,
      partName: parts.name,
      count: tubMissing.count,
    })
    .from(tubMissing)
    .innerJoin(tubs, eq(tubs.id, tubMissing.tubId))
    .innerJoin(parts, and(eq(parts.kitTypeId, tubs.kitTypeId), eq(parts.code, tubMissing.partCode)))
    .where(
      inArray(
        tubMissing.tubId,
        rows.map((r) => r.id),
      ),
    )
    .orderBy(asc(parts.position));
  return rows.map((r) => {
    const lines: MissingLine[] = missing
      .filter((m) => m.tubId === r.id && m.count > 0)
      .map(({ partCode, partName, count }) => ({ partCode, partName, count }));
    const status = r.status as TubStatus;
    return {
      ...r,
      status,
      needsSorting: status === 'needs-sorting',
      missing: lines,
      missingLines: lines.length,
      missingPieces: lines.reduce((sum, l) => sum + l.count, 0),
    };
  });
}

/** The tub with its stock per part code, or 404 (also for another school's tub). */
export async function oneTub(tx: Tx, actor: Actor, id: string): Promise<Tub> {
  const [summary] = await listTubs(tx, actor.schoolId, { id });
  if (!summary) throw notFound('That tub');
  const list = await tx
    .select({ code: parts.code, qty: parts.qty })
    .from(parts)
    .where(eq(parts.kitTypeId, summary.kitTypeId))
    .orderBy(asc(parts.position));
  const missing = new Map(summary.missing.map((m) => [m.partCode, m.count]));
  const stock: Record<string, number> = {};
  for (const p of list) stock[p.code] = Math.max(0, p.qty - (missing.get(p.code) ?? 0));
  return { ...summary, stock };
}

async function checkLabel(
  tx: Tx,
  kitTypeId: string,
  label: string,
  exceptId?: string,
): Promise<void> {
  const [clash] = await tx
    .select({ id: tubs.id })
    .from(tubs)
    .where(
      and(
        eq(tubs.kitTypeId, kitTypeId),
        sql`lower(${tubs.label}) = lower(${label})`,
        exceptId ? ne(tubs.id, exceptId) : undefined,
      ),
    );
  if (clash) throw labelTaken();
}

function auditOut(row: typeof tubAudits.$inferSelect, userName: string | null): TubAudit {
  return {
    id: row.id,
    tubId: row.tubId,
    lessonId: row.lessonId,
    userName,
    missing: row.missing as TubAudit['missing'],
    found: row.found as TubAudit['found'],
    note: row.note,
    createdAt: row.createdAt.toISOString(),
  };
}

/** Tubs and their pack-away audits under /api/tubs. */
export function tubsRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const query = parse(listQuerySchema, req.query);
    if (query.kitTypeId) {
      const [kit] = await ctx.db
        .select({ id: kitTypes.id })
        .from(kitTypes)
        .where(and(eq(kitTypes.id, query.kitTypeId), eq(kitTypes.schoolId, actor.schoolId)));
      if (!kit) throw notFound('That kit type');
    }
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
    try {
      const tub = await ctx.db.transaction(async (tx) => {
        const [kit] = await tx
          .select({ id: kitTypes.id })
          .from(kitTypes)
          .where(and(eq(kitTypes.id, body.kitTypeId), eq(kitTypes.schoolId, actor.schoolId)));
        if (!kit) throw notFound('That kit type');
        await checkLabel(tx, kit.id, body.label);
        const [row] = await tx
          .insert(tubs)
          .values({ schoolId: actor.schoolId, ...body })
          .returning({ id: tubs.id });
        return oneTub(tx, actor, row!.id);
      });
      res.status(201).json({ tub });
    } catch (err) {
      throw isUniqueViolation(err) ? labelTaken() : err;
    }
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const { id } = parseParams(idParamsSchema, req);
    const { version, ...fields } = parse(tubUpdateSchema, req.body);
    try {
      const tub = await ctx.db.transaction(async (tx) => {
        const current = await oneTub(tx, actor, id);
        if (fields.label !== undefined) await checkLabel(tx, current.kitTypeId, fields.label, id);
        const saved = await tx
          .update(tubs)
          .set({ ...fields, version: sql`${tubs.version} + 1` })
          .where(and(eq(tubs.id, id), eq(tubs.schoolId, actor.schoolId), eq(tubs.version, version)))
          .returning({ id: tubs.id });
        if (!saved.length) {
          throw new HttpError(
            409,
            'stale',
            'Someone changed this tub after you opened it. Reload to see their changes.',
            undefined,
            {
              current: await oneTub(tx, actor, id),
            },
          );
        }
        return oneTub(tx, actor, id);
      });
      res.json({ tub });
    } catch (err) {
      throw isUniqueViolation(err) ? labelTaken() : err;
    }
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const { id } = parseParams(idParamsSchema, req);
    await ctx.db.transaction(async (tx) => {
      await tx.execute(
        sql`SELECT id FROM tubs WHERE id = ${id} AND school_id = ${actor.schoolId} FOR UPDATE`,
      );
      const tub = await oneTub(tx, actor, id);
      const n = tub.lessonCount;
      if (n > 0) {
        throw new HttpError(
          409,
          'in-use',
          `${tub.label} is booked by ${n} ${n === 1 ? 'lesson' : 'lessons'}. ` +
            `Take it off ${n === 1 ? 'that lesson' : 'those lessons'} first, or mark it retired.`,
        );
      }
      await tx.delete(tubs).where(eq(tubs.id, id));
    });
    res.status(204).end();
  });

  router.get('/:id/audits', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    const { id } = parseParams(idParamsSchema, req);
    await oneTub(ctx.db, actor, id);
    const rows = await ctx.db
      .select({ audit: tubAudits, userName: users.name })
      .from(tubAudits)
      .leftJoin(users, eq(users.id, tubAudits.userId))
      .where(eq(tubAudits.tubId, id))
      .orderBy(desc(tubAudits.createdAt), desc(tubAudits.id));
    res.json({ audits: rows.map((r) => auditOut(r.audit, r.userName)) });
  });

  /**
   * A pack-away audit: `missing` adds to the tub's missing counts, `found` takes away, and each
   * count stays between 0 and the kit's quantity. Audits are serialised per tub by a row lock.
   */
  router.post('/:id/audits', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'tubs.audit');
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(tubAuditCreateSchema, req.body);
    const result = await ctx.db.transaction(async (tx) => {
      await tx.execute(
        sql`SELECT id FROM tubs WHERE id = ${id} AND school_id = ${actor.schoolId} FOR UPDATE`,
      );
      const tub = await oneTub(tx, actor, id);
      const qty = new Map(
        (
          await tx
            .select({ code: parts.code, qty: parts.qty })
            .from(parts)
            .where(eq(parts.kitTypeId, tub.kitTypeId))
        ).map((p) => [p.code, p.qty]),
      );
      const details: ApiErrorDetail[] = [];
      for (const list of ['missing', 'found'] as const) {
        body[list].forEach((l, i) => {
          if (!qty.has(l.partCode)) {
            details.push({
              path: `${list}.${i}.partCode`,
              message: `${l.partCode} is not on the parts list of ${tub.kitTypeName}.`,
            });
          }
        });
      }
      if (body.lessonId) {
        const [lesson] = await tx
          .select({ id: lessons.id })
          .from(lessons)
          .where(and(eq(lessons.id, body.lessonId), eq(lessons.schoolId, actor.schoolId)));
        if (!lesson) details.push({ path: 'lessonId', message: 'Pick a lesson of this school.' });
      }
      if (details.length)
        throw new HttpError(400, 'invalid-input', 'Some fields need attention.', details);

      const change = new Map<string, number>();
      for (const l of body.missing) change.set(l.partCode, (change.get(l.partCode) ?? 0) + l.count);
      for (const l of body.found) change.set(l.partCode, (change.get(l.partCode) ?? 0) - l.count);
      const before = new Map(tub.missing.map((m) => [m.partCode, m.count]));
      for (const [code, delta] of change) {
        const count = Math.min(qty.get(code)!, Math.max(0, (before.get(code) ?? 0) + delta));
        if (count === 0) {
          await tx
            .delete(tubMissing)
            .where(and(eq(tubMissing.tubId, id), eq(tubMissing.partCode, code)));
        } else {
          await tx
            .insert(tubMissing)
            .values({ tubId: id, partCode: code, count })
            .onConflictDoUpdate({
              target: [tubMissing.tubId, tubMissing.partCode],
              set: { count },
            });
        }
      }
      const [audit] = await tx
        .insert(tubAudits)
        .values({
          tubId: id,
          lessonId: body.lessonId ?? null,
          userId: actor.id,
          missing: body.missing,
          found: body.found,
          note: body.note,
        })
        .returning();
      return { audit: auditOut(audit!, actor.name), tub: await oneTub(tx, actor, id) };
    });
    res.status(201).json(result);
  });

  return router;
}
