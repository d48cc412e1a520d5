/** Creating and changing lessons: the checks against the school's records, then the writes. */
import { eq, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, kitTypes, lessons, lessonTubs, materials, units } from '../db/schema/index.js';
import type { Actor } from '../auth/policy.js';
import {
  lessonCreateSchema,
  lessonUpdateSchema,
  type Lesson,
} from '../../shared/schemas/lessons.js';
import { check, defaultTubIds, invalid, lessonRefProblems, partCodesOf } from './checks.js';
import { lessonDetail } from './lessons.js';
import { toLocal } from './format.js';
import { stale, versionedUpdate } from '../db/versions.js';

type Raw = Record<string, unknown>;

function rawBody(body: unknown): Raw {
  return body && typeof body === 'object' && !Array.isArray(body) ? (body as Raw) : {};
}

/** Appends a lesson to the unit (whose editing the caller has checked); answers the new lesson. */
export async function createLesson(
  tx: Tx,
  actor: Actor,
  unitId: string,
  body: unknown,
): Promise<Lesson> {
  const raw = rawBody(body);
  const { data, details } = check(lessonCreateSchema, body);
  details.push(...(await lessonRefProblems(tx, actor.schoolId, raw)));
  if (!data || details.length) throw invalid(details);
  // Locking the unit row serialises appends, so two lessons never get the same position.
  await tx.select({ id: units.id }).from(units).where(eq(units.id, unitId)).for('update');
  const [{ last }] = (await tx
    .select({ last: sql<number>`coalesce(max(${lessons.position}), 0)::int` })
    .from(lessons)
    .where(eq(lessons.unitId, unitId))) as [{ last: number }];
  const { tubIds, ...fields } = data;
  const [lesson] = await tx
    .insert(lessons)
    .values({ ...fields, unitId, schoolId: actor.schoolId, position: last + 1 })
    .returning({ id: lessons.id });
  const booked = tubIds ?? (await defaultTubIds(tx, data.kitTypeId));
  if (booked.length)
    await tx.insert(lessonTubs).values(booked.map((tubId) => ({ lessonId: lesson!.id, tubId })));
  return lessonDetail(tx, actor, lesson!.id);
}

/** Part codes the lesson's activities use that a kit type's parts list lacks. */
async function codesMissingFrom(tx: Tx, lessonId: string, kitTypeId: string): Promise<string[]> {
  const used = await tx
    .selectDistinct({ code: materials.partCode })
    .from(materials)
    .innerJoin(activities, eq(activities.id, materials.activityId))
    .where(eq(activities.lessonId, lessonId));
  const codes = await partCodesOf(tx, kitTypeId);
  return used
    .map((u) => u.code)
    .filter((c): c is string => c !== null && !codes.has(c))
    .sort();
}

/**
 * Applies a `PATCH /api/lessons/:id` (editing checked by the caller). One end of the window is
 * checked against the stored other end (in elapsed time, in the school's timezone); a new kit
 * type must hold every part the activities use, and rebooks all its usable tubs unless `tubIds`
 * are sent.
 */
export async function updateLesson(
  tx: Tx,
  actor: Actor,
  lessonId: string,
  body: unknown,
): Promise<Lesson> {
  const raw = rawBody(body);
  const { data, details } = check(lessonUpdateSchema, body);
  // Locked first: activities check part codes against the kit type under the same lock.
  const [stored] = await tx.select().from(lessons).where(eq(lessons.id, lessonId)).for('update');
  if (!stored) throw invalid([{ path: '', message: 'This lesson no longer exists.' }]);
  const startsAt = raw.startsAt ?? toLocal(stored.startsAt);
  const endsAt = raw.endsAt ?? toLocal(stored.endsAt);
  const windowSent = raw.startsAt !== undefined || raw.endsAt !== undefined;
  const kitChanged = typeof raw.kitTypeId === 'string' && raw.kitTypeId !== stored.kitTypeId;
  details.push(
    ...(await lessonRefProblems(tx, actor.schoolId, {
      ...raw,
      kitTypeId: kitChanged ? raw.kitTypeId : undefined,
      effectiveKitTypeId: stored.kitTypeId,
      startsAt: windowSent ? startsAt : undefined,
      endsAt: windowSent ? endsAt : undefined,
    })),
  );
  if (data?.kitTypeId && kitChanged && !details.some((d) => d.path === 'kitTypeId')) {
    const missing = await codesMissingFrom(tx, lessonId, data.kitTypeId);
    if (missing.length) {
      const [kit] = await tx
        .select({ name: kitTypes.name })
        .from(kitTypes)
        .where(eq(kitTypes.id, data.kitTypeId));
      details.push({
        path: 'kitTypeId',
        message: `The activities use parts that ${kit?.name ?? 'this kit type'} does not have: ${missing.join(', ')}.`,
      });
    }
  }
  if (!data || details.length) throw invalid(details);
  const { version, tubIds, ...fields } = data;
  const updated = await versionedUpdate(tx, lessons, eq(lessons.id, lessonId), version, {
    ...fields,
    updatedAt: sql`now()`,
  });
  if (!updated) throw stale('lesson', await lessonDetail(tx, actor, lessonId));
  const [saved] = await tx
    .select({ kitTypeId: lessons.kitTypeId })
    .from(lessons)
    .where(eq(lessons.id, lessonId));
  const rebook = tubIds ?? (kitChanged ? await defaultTubIds(tx, saved!.kitTypeId) : undefined);
  if (rebook) {
    await tx.delete(lessonTubs).where(eq(lessonTubs.lessonId, lessonId));
    if (rebook.length)
      await tx.insert(lessonTubs).values(rebook.map((tubId) => ({ lessonId, tubId })));
  }
  return lessonDetail(tx, actor, lessonId);
}
