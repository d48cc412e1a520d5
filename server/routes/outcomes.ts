/**
 * Outcomes frameworks: create, import a framework's outcomes from CSV (replacing them in one
 * transaction), list them, and browse or search the school's outcomes.
 */
import { Router } from 'express';
import { and, asc, count, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { outcomeFrameworks, outcomes } from '../db/schema/index.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { authorize, sameSchool, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import {
  OUTCOME_CSV_MAX_BYTES,
  OUTCOME_PAGE_MAX,
  frameworkCreateSchema,
  outcomeQuerySchema,
  type Framework,
  type OutcomeImportResult,
  type OutcomeRow,
} from '../../shared/schemas/outcomes.js';
import { likePattern } from '../planning/format.js';
import { isUniqueViolation } from '../db/errors.js';
import { naturalCompare } from '../../shared/prep/index.js';
import { readOutcomesCsv } from '../planning/outcomes-csv.js';
import { requireFile, singleFileUpload } from '../uploads/index.js';

/** The school's frameworks (or one of them) with their outcome counts and year bands. */
async function frameworksOf(tx: Tx, schoolId: string, onlyId?: string): Promise<Framework[]> {
  const rows = await tx
    .select()
    .from(outcomeFrameworks)
    .where(
      onlyId
        ? and(eq(outcomeFrameworks.schoolId, schoolId), eq(outcomeFrameworks.id, onlyId))
        : eq(outcomeFrameworks.schoolId, schoolId),
    )
    .orderBy(asc(outcomeFrameworks.name));
  if (rows.length === 0) return [];
  const stats = await tx
    .select({ frameworkId: outcomes.frameworkId, yearBand: outcomes.yearBand, n: count() })
    .from(outcomes)
    .where(
      inArray(
        outcomes.frameworkId,
        rows.map((r) => r.id),
      ),
    )
    .groupBy(outcomes.frameworkId, outcomes.yearBand);
  return rows.map((f) => {
    const mine = stats.filter((s) => s.frameworkId === f.id);
    return {
      id: f.id,
      name: f.name,
      outcomeCount: mine.reduce((n, s) => n + s.n, 0),
      yearBands: mine
        .map((s) => s.yearBand)
        .filter((b) => b !== '')
        .sort(naturalCompare),
      createdAt: f.createdAt.toISOString(),
    };
  });
}

/** A framework of the actor's school (404 for any other). */
async function ownFramework(tx: Tx, actor: Actor, id: string) {
  const [f] = await tx.select().from(outcomeFrameworks).where(eq(outcomeFrameworks.id, id));
  if (!f || !sameSchool(actor, f.schoolId)) throw notFound('That outcomes framework');
  return f;
}

export function outcomesRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/frameworks', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'outcomes.read');
    res.json({ frameworks: await frameworksOf(ctx.db, actor.schoolId) });
  });

  router.post('/frameworks', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'outcomes.edit');
    const body = parse(frameworkCreateSchema, req.body);
    try {
      const [f] = await ctx.db
        .insert(outcomeFrameworks)
        .values({ schoolId: actor.schoolId, name: body.name })
        .returning({ id: outcomeFrameworks.id });
      const [framework] = await frameworksOf(ctx.db, actor.schoolId, f!.id);
      res.status(201).json(framework);
    } catch (err) {
      if (!isUniqueViolation(err)) throw err;
      throw new HttpError(409, 'name-taken', 'Your school already has a framework of this name.', [
        { path: 'name', message: 'Choose another name: this one is taken.' },
      ]);
    }
  });

  router.get('/frameworks/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'outcomes.read');
    const { id } = parseParams(idParamsSchema, req);
    await ownFramework(ctx.db, actor, id);
    const [framework] = await frameworksOf(ctx.db, actor.schoolId, id);
    res.json(framework);
  });

  // Authorised before the upload is read: a teacher's file is never even buffered.
  router.post(
    '/frameworks/:id/import',
    async (req, _res, next) => {
      const actor = requireActor(req);
      authorize(actor, 'outcomes.edit');
      await ownFramework(ctx.db, actor, parseParams(idParamsSchema, req).id);
      next();
    },
    singleFileUpload({ maxBytes: OUTCOME_CSV_MAX_BYTES }),
    async (req, res) => {
      const actor = requireActor(req);
      const { id } = parseParams(idParamsSchema, req);
      const file = requireFile(req);
      await rejectBinary(file.buffer);
      const read = readOutcomesCsv(file.buffer);
      if (!read.ok) {
        throw new HttpError(
          422,
          'bad-rows',
          'Some rows of the file need fixing. Nothing was imported.',
          read.problems,
        );
      }
      const result = await ctx.db.transaction(async (tx) => {
        // Lock the framework so two imports of it run one after the other.
        const [f] = await tx
          .select()
          .from(outcomeFrameworks)
          .where(eq(outcomeFrameworks.id, id))
          .for('update');
        if (!f || !sameSchool(actor, f.schoolId)) throw notFound('That outcomes framework');
        return replaceOutcomes(tx, id, read.rows);
      });
      res.json(result);
    },
  );

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'outcomes.read');
    const query = parse(outcomeQuerySchema, req.query);
    if (query.frameworkId) await ownFramework(ctx.db, actor, query.frameworkId);
    const where: (SQL | undefined)[] = [eq(outcomeFrameworks.schoolId, actor.schoolId)];
    if (query.frameworkId) where.push(eq(outcomes.frameworkId, query.frameworkId));
    if (query.yearBand) where.push(sql`lower(${outcomes.yearBand}) = lower(${query.yearBand})`);
    if (query.q) {
      // Every word must appear somewhere (code, description or strand), in any order.
      for (const word of query.q.split(/\s+/).filter(Boolean).slice(0, 10)) {
        const p = likePattern(word);
        where.push(
          or(ilike(outcomes.code, p), ilike(outcomes.description, p), ilike(outcomes.strand, p)),
        );
      }
    }
    const rows = await ctx.db
      .select({
        id: outcomes.id,
        frameworkId: outcomes.frameworkId,
        code: outcomes.code,
        description: outcomes.description,
        strand: outcomes.strand,
        yearBand: outcomes.yearBand,
      })
      .from(outcomes)
      .innerJoin(outcomeFrameworks, eq(outcomeFrameworks.id, outcomes.frameworkId))
      .where(and(...where))
      .orderBy(asc(outcomeFrameworks.name), asc(outcomes.code))
      .limit(OUTCOME_PAGE_MAX + 1);
    res.json({
      outcomes: rows.slice(0, OUTCOME_PAGE_MAX),
      truncated: rows.length > OUTCOME_PAGE_MAX,
    });
  });

  return router;
}

/** file-type names no text format, so anything it names (PDF, ZIP, an image…) is not a CSV. */
async function rejectBinary(bytes: Buffer): Promise<void> {
  const found = await fileTypeFromBuffer(bytes);
  if (found) {
    throw new HttpError(
      415,
      'unsupported-type',
      `This file is a ${found.ext.toUpperCase()} file, not a CSV.`,
      [{ path: 'file', message: 'Choose a CSV file.' }],
    );
  }
}

/**
 * Makes the framework hold exactly `rows`. Outcomes are matched by code: a kept code keeps its id,
 * so units that cite it still do; a code no longer in the file is removed (and leaves the units).
 */
async function replaceOutcomes(
  tx: Tx,
  frameworkId: string,
  rows: OutcomeRow[],
): Promise<OutcomeImportResult> {
  const existing = await tx.select().from(outcomes).where(eq(outcomes.frameworkId, frameworkId));
  const byCode = new Map(existing.map((o) => [o.code, o]));
  const incoming = new Set(rows.map((r) => r.code));
  const gone = existing.filter((o) => !incoming.has(o.code)).map((o) => o.id);
  if (gone.length) await tx.delete(outcomes).where(inArray(outcomes.id, gone));
  const fresh: (OutcomeRow & { frameworkId: string })[] = [];
  const changed: (OutcomeRow & { id: string })[] = [];
  for (const r of rows) {
    const old = byCode.get(r.code);
    if (!old) fresh.push({ frameworkId, ...r });
    else if (
      old.description !== r.description ||
      old.strand !== r.strand ||
      old.yearBand !== r.yearBand
    ) {
      changed.push({ id: old.id, ...r });
    }
  }
  // Batches keep each statement well under PostgreSQL's 65,535 parameters.
  for (let i = 0; i < fresh.length; i += 1000)
    await tx.insert(outcomes).values(fresh.slice(i, i + 1000));
  for (let i = 0; i < changed.length; i += 1000) {
    const values = changed
      .slice(i, i + 1000)
      .map((c) => sql`(${c.id}::uuid, ${c.description}, ${c.strand}, ${c.yearBand})`);
    await tx.execute(sql`
      UPDATE ${outcomes} SET description = v.description, strand = v.strand, year_band = v.year_band
      FROM (VALUES ${sql.join(values, sql`, `)}) AS v(id, description, strand, year_band)
      WHERE ${outcomes.id} = v.id`);
  }
  return {
    imported: rows.length,
    added: fresh.length,
    updated: changed.length,
    removed: gone.length,
  };
}
