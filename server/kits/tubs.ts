/**
 * Tubs: the physical kits of a kit type, what each is known to be missing, and the pack-away
 * audits that change that (the data logic behind routes/tubs.ts). Stock per part = the kit's
 * quantity − missing, ≥ 0 (./stock.ts).
 */
import { and, asc, desc, eq, inArray, ne, sql } from 'drizzle-orm';
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
import { HttpError, notFound } from '../http.js';
import type { Actor } from '../auth/policy.js';
import { isUniqueViolation } from '../db/errors.js';
import { stale, versionedUpdate } from '../db/versions.js';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import { naturalCompare } from '../../shared/prep/index.js';
import type { z } from 'zod';
import type {
  MissingLine,
  Tub,
  TubAudit,
  tubAuditCreateSchema,
  tubCreateSchema,
  TubSummary,
  tubUpdateSchema,
} from '../../shared/schemas/kits.js';
import { schoolKitType } from './kit-types.js';
import { tubStock } from './stock.js';

const labelTaken = () =>
  new HttpError(409, 'label-taken', 'Another tub of this kit type already has this label.', [
    { path: 'label', message: 'Another tub of this kit type has this label.' },
  ]);

/** Runs `work`; a unique-key violation (a label taken meanwhile) becomes the label-taken 409. */
export async function withUniqueLabel<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    throw isUniqueViolation(err) ? labelTaken() : err;
  }
}

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
    (a, b) => naturalCompare(a.kitTypeName, b.kitTypeName) || naturalCompare(a.label, b.label),
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
    const status = r.status;
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
  return { ...summary, stock: tubStock(list, missing) };
}

export async function checkLabel(
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

export function auditOut(row: typeof tubAudits.$inferSelect, userName: string | null): TubAudit {
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

export async function createTub(
  tx: Tx,
  actor: Actor,
  body: z.output<typeof tubCreateSchema>,
): Promise<Tub> {
  const kit = await schoolKitType(tx, actor.schoolId, body.kitTypeId);
  await checkLabel(tx, kit.id, body.label);
  const [row] = await tx
    .insert(tubs)
    .values({ schoolId: actor.schoolId, ...body })
    .returning({ id: tubs.id });
  return oneTub(tx, actor, row!.id);
}

/** Changes label, controller or status with the version read; 409 with the current tub if stale. */
export async function updateTub(
  tx: Tx,
  actor: Actor,
  id: string,
  { version, ...fields }: z.output<typeof tubUpdateSchema>,
): Promise<Tub> {
  const current = await oneTub(tx, actor, id);
  if (fields.label !== undefined) await checkLabel(tx, current.kitTypeId, fields.label, id);
  const where = and(eq(tubs.id, id), eq(tubs.schoolId, actor.schoolId));
  if (!(await versionedUpdate(tx, tubs, where, version, fields))) {
    throw stale(
      'tub',
      await oneTub(tx, actor, id),
      'Someone changed this tub after you opened it. Reload to see their changes.',
    );
  }
  return oneTub(tx, actor, id);
}

/** Deletes an unbooked tub; a booked one is refused (409) so no lesson loses its tub. */
export async function deleteTub(tx: Tx, actor: Actor, id: string): Promise<void> {
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
}

/** The tub's pack-away audits, newest first (404 for another school's tub). */
export async function tubAuditList(tx: Tx, actor: Actor, id: string): Promise<TubAudit[]> {
  await oneTub(tx, actor, id);
  const rows = await tx
    .select({ audit: tubAudits, userName: users.name })
    .from(tubAudits)
    .leftJoin(users, eq(users.id, tubAudits.userId))
    .where(eq(tubAudits.tubId, id))
    .orderBy(desc(tubAudits.createdAt), desc(tubAudits.id));
  return rows.map((r) => auditOut(r.audit, r.userName));
}

/**
 * A pack-away audit: `missing` adds to the tub's missing counts, `found` takes away, and each
 * count stays between 0 and the kit's quantity. Audits are serialised per tub by a row lock.
 */
export async function recordAudit(
  tx: Tx,
  actor: Actor,
  id: string,
  body: z.output<typeof tubAuditCreateSchema>,
): Promise<{ audit: TubAudit; tub: Tub }> {
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
}
