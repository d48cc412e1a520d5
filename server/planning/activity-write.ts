/** Creating and changing activities and their bills of materials. */
import { eq, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, lessons, materials } from '../db/schema/index.js';
import {
  activityCreateSchema,
  activityUpdateSchema,
  type Activity,
  type MaterialInput,
} from '../../shared/schemas/lessons.js';
import { check, invalid, materialProblems } from './checks.js';
import type { LessonFacts } from './access.js';
import { activityDetail } from './lessons.js';
import { stale, versionedUpdate } from '../db/versions.js';

function rawMaterials(body: unknown): unknown {
  return body && typeof body === 'object' ? (body as { materials?: unknown }).materials : undefined;
}

/** Locks the lesson row until commit and reads its kit type as it is now. */
async function lockLesson(tx: Tx, lessonId: string): Promise<string> {
  const [row] = await tx
    .select({ kitTypeId: lessons.kitTypeId })
    .from(lessons)
    .where(eq(lessons.id, lessonId))
    .for('update');
  if (!row) throw invalid([{ path: '', message: 'This lesson no longer exists.' }]);
  return row.kitTypeId;
}

/** Stores a bill of materials in order; `returnable` defaults to true for parts, false otherwise. */
async function insertMaterials(tx: Tx, activityId: string, list: MaterialInput[]): Promise<void> {
  if (list.length === 0) return;
  await tx.insert(materials).values(
    list.map((m, i) => ({
      activityId,
      position: i + 1,
      partCode: m.partCode ?? null,
      consumable: m.consumable ?? null,
      qty: m.qty,
      per: m.per,
      returnable: m.returnable ?? m.partCode !== undefined,
    })),
  );
}

/** Appends an activity to the lesson (whose editing the caller has checked). */
export async function createActivity(
  tx: Tx,
  lesson: LessonFacts,
  body: unknown,
): Promise<Activity> {
  // Locking the lesson row serialises appends (two activities never share a position) and keeps
  // its kit type fixed while the part codes are checked against it.
  const kitTypeId = await lockLesson(tx, lesson.id);
  const { data, details } = check(activityCreateSchema, body);
  details.push(...(await materialProblems(tx, kitTypeId, rawMaterials(body))));
  if (!data || details.length) throw invalid(details);
  const [{ last }] = (await tx
    .select({ last: sql<number>`coalesce(max(${activities.position}), 0)::int` })
    .from(activities)
    .where(eq(activities.lessonId, lesson.id))) as [{ last: number }];
  const [row] = await tx
    .insert(activities)
    .values({
      lessonId: lesson.id,
      position: last + 1,
      title: data.title,
      kind: data.kind,
      minutes: data.minutes,
    })
    .returning({ id: activities.id });
  await insertMaterials(tx, row!.id, data.materials);
  return activityDetail(tx, row!.id);
}

/** Applies a `PATCH /api/activities/:id`; sent materials replace the whole list. */
export async function updateActivity(
  tx: Tx,
  lesson: LessonFacts,
  activityId: string,
  body: unknown,
): Promise<Activity> {
  const kitTypeId = await lockLesson(tx, lesson.id);
  const { data, details } = check(activityUpdateSchema, body);
  details.push(...(await materialProblems(tx, kitTypeId, rawMaterials(body))));
  if (!data || details.length) throw invalid(details);
  const { version, materials: list, ...fields } = data;
  const updated = await versionedUpdate(
    tx,
    activities,
    eq(activities.id, activityId),
    version,
    fields,
  );
  if (!updated) throw stale('activity', await activityDetail(tx, activityId));
  if (list) {
    await tx.delete(materials).where(eq(materials.activityId, activityId));
    await insertMaterials(tx, activityId, list);
  }
  return activityDetail(tx, activityId);
}
