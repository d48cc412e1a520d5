/**
 * Writing a unit's history from the routes that change units, lessons and activities: each
 * takes what the record looked like before and after the change, inside the change's own
 * transaction, and records one short line (nothing when nothing a teacher would notice changed).
 */
import { asc, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, lessons, unitCoauthors, units, users } from '../db/schema/index.js';
import type { Actor } from '../auth/policy.js';
import { recordUnitEvent, type UnitEventAction } from '../planning/history.js';
import {
  activityChanges,
  clip,
  lessonFieldChanges,
  lessonWhen,
  unitFieldChanges,
} from './changes.js';
import {
  loadLessonSnapshot,
  loadUnitFields,
  type LessonSnapshot,
  type UnitFieldsSnapshot,
} from './snapshot.js';

/** A unit's fields as its edit history compares them, with visibility and co-authors. */
export interface UnitState extends UnitFieldsSnapshot {
  visibility: string;
  coauthors: string[];
  coauthorIds: string[];
}

/** Locks the unit's row until commit and reads its state (null when there is no such unit). */
export async function lockedUnitState(tx: Tx, unitId: string): Promise<UnitState | null> {
  const [row] = await tx
    .select({ visibility: units.visibility })
    .from(units)
    .where(eq(units.id, unitId))
    .for('update');
  const fields = await loadUnitFields(tx, unitId);
  if (!row || !fields) return null;
  const people = await tx
    .select({ id: users.id, name: users.name, email: users.email })
    .from(unitCoauthors)
    .innerJoin(users, eq(users.id, unitCoauthors.userId))
    .where(eq(unitCoauthors.unitId, unitId))
    .orderBy(asc(users.name));
  return {
    ...fields,
    visibility: row.visibility,
    coauthors: people.map((p) => p.name || p.email),
    coauthorIds: people.map((p) => p.id),
  };
}

interface Where {
  unitId: string;
  schoolId: string;
  lessonId?: string | null;
}

async function record(
  tx: Tx,
  actor: Actor,
  where: Where,
  action: UnitEventAction,
  summary: string,
): Promise<void> {
  await recordUnitEvent(tx, {
    unitId: where.unitId,
    schoolId: where.schoolId,
    actorId: actor.id,
    action,
    summary: clip(summary),
    lessonId: where.lessonId ?? null,
  });
}

export async function recordCreated(tx: Tx, actor: Actor, unitId: string): Promise<void> {
  await record(tx, actor, { unitId, schoolId: actor.schoolId }, 'created', 'created the unit');
}

/** "title A → B; visibility private → school" (nothing when nothing changed). */
export async function recordUnitEdit(
  tx: Tx,
  actor: Actor,
  unitId: string,
  before: UnitState,
  after: UnitState,
): Promise<void> {
  const words = unitFieldChanges(before, after);
  if (words.length)
    await record(tx, actor, { unitId, schoolId: actor.schoolId }, 'unit-edited', words.join('; '));
}

export async function recordLessonsReordered(tx: Tx, actor: Actor, unitId: string): Promise<void> {
  await record(tx, actor, { unitId, schoolId: actor.schoolId }, 'unit-edited', 'lessons reordered');
}

/** Locks the lesson's row until commit and reads its snapshot. */
export async function lockedLesson(tx: Tx, lessonId: string): Promise<LessonSnapshot | null> {
  await tx.select({ id: lessons.id }).from(lessons).where(eq(lessons.id, lessonId)).for('update');
  return loadLessonSnapshot(tx, lessonId);
}

function lessonWhere(actor: Actor, unitId: string, lessonId: string): Where {
  return { unitId, schoolId: actor.schoolId, lessonId };
}

export async function recordLessonAdded(
  tx: Tx,
  actor: Actor,
  unitId: string,
  lessonId: string,
): Promise<void> {
  const lesson = await loadLessonSnapshot(tx, lessonId);
  if (!lesson) return;
  await record(
    tx,
    actor,
    lessonWhere(actor, unitId, lessonId),
    'lesson-added',
    `added lesson ${lesson.title} (${lessonWhen(lesson)})`,
  );
}

export async function recordLessonEdit(
  tx: Tx,
  actor: Actor,
  unitId: string,
  before: LessonSnapshot,
  after: LessonSnapshot | null,
): Promise<void> {
  if (!after) return;
  const words = lessonFieldChanges(before, after);
  if (words.length)
    await record(
      tx,
      actor,
      lessonWhere(actor, unitId, after.id),
      'lesson-edited',
      `${after.title}: ${words.join('; ')}`,
    );
}

export async function recordLessonRemoved(
  tx: Tx,
  actor: Actor,
  unitId: string,
  before: LessonSnapshot,
): Promise<void> {
  await record(
    tx,
    actor,
    lessonWhere(actor, unitId, before.id),
    'lesson-removed',
    `removed lesson ${before.title} (${lessonWhen(before)})`,
  );
}

export async function recordActivitiesReordered(
  tx: Tx,
  actor: Actor,
  unitId: string,
  lesson: LessonSnapshot,
): Promise<void> {
  await record(
    tx,
    actor,
    lessonWhere(actor, unitId, lesson.id),
    'lesson-edited',
    `${lesson.title}: activities reordered`,
  );
}

/** An activity added, changed or removed (its lesson's snapshot before and after the change). */
export async function recordActivityChange(
  tx: Tx,
  actor: Actor,
  unitId: string,
  activityId: string,
  before: LessonSnapshot | null,
  after: LessonSnapshot | null,
): Promise<void> {
  const lesson = after ?? before;
  if (!lesson) return;
  const was = before?.activities.find((a) => a.id === activityId);
  const now = after?.activities.find((a) => a.id === activityId);
  const where = lessonWhere(actor, unitId, lesson.id);
  if (!was && now)
    await record(
      tx,
      actor,
      where,
      'activity-added',
      `${lesson.title}: added activity ${now.title}`,
    );
  else if (was && !now)
    await record(
      tx,
      actor,
      where,
      'activity-removed',
      `${lesson.title}: removed activity ${was.title}`,
    );
  else if (was && now) {
    const words = activityChanges(was, now);
    if (words.length)
      await record(
        tx,
        actor,
        where,
        'activity-edited',
        `${lesson.title}, ${now.title}: ${words.join('; ')}`,
      );
  }
}

/** The lesson an activity belongs to (for the routes that start from an activity's id). */
export async function lessonOfActivity(tx: Tx, activityId: string): Promise<string | null> {
  const [row] = await tx
    .select({ lessonId: activities.lessonId })
    .from(activities)
    .where(eq(activities.id, activityId));
  return row?.lessonId ?? null;
}
