/** Creating and changing lessons: the checks against the school's records, then the writes. */
import { eq, inArray, sql } from 'drizzle-orm';
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

/** The material lines of the lesson's activities (line id, activity id and title, part code). */
async function materialLines(tx: Tx, lessonId: string) {
  return tx
    .select({
      id: materials.id,
      activityId: activities.id,
      title: activities.title,
      code: materials.partCode,
    })
    .from(materials)
    .innerJoin(activities, eq(activities.id, materials.activityId))
    .where(eq(activities.lessonId, lessonId));
}

type MaterialLine = Awaited<ReturnType<typeof materialLines>>[number];

/** A map that would list one part twice in an activity is refused (the engine refuses it). */
function mergeProblems(lines: readonly MaterialLine[], map: Map<string, string>) {
  if (!map.size) return [];
  const problems: { path: string; message: string }[] = [];
  const byActivity = new Map<string, { title: string; codes: string[] }>();
  for (const l of lines) {
    if (!l.code) continue;
    const entry = byActivity.get(l.activityId) ?? { title: l.title, codes: [] };
    entry.codes.push(map.get(l.code) ?? l.code);
    byActivity.set(l.activityId, entry);
  }
  for (const { title, codes } of byActivity.values()) {
    const twice = codes.find((c, i) => codes.indexOf(c) !== i);
    if (twice)
      problems.push({
        path: 'partMap',
        message: `“${title}” would list ${twice} twice: map the parts to different ones, or edit the activity first.`,
      });
  }
  return problems;
}

/** Maps and drops material lines for a new kit type; the activities changed get a new version. */
async function switchMaterials(
  tx: Tx,
  all: readonly MaterialLine[],
  map: Map<string, string>,
  drop: string[],
): Promise<void> {
  const lines = all.filter((l) => l.code !== null && (map.has(l.code) || drop.includes(l.code)));
  for (const line of lines) {
    const to = map.get(line.code!);
    if (to) await tx.update(materials).set({ partCode: to }).where(eq(materials.id, line.id));
    else await tx.delete(materials).where(eq(materials.id, line.id));
  }
  const changed = [...new Set(lines.map((l) => l.activityId))];
  if (changed.length)
    await tx
      .update(activities)
      .set({ version: sql`${activities.version} + 1` })
      .where(inArray(activities.id, changed));
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
  // A new kit type must hold every part the activities use, unless the save maps each missing
  // part to one of the new kit's (partMap) or leaves its lines out (dropMissingParts).
  let switching: {
    lines: MaterialLine[];
    map: Map<string, string>;
    drop: string[];
  } | null = null;
  if (data?.kitTypeId && kitChanged && !details.some((d) => d.path === 'kitTypeId')) {
    // Read once under the lesson's lock: the check and the switch see the same lines.
    const lines = await materialLines(tx, lessonId);
    const newCodes = await partCodesOf(tx, data.kitTypeId);
    const missing = [
      ...new Set(
        lines.map((l) => l.code).filter((c): c is string => c !== null && !newCodes.has(c)),
      ),
    ].sort();
    const map = new Map<string, string>();
    for (const [from, to] of Object.entries(data.partMap ?? {})) {
      if (!missing.includes(from)) continue;
      if (!newCodes.has(to))
        details.push({
          path: `partMap.${from}`,
          message: `The new kit type has no part ${to}.`,
        });
      else map.set(from, to);
    }
    const unresolved = missing.filter((c) => !map.has(c));
    if (unresolved.length && !data.dropMissingParts) {
      const [kit] = await tx
        .select({ name: kitTypes.name })
        .from(kitTypes)
        .where(eq(kitTypes.id, data.kitTypeId));
      details.push({
        path: 'kitTypeId',
        message: `The activities use parts that ${kit?.name ?? 'this kit type'} does not have: ${unresolved.join(', ')}. Choose a part of it for each, or leave them out.`,
      });
    }
    details.push(...mergeProblems(lines, map));
    switching = { lines, map, drop: data.dropMissingParts ? unresolved : [] };
  }
  if (!data || details.length) throw invalid(details);
  const { version, tubIds, partMap: _map, dropMissingParts: _drop, ...fields } = data;
  const updated = await versionedUpdate(tx, lessons, eq(lessons.id, lessonId), version, {
    ...fields,
    updatedAt: sql`now()`,
  });
  if (!updated) throw stale('lesson', await lessonDetail(tx, actor, lessonId));
  const [saved] = await tx
    .select({ kitTypeId: lessons.kitTypeId })
    .from(lessons)
    .where(eq(lessons.id, lessonId));
  if (switching) await switchMaterials(tx, switching.lines, switching.map, switching.drop);
  const rebook = tubIds ?? (kitChanged ? await defaultTubIds(tx, saved!.kitTypeId) : undefined);
  if (rebook) {
    await tx.delete(lessonTubs).where(eq(lessonTubs.lessonId, lessonId));
    if (rebook.length)
      await tx.insert(lessonTubs).values(rebook.map((tubId) => ({ lessonId, tubId })));
  }
  return lessonDetail(tx, actor, lessonId);
}
