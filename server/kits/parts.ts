/** One part of a kit type's parts list, and part photos (keyed by kit type and part code). */
import { and, asc, eq, max, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, lessons, materials, partPhotos, parts, units } from '../db/schema/index.js';
import { HttpError, notFound } from '../http.js';
import type { KitType, Part, PartUpdate, PartValues } from '../../shared/schemas/kits.js';
import { bumpKitVersion, fitMissing, oneKitType, partsOf } from './kit-types.js';

/** Changes one part with the kit type's version; a new code takes its photo and counts along. */
export async function updatePart(
  tx: Tx,
  schoolId: string,
  kitTypeId: string,
  partId: string,
  { version, ...fields }: PartUpdate,
): Promise<KitType> {
  const id = kitTypeId;
  await bumpKitVersion(tx, schoolId, id, version);
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
      throw new HttpError(409, 'code-taken', `Another part already has the code ${fields.code}.`, [
        { path: 'code', message: 'Another part already has this code.' },
      ]);
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
  return oneKitType(tx, schoolId, id);
}

const codeTaken = (code: string) =>
  new HttpError(409, 'code-taken', `Another part already has the code ${code}.`, [
    { path: 'part.code', message: 'Another part already has this code.' },
  ]);

/** Adds one part at the end of the list, with the kit type's version (409 if stale). */
export async function addPart(
  tx: Tx,
  schoolId: string,
  kitTypeId: string,
  version: number,
  part: PartValues,
): Promise<KitType> {
  await bumpKitVersion(tx, schoolId, kitTypeId, version);
  const [clash] = await tx
    .select({ id: parts.id })
    .from(parts)
    .where(and(eq(parts.kitTypeId, kitTypeId), eq(parts.code, part.code)));
  if (clash) throw codeTaken(part.code);
  const [last] = await tx
    .select({ position: max(parts.position) })
    .from(parts)
    .where(eq(parts.kitTypeId, kitTypeId));
  await tx.insert(parts).values({ ...part, kitTypeId, position: (last?.position ?? -1) + 1 });
  return oneKitType(tx, schoolId, kitTypeId);
}

/**
 * Removes one part, with the kit type's version. A part that activities still list is refused
 * (409 naming the lessons): their plans would stop working. Its photo and the tubs' missing
 * counts of it go with it.
 */
export async function removePart(
  tx: Tx,
  schoolId: string,
  kitTypeId: string,
  partId: string,
  version: number | undefined,
): Promise<KitType> {
  const [part] = await tx
    .select()
    .from(parts)
    .where(and(eq(parts.id, partId), eq(parts.kitTypeId, kitTypeId)));
  if (!part) throw notFound('That part');
  const usedBy = await tx
    .selectDistinct({ title: lessons.title, unit: units.title })
    .from(materials)
    .innerJoin(activities, eq(activities.id, materials.activityId))
    .innerJoin(lessons, eq(lessons.id, activities.lessonId))
    .innerJoin(units, eq(units.id, lessons.unitId))
    .where(and(eq(lessons.kitTypeId, kitTypeId), eq(materials.partCode, part.code)))
    .orderBy(asc(units.title), asc(lessons.title));
  if (usedBy.length) {
    const named = usedBy
      .slice(0, 3)
      .map((u) => `“${u.title}” (${u.unit})`)
      .join(', ');
    const more = usedBy.length > 3 ? ` and ${usedBy.length - 3} more` : '';
    throw new HttpError(
      409,
      'part-in-use',
      `${part.code} ${part.name} is in the materials of ${named}${more}. ` +
        'Take it out of those activities first, or change its details instead.',
    );
  }
  await bumpKitVersion(tx, schoolId, kitTypeId, version);
  await tx
    .delete(partPhotos)
    .where(and(eq(partPhotos.kitTypeId, kitTypeId), eq(partPhotos.partCode, part.code)));
  await tx.delete(parts).where(eq(parts.id, partId));
  await fitMissing(tx, kitTypeId);
  return oneKitType(tx, schoolId, kitTypeId);
}

/** Stores the part's photo; `created` is whether it had none before. 404 for an unknown code. */
export async function savePartPhoto(
  tx: Tx,
  kitTypeId: string,
  code: string,
  contentType: string,
  bytes: Buffer,
): Promise<{ created: boolean; part: Part | undefined }> {
  const [part] = await tx
    .select({ id: parts.id })
    .from(parts)
    .where(and(eq(parts.kitTypeId, kitTypeId), eq(parts.code, code)));
  if (!part) throw notFound('That part');
  const [before] = await tx
    .select({ code: partPhotos.partCode })
    .from(partPhotos)
    .where(and(eq(partPhotos.kitTypeId, kitTypeId), eq(partPhotos.partCode, code)));
  await tx
    .insert(partPhotos)
    .values({ kitTypeId, partCode: code, contentType, bytes })
    .onConflictDoUpdate({
      target: [partPhotos.kitTypeId, partPhotos.partCode],
      set: { contentType, bytes, updatedAt: sql`now()` },
    });
  const list = await partsOf(tx, kitTypeId);
  return { created: !before, part: list.find((p) => p.code === code) };
}

/** The stored photo of a part, or 404. */
export async function partPhoto(tx: Tx, kitTypeId: string, code: string) {
  const [photo] = await tx
    .select()
    .from(partPhotos)
    .where(and(eq(partPhotos.kitTypeId, kitTypeId), eq(partPhotos.partCode, code)));
  if (!photo) throw notFound('That photo');
  return photo;
}

/** Deletes the part's photo, or 404 when there is none. */
export async function deletePartPhoto(tx: Tx, kitTypeId: string, code: string): Promise<void> {
  const gone = await tx
    .delete(partPhotos)
    .where(and(eq(partPhotos.kitTypeId, kitTypeId), eq(partPhotos.partCode, code)))
    .returning({ code: partPhotos.partCode });
  if (!gone.length) throw notFound('That photo');
}
