/**
 * Loads what the policy needs to know of a unit, lesson or activity and asks it. A record the
 * actor may not read answers 404 (another school's record must not be told apart from a missing
 * one); a record they read but may not change answers 403.
 */
import { eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, attachments, lessons, unitCoauthors, units } from '../db/schema/index.js';
import { forbidden, HttpError, notFound } from '../http.js';
import {
  canEditUnit,
  canReadLesson,
  canReadUnit,
  type Actor,
  type UnitFacts,
} from '../auth/policy.js';
import { withdrawEndorsement } from '../review/endorsement.js';

/** A unit's facts for the policy, or null when there is no such unit. */
export async function loadUnitFacts(tx: Tx, unitId: string): Promise<UnitFacts | null> {
  const [unit] = await tx
    .select({ schoolId: units.schoolId, ownerId: units.ownerId, visibility: units.visibility })
    .from(units)
    .where(eq(units.id, unitId));
  if (!unit) return null;
  const coauthors = await tx
    .select({ userId: unitCoauthors.userId })
    .from(unitCoauthors)
    .where(eq(unitCoauthors.unitId, unitId));
  return { ...unit, coauthorIds: coauthors.map((c) => c.userId) };
}

/** The unit's facts when the actor may read it; else 404. */
export async function readableUnit(tx: Tx, actor: Actor, unitId: string): Promise<UnitFacts> {
  const facts = await loadUnitFacts(tx, unitId);
  if (!facts || !canReadUnit(actor, facts)) throw notFound('That unit');
  return facts;
}

/**
 * The unit's facts when the actor may edit it; 404 when they cannot read it, 403 if only read.
 * Every caller is about to change the unit inside `tx`, so an endorsed unit goes back to draft
 * here, once for every kind of edit (rolled back with the edit if the edit fails). With
 * `{ change: false }` it only checks (an upload's check before its body is read).
 */
export async function editableUnit(
  tx: Tx,
  actor: Actor,
  unitId: string,
  options: { change?: boolean } = {},
): Promise<UnitFacts> {
  const facts = await readableUnit(tx, actor, unitId);
  if (!canEditUnit(actor, facts))
    throw forbidden('Only the unit’s owner and co-authors can change it.');
  if (options.change !== false) await withdrawEndorsement(tx, actor, unitId);
  return facts;
}

/** What a lesson's routes need: its unit's facts and the fields the policy and checks read. */
export interface LessonFacts {
  id: string;
  unitId: string;
  schoolId: string;
  kitTypeId: string;
  reliefTeacherId: string | null;
  unit: UnitFacts;
}

export async function loadLessonFacts(tx: Tx, lessonId: string): Promise<LessonFacts | null> {
  const [lesson] = await tx
    .select({
      id: lessons.id,
      unitId: lessons.unitId,
      schoolId: lessons.schoolId,
      kitTypeId: lessons.kitTypeId,
      reliefTeacherId: lessons.reliefTeacherId,
    })
    .from(lessons)
    .where(eq(lessons.id, lessonId));
  if (!lesson) return null;
  const unit = await loadUnitFacts(tx, lesson.unitId);
  return unit ? { ...lesson, unit } : null;
}

export async function readableLesson(tx: Tx, actor: Actor, lessonId: string): Promise<LessonFacts> {
  const facts = await loadLessonFacts(tx, lessonId);
  if (!facts || !canReadLesson(actor, facts.unit, facts)) throw notFound('That lesson');
  return facts;
}

/**
 * A lesson is edited by whoever edits its unit; as for the unit, an edit of a lesson (or of its
 * activities) puts an endorsed unit back to draft unless `{ change: false }`.
 */
export async function editableLesson(
  tx: Tx,
  actor: Actor,
  lessonId: string,
  options: { change?: boolean } = {},
): Promise<LessonFacts> {
  const facts = await readableLesson(tx, actor, lessonId);
  if (!canEditUnit(actor, facts.unit))
    throw forbidden('Only the unit’s owner and co-authors can change its lessons.');
  if (options.change !== false) await withdrawEndorsement(tx, actor, facts.unitId);
  return facts;
}

async function activityLessonId(tx: Tx, activityId: string): Promise<string | null> {
  const [row] = await tx
    .select({ lessonId: activities.lessonId })
    .from(activities)
    .where(eq(activities.id, activityId));
  return row?.lessonId ?? null;
}

/**
 * An activity's lesson facts, under the lesson's rules (404 / 403 as for the lesson). `edit`
 * is about to change it (see editableLesson); `check` asks the same question and changes nothing.
 */
export async function activityAccess(
  tx: Tx,
  actor: Actor,
  activityId: string,
  mode: 'read' | 'edit' | 'check',
): Promise<LessonFacts> {
  const lessonId = await activityLessonId(tx, activityId);
  if (!lessonId) throw notFound('That activity');
  try {
    return mode === 'read'
      ? await readableLesson(tx, actor, lessonId)
      : await editableLesson(tx, actor, lessonId, { change: mode === 'edit' });
  } catch (err) {
    // Say "activity", not "lesson": the caller asked for an activity.
    if (err instanceof HttpError && err.status === 404) throw notFound('That activity');
    throw err;
  }
}

/** An attachment's activity id and lesson facts, under the lesson's rules. */
export async function attachmentAccess(
  tx: Tx,
  actor: Actor,
  attachmentId: string,
  mode: 'read' | 'edit',
): Promise<{ activityId: string; lesson: LessonFacts }> {
  const [row] = await tx
    .select({ activityId: attachments.activityId })
    .from(attachments)
    .where(eq(attachments.id, attachmentId));
  if (!row) throw notFound('That attachment');
  try {
    return {
      activityId: row.activityId,
      lesson: await activityAccess(tx, actor, row.activityId, mode),
    };
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) throw notFound('That attachment');
    throw err;
  }
}
