/**
 * Kit types and their parts lists: the data logic behind routes/kit-types.ts (which parses,
 * authorises and answers). Every change of a parts list bumps the kit type's `version`.
 */
import { and, asc, eq, notInArray, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { kitTypes, partPhotos, parts, tubs } from '../db/schema/index.js';
import { HttpError, notFound } from '../http.js';
import { isUniqueViolation } from '../db/errors.js';
import { stale, versionedUpdate } from '../db/versions.js';
import { naturalCompare } from '../../shared/prep/index.js';
import type { KitType, KitTypeSummary, Part, PartValues } from '../../shared/schemas/kits.js';

const nameTaken = () =>
  new HttpError(409, 'name-taken', 'Another kit type of the school already has this name.', [
    { path: 'name', message: 'Another kit type already has this name.' },
  ]);

/** Runs `work`; a unique-key violation (a name taken meanwhile) becomes the name-taken 409. */
export async function withUniqueName<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    throw isUniqueViolation(err) ? nameTaken() : err;
  }
}

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

export async function kitTypeSummaries(
  tx: Tx,
  schoolId: string,
  onlyId?: string,
): Promise<KitTypeSummary[]> {
  const rows = await tx
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
  // Names in reading order, numbers as numbers, as tubs are listed (shared/prep/natural.ts).
  return rows.sort((a, b) => naturalCompare(a.name, b.name));
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
  return rows;
}

/** The kit type with its parts, or 404 (also for another school's kit type). */
export async function oneKitType(tx: Tx, schoolId: string, id: string): Promise<KitType> {
  const [summary] = await kitTypeSummaries(tx, schoolId, id);
  if (!summary) throw notFound('That kit type');
  return { ...summary, parts: await partsOf(tx, id) };
}

/** The school's kit type (id and name), or 404 (also for another school's kit type). */
export async function schoolKitType(
  tx: Tx,
  schoolId: string,
  id: string,
): Promise<{ id: string; name: string }> {
  const [kit] = await tx
    .select({ id: kitTypes.id, name: kitTypes.name })
    .from(kitTypes)
    .where(and(eq(kitTypes.id, id), eq(kitTypes.schoolId, schoolId)));
  if (!kit) throw notFound('That kit type');
  return kit;
}

/** Bumps the kit type's version if it is `version` (any, when undefined); 409 with it if stale. */
export async function bumpKitVersion(
  tx: Tx,
  schoolId: string,
  id: string,
  version?: number,
): Promise<void> {
  const where = and(eq(kitTypes.id, id), eq(kitTypes.schoolId, schoolId));
  if (await versionedUpdate(tx, kitTypes, where, version)) return;
  throw stale(
    'kit type',
    await oneKitType(tx, schoolId, id),
    'Someone changed this kit type after you opened it. Reload to see their changes.',
  );
}

async function checkName(tx: Tx, schoolId: string, name: string, exceptId?: string) {
  const [clash] = await tx
    .select({ id: kitTypes.id })
    .from(kitTypes)
    .where(
      and(
        eq(kitTypes.schoolId, schoolId),
        sql`lower(${kitTypes.name}) = lower(${name})`,
        exceptId ? sql`${kitTypes.id} <> ${exceptId}` : undefined,
      ),
    );
  if (clash) throw nameTaken();
}

export async function createKitType(
  tx: Tx,
  schoolId: string,
  values: { name: string; description: string },
): Promise<KitType> {
  await checkName(tx, schoolId, values.name);
  const [row] = await tx
    .insert(kitTypes)
    .values({ schoolId, ...values })
    .returning({ id: kitTypes.id });
  return oneKitType(tx, schoolId, row!.id);
}

export async function updateKitType(
  tx: Tx,
  schoolId: string,
  id: string,
  version: number,
  fields: { name?: string; description?: string },
): Promise<KitType> {
  await bumpKitVersion(tx, schoolId, id, version);
  if (fields.name !== undefined) await checkName(tx, schoolId, fields.name, id);
  await tx.update(kitTypes).set(fields).where(eq(kitTypes.id, id));
  return oneKitType(tx, schoolId, id);
}

/**
 * Deleting is refused while any lesson uses the kit type or books one of its tubs (a plan
 * must not lose its parts list). Unused, it goes with its tubs, parts and photos: nothing
 * else points at it, so an archive would only hide clutter.
 */
export async function deleteKitType(
  tx: Tx,
  schoolId: string,
  kit: { id: string; name: string },
): Promise<void> {
  await tx.execute(sql`SELECT id FROM kit_types WHERE id = ${kit.id} FOR UPDATE`);
  const [summary] = await kitTypeSummaries(tx, schoolId, kit.id);
  const n = summary?.lessonCount ?? 0;
  if (n > 0) {
    const [lessonWord, them] = n === 1 ? ['lesson', 'it'] : ['lessons', 'them'];
    throw new HttpError(
      409,
      'in-use',
      `${kit.name} is used by ${n} ${lessonWord}. ` +
        `Give ${them} another kit type or delete ${them} first.`,
    );
  }
  await tx.delete(tubs).where(eq(tubs.kitTypeId, kit.id));
  await tx.delete(kitTypes).where(eq(kitTypes.id, kit.id));
}

/**
 * Makes the parts list exactly `list`, in its order. Lines are matched by code, so a part keeps
 * its id across a re-import; tubs' missing counts follow: dropped for a code no longer listed,
 * and never more than the new quantity.
 */
export async function replaceParts(tx: Tx, kitTypeId: string, list: PartValues[]): Promise<void> {
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
export async function fitMissing(tx: Tx, kitTypeId: string): Promise<void> {
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
