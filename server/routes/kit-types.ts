/**
 * Kit types under /api/kit-types: a named parts list, edited as a whole (PUT parts, CSV import)
 * or line by line, with an optional photo per part. Everyone of the school reads them; admins
 * and teachers change them. Every change of the parts list bumps the kit type's `version`.
 */
import { Router, type RequestHandler } from 'express';
import { and, asc, eq, notInArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { kitTypes, partPhotos, parts, tubs } from '../db/schema/index.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { authorize, type Action } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { readPartsCsv, writePartsCsv } from '../csv/index.js';
import { replacementsRouter } from './replacements.js';
import { requireFile, singleFileUpload, sniffUpload } from '../uploads/index.js';
import { idParamsSchema, uuidSchema } from '../../shared/schemas/common.js';
import {
  kitTypeCreateSchema,
  kitTypeUpdateSchema,
  MAX_CSV_BYTES,
  MAX_PHOTO_BYTES,
  partsReplaceSchema,
  partUpdateSchema,
  PHOTO_TYPES,
  type KitType,
  type KitTypeSummary,
  type Part,
  type PartCategory,
  type PartValues,
} from '../../shared/schemas/kits.js';

function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

const nameTaken = () =>
  new HttpError(409, 'name-taken', 'Another kit type of the school already has this name.', [
    { path: 'name', message: 'Another kit type already has this name.' },
  ]);

/**
 * Counts per kit type, written out in SQL: drizzle leaves columns unqualified in a one-table
 * select, which a correlated subquery would misread. Lessons count when they use the kit type
 * or book one of its tubs.
 */
const counts = {
  partCount: sql<number>`(SELECT count(*)::int FROM parts p WHERE p.kit_type_id = kit_types.id)`,
  pieceCount: sql<number>`(SELECT coalesce(sum(p.qty), 0)::int FROM parts p
    WHERE p.kit_type_id = kit_types.id)`,
  tubCount: sql<number>`(SELECT count(*)::int FROM tubs t WHERE t.kit_type_id = kit_types.id)`,
  lessonCount: sql<number>`(SELECT count(*)::int FROM lessons l WHERE l.kit_type_id = kit_types.id
    OR EXISTS (SELECT 1 FROM lesson_tubs lt JOIN tubs t ON t.id = lt.tub_id
               WHERE lt.lesson_id = l.id AND t.kit_type_id = kit_types.id))`,
};

async function summaries(tx: Tx, schoolId: string, onlyId?: string): Promise<KitTypeSummary[]> {
  return tx
    .select({
      id: kitTypes.id,
      name: kitTypes.name,
      description: kitTypes.description,
      version: kitTypes.version,
      ...counts,
    })
    .from(kitTypes)
    .where(
      onlyId
        ? and(eq(kitTypes.schoolId, schoolId), eq(kitTypes.id, onlyId))
        : eq(kitTypes.schoolId, schoolId),
    )
    .orderBy(asc(kitTypes.name));
}

/** The parts list in order, each with whether a photo is stored for its code. */
export async function partsOf(tx: Tx, kitTypeId: string): Promise<Part[]> {
  const rows = await tx
    .select({
      id: parts.id,
      code: parts.code,
      name: parts.name,
      colour: parts.colour,
      category: parts.category,
      qty: parts.qty,
      compartment: parts.compartment,
      small: parts.small,
      chargeMinutes: parts.chargeMinutes,
      hasPhoto: sql<boolean>`${partPhotos.partCode} IS NOT NULL`,
    })
    .from(parts)
    .leftJoin(
      partPhotos,
      and(eq(partPhotos.kitTypeId, parts.kitTypeId), eq(partPhotos.partCode, parts.code)),
    )
    .where(eq(parts.kitTypeId, kitTypeId))
    .orderBy(asc(parts.position));
  return rows.map((r) => ({ ...r, category: r.category as PartCategory }));
}

/** The kit type with its parts, or 404 (also for another school's kit type). */
async function oneKitType(tx: Tx, schoolId: string, id: string): Promise<KitType> {
  const [summary] = await summaries(tx, schoolId, id);
  if (!summary) throw notFound('That kit type');
  return { ...summary, parts: await partsOf(tx, id) };
}

/** Locks the kit type row and checks the version read; 409 with the current kit type if stale. */
async function bumpVersion(tx: Tx, schoolId: string, id: string, version?: number): Promise<void> {
  const bumped = await tx
    .update(kitTypes)
    .set({ version: sql`${kitTypes.version} + 1` })
    .where(
      and(
        eq(kitTypes.id, id),
        eq(kitTypes.schoolId, schoolId),
        version === undefined ? undefined : eq(kitTypes.version, version),
      ),
    )
    .returning({ id: kitTypes.id });
  if (bumped.length) return;
  const current = await oneKitType(tx, schoolId, id);
  throw new HttpError(
    409,
    'stale',
    'Someone changed this kit type after you opened it. Reload to see their changes.',
    undefined,
    { current },
  );
}

/**
 * Makes the parts list exactly `list`, in its order. Lines are matched by code, so a part keeps
 * its id across a re-import; tubs' missing counts follow: dropped for a code no longer listed,
 * and never more than the new quantity.
 */
async function replaceParts(tx: Tx, kitTypeId: string, list: PartValues[]): Promise<void> {
  await tx.delete(parts).where(
    and(
      eq(parts.kitTypeId, kitTypeId),
      notInArray(
        parts.code,
        list.map((p) => p.code),
      ),
    ),
  );
  for (let i = 0; i < list.length; i += 1000) {
    const chunk = list.slice(i, i + 1000).map((p, j) => ({ ...p, kitTypeId, position: i + j }));
    await tx
      .insert(parts)
      .values(chunk)
      .onConflictDoUpdate({
        target: [parts.kitTypeId, parts.code],
        set: Object.fromEntries(
          [
            'position',
            'name',
            'colour',
            'category',
            'qty',
            'compartment',
            'small',
            'charge_minutes',
          ].map((c) => [c === 'charge_minutes' ? 'chargeMinutes' : c, sql.raw(`excluded.${c}`)]),
        ),
      });
  }
  await fitMissing(tx, kitTypeId);
}

/** Keeps each tub's missing counts of the kit type within the parts list (0 < count ≤ qty). */
async function fitMissing(tx: Tx, kitTypeId: string): Promise<void> {
  await tx.execute(sql`
    UPDATE tub_missing m SET count = p.qty FROM tubs t, parts p
    WHERE m.tub_id = t.id AND t.kit_type_id = ${kitTypeId} AND p.kit_type_id = t.kit_type_id
      AND p.code = m.part_code AND m.count > p.qty`);
  await tx.execute(sql`
    DELETE FROM tub_missing m USING tubs t
    WHERE m.tub_id = t.id AND t.kit_type_id = ${kitTypeId}
      AND (m.count <= 0 OR NOT EXISTS (
        SELECT 1 FROM parts p WHERE p.kit_type_id = t.kit_type_id AND p.code = m.part_code))`);
}

const partParamsSchema = z.object({ id: uuidSchema, partId: uuidSchema });
const codeParamsSchema = z.object({ id: uuidSchema, code: z.string().min(1).max(64) });

/** Kit types, their parts list (JSON, CSV import and export) and part photos. */
export function kitTypesRouter(ctx: AppContext): Router {
  const router = Router();
  router.use(replacementsRouter(ctx));

  /** Role check, then the kit type must be the school's: both before an upload is read. */
  const kitFor =
    (action: Action): RequestHandler =>
    async (req, res, next) => {
      const actor = requireActor(req);
      authorize(actor, action);
      const { id } = parseParams(idParamsSchema, req);
      const [kit] = await ctx.db
        .select({ id: kitTypes.id, name: kitTypes.name })
        .from(kitTypes)
        .where(and(eq(kitTypes.id, id), eq(kitTypes.schoolId, actor.schoolId)));
      if (!kit) throw notFound('That kit type');
      res.locals['kit'] = kit;
      next();
    };
  const kitOf = (res: { locals: Record<string, unknown> }) =>
    res.locals['kit'] as { id: string; name: string };

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    res.json({ kitTypes: await summaries(ctx.db, actor.schoolId) });
  });

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const body = parse(kitTypeCreateSchema, req.body);
    try {
      const kitType = await ctx.db.transaction(async (tx) => {
        const [clash] = await tx
          .select({ id: kitTypes.id })
          .from(kitTypes)
          .where(
            and(
              eq(kitTypes.schoolId, actor.schoolId),
              sql`lower(${kitTypes.name}) = lower(${body.name})`,
            ),
          );
        if (clash) throw nameTaken();
        const [row] = await tx
          .insert(kitTypes)
          .values({ schoolId: actor.schoolId, ...body })
          .returning({ id: kitTypes.id });
        return oneKitType(tx, actor.schoolId, row!.id);
      });
      res.status(201).json({ kitType });
    } catch (err) {
      throw isUniqueViolation(err) ? nameTaken() : err;
    }
  });

  router.get('/:id', kitFor('kits.read'), async (req, res) => {
    res.json({ kitType: await oneKitType(ctx.db, requireActor(req).schoolId, kitOf(res).id) });
  });

  router.patch('/:id', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { version, ...fields } = parse(kitTypeUpdateSchema, req.body);
    const id = kitOf(res).id;
    try {
      const kitType = await ctx.db.transaction(async (tx) => {
        await bumpVersion(tx, actor.schoolId, id, version);
        if (fields.name !== undefined) {
          const [clash] = await tx
            .select({ id: kitTypes.id })
            .from(kitTypes)
            .where(
              and(
                eq(kitTypes.schoolId, actor.schoolId),
                sql`lower(${kitTypes.name}) = lower(${fields.name})`,
                sql`${kitTypes.id} <> ${id}`,
              ),
            );
          if (clash) throw nameTaken();
        }
        await tx.update(kitTypes).set(fields).where(eq(kitTypes.id, id));
        return oneKitType(tx, actor.schoolId, id);
      });
      res.json({ kitType });
    } catch (err) {
      throw isUniqueViolation(err) ? nameTaken() : err;
    }
  });

  /**
   * Deleting is refused while any lesson uses the kit type or books one of its tubs (a plan
   * must not lose its parts list). Unused, it goes with its tubs, parts and photos: nothing
   * else points at it, so an archive would only hide clutter.
   */
  router.delete('/:id', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { id, name } = kitOf(res);
    await ctx.db.transaction(async (tx) => {
      await tx.execute(sql`SELECT id FROM kit_types WHERE id = ${id} FOR UPDATE`);
      const [summary] = await summaries(tx, actor.schoolId, id);
      const n = summary?.lessonCount ?? 0;
      if (n > 0) {
        const [lessonWord, them] = n === 1 ? ['lesson', 'it'] : ['lessons', 'them'];
        throw new HttpError(
          409,
          'in-use',
          `${name} is used by ${n} ${lessonWord}. ` +
            `Give ${them} another kit type or delete ${them} first.`,
        );
      }
      await tx.delete(tubs).where(eq(tubs.kitTypeId, id));
      await tx.delete(kitTypes).where(eq(kitTypes.id, id));
    });
    res.status(204).end();
  });

  router.put('/:id/parts', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const body = parse(partsReplaceSchema, req.body);
    const id = kitOf(res).id;
    const kitType = await ctx.db.transaction(async (tx) => {
      await bumpVersion(tx, actor.schoolId, id, body.version);
      await replaceParts(tx, id, body.parts);
      return oneKitType(tx, actor.schoolId, id);
    });
    res.json({ kitType });
  });

  router.patch('/:id/parts/:partId', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { partId } = parseParams(partParamsSchema, req);
    const { version, ...fields } = parse(partUpdateSchema, req.body);
    const id = kitOf(res).id;
    const kitType = await ctx.db.transaction(async (tx) => {
      await bumpVersion(tx, actor.schoolId, id, version);
      const [part] = await tx
        .select()
        .from(parts)
        .where(and(eq(parts.id, partId), eq(parts.kitTypeId, id)));
      if (!part) throw notFound('That part');
      if (fields.code !== undefined && fields.code !== part.code) {
        const [clash] = await tx
          .select({ id: parts.id })
          .from(parts)
          .where(and(eq(parts.kitTypeId, id), eq(parts.code, fields.code)));
        if (clash) {
          throw new HttpError(
            409,
            'code-taken',
            `Another part already has the code ${fields.code}.`,
            [{ path: 'code', message: 'Another part already has this code.' }],
          );
        }
        // The photo and the tubs' missing counts are keyed by code: they follow the part.
        await tx
          .update(partPhotos)
          .set({ partCode: fields.code })
          .where(and(eq(partPhotos.kitTypeId, id), eq(partPhotos.partCode, part.code)));
        await tx.execute(sql`UPDATE tub_missing m SET part_code = ${fields.code} FROM tubs t
          WHERE m.tub_id = t.id AND t.kit_type_id = ${id} AND m.part_code = ${part.code}`);
      }
      await tx.update(parts).set(fields).where(eq(parts.id, partId));
      await fitMissing(tx, id);
      return oneKitType(tx, actor.schoolId, id);
    });
    res.json({ kitType });
  });

  router.post(
    '/:id/parts/import',
    kitFor('kits.edit'),
    singleFileUpload({ maxBytes: MAX_CSV_BYTES }),
    async (req, res) => {
      const actor = requireActor(req);
      const file = requireFile(req);
      await sniffUpload(file.buffer, ['text/csv']);
      // The sniff proved the bytes are UTF-8; TextDecoder drops a leading byte-order mark.
      const { parts: list, errors } = readPartsCsv(new TextDecoder('utf-8').decode(file.buffer));
      if (errors.length) {
        const lines = new Set(errors.map((e) => e.line)).size;
        throw new HttpError(
          422,
          'csv-rows',
          `${lines} ${lines === 1 ? 'line needs' : 'lines need'} attention. Nothing was imported.`,
          errors,
        );
      }
      const id = kitOf(res).id;
      await ctx.db.transaction(async (tx) => {
        await bumpVersion(tx, actor.schoolId, id);
        await replaceParts(tx, id, list);
      });
      res.json({ imported: list.length });
    },
  );

  router.get('/:id/parts.csv', kitFor('kits.read'), async (_req, res) => {
    const kit = kitOf(res);
    const list = await partsOf(ctx.db, kit.id);
    const slug =
      kit.name
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-|-$/g, '') || 'kit';
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${slug}-parts.csv"`);
    res.send(writePartsCsv(list));
  });

  /** PUT answers 201 when the part had no photo, 200 when one was replaced (RFC 9110 §9.3.4). */
  router.put(
    '/:id/parts/:code/photo',
    kitFor('kits.edit'),
    singleFileUpload({ maxBytes: MAX_PHOTO_BYTES }),
    async (req, res) => {
      const { code } = parseParams(codeParamsSchema, req);
      const id = kitOf(res).id;
      const file = requireFile(req);
      const contentType = await sniffUpload(file.buffer, PHOTO_TYPES);
      const [part] = await ctx.db
        .select({ id: parts.id })
        .from(parts)
        .where(and(eq(parts.kitTypeId, id), eq(parts.code, code)));
      if (!part) throw notFound('That part');
      const [before] = await ctx.db
        .select({ code: partPhotos.partCode })
        .from(partPhotos)
        .where(and(eq(partPhotos.kitTypeId, id), eq(partPhotos.partCode, code)));
      await ctx.db
        .insert(partPhotos)
        .values({ kitTypeId: id, partCode: code, contentType, bytes: file.buffer })
        .onConflictDoUpdate({
          target: [partPhotos.kitTypeId, partPhotos.partCode],
          set: { contentType, bytes: file.buffer, updatedAt: sql`now()` },
        });
      const list = await partsOf(ctx.db, id);
      res.status(before ? 200 : 201).json({ part: list.find((p) => p.code === code) });
    },
  );

  router.get('/:id/parts/:code/photo', kitFor('kits.read'), async (req, res) => {
    const { code } = parseParams(codeParamsSchema, req);
    const [photo] = await ctx.db
      .select()
      .from(partPhotos)
      .where(and(eq(partPhotos.kitTypeId, kitOf(res).id), eq(partPhotos.partCode, code)));
    if (!photo) throw notFound('That photo');
    // The type was sniffed at upload; nosniff stops a browser from guessing another one.
    res.setHeader('Content-Type', photo.contentType);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Disposition', 'inline');
    res.send(photo.bytes);
  });

  router.delete('/:id/parts/:code/photo', kitFor('kits.edit'), async (req, res) => {
    const { code } = parseParams(codeParamsSchema, req);
    const gone = await ctx.db
      .delete(partPhotos)
      .where(and(eq(partPhotos.kitTypeId, kitOf(res).id), eq(partPhotos.partCode, code)))
      .returning({ code: partPhotos.partCode });
    if (!gone.length) throw notFound('That photo');
    res.status(204).end();
  });

  return router;
}
