/**
 * A unit's content as plain JSON: its fields, outcomes, and lessons with their activities,
 * materials and attachments' names, in order. A copy stores the original's snapshot when it is
 * made; comparing it with the original's snapshot now tells what changed upstream. The same
 * shapes, taken before and after an edit, give the history's short summaries.
 */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  activities,
  attachments,
  classes,
  kitTypes,
  lessons,
  lessonTubs,
  materials,
  outcomes,
  parts,
  tubs,
  unitOutcomes,
  units,
  users,
} from '../db/schema/index.js';
import { toLocal } from '../planning/format.js';

export interface MaterialSnapshot {
  partCode: string | null;
  consumable: string | null;
  /** The part's name in the kit type's parts list, or the consumable; for the words only. */
  name: string;
  qty: number;
  per: string;
  returnable: boolean;
}

export interface ActivitySnapshot {
  id: string;
  title: string;
  kind: string;
  minutes: number;
  materials: MaterialSnapshot[];
  attachments: string[];
}

export interface LessonSnapshot {
  id: string;
  title: string;
  /** Local `YYYY-MM-DDTHH:MM`. */
  startsAt: string;
  endsAt: string;
  className: string;
  kitTypeName: string;
  groupSize: number;
  room: string;
  learningIntention: string;
  successCriteria: string;
  reliefNotes: string;
  reliefTeacher: string | null;
  /** Labels of the booked tubs, sorted. */
  tubs: string[];
  activities: ActivitySnapshot[];
}

export interface UnitFieldsSnapshot {
  title: string;
  yearLevel: number;
  learningArea: string;
  term: number | null;
  overview: string;
  /** Outcome codes, sorted. */
  outcomes: string[];
}

export interface UnitSnapshot extends UnitFieldsSnapshot {
  lessons: LessonSnapshot[];
}

const byLabel = (a: string, b: string) => a.localeCompare(b, 'en', { numeric: true });

/** Lessons (all of a unit's, in order, or one) with everything under them. */
async function loadLessons(
  tx: Tx,
  where: { unitId: string } | { lessonId: string },
): Promise<LessonSnapshot[]> {
  const rows = await tx
    .select({
      lesson: lessons,
      className: classes.name,
      kitTypeName: kitTypes.name,
      reliefTeacher: users.name,
      reliefEmail: users.email,
    })
    .from(lessons)
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .innerJoin(kitTypes, eq(kitTypes.id, lessons.kitTypeId))
    .leftJoin(users, eq(users.id, lessons.reliefTeacherId))
    .where('unitId' in where ? eq(lessons.unitId, where.unitId) : eq(lessons.id, where.lessonId))
    .orderBy(asc(lessons.position), asc(lessons.createdAt), asc(lessons.id));
  if (rows.length === 0) return [];
  const lessonIds = rows.map((r) => r.lesson.id);
  const booked = await tx
    .select({ lessonId: lessonTubs.lessonId, label: tubs.label })
    .from(lessonTubs)
    .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
    .where(inArray(lessonTubs.lessonId, lessonIds));
  const activityRows = await tx
    .select()
    .from(activities)
    .where(inArray(activities.lessonId, lessonIds))
    .orderBy(asc(activities.position), asc(activities.id));
  const activityIds = activityRows.map((a) => a.id);
  const materialRows = activityIds.length
    ? await tx
        .select()
        .from(materials)
        .where(inArray(materials.activityId, activityIds))
        .orderBy(asc(materials.position), asc(materials.id))
    : [];
  const fileRows = activityIds.length
    ? await tx
        .select({ activityId: attachments.activityId, filename: attachments.filename })
        .from(attachments)
        .where(inArray(attachments.activityId, activityIds))
        .orderBy(asc(attachments.createdAt), asc(attachments.id))
    : [];
  const kitIds = [...new Set(rows.map((r) => r.lesson.kitTypeId))];
  const partRows = await tx
    .select({ kitTypeId: parts.kitTypeId, code: parts.code, name: parts.name })
    .from(parts)
    .where(inArray(parts.kitTypeId, kitIds));
  const partName = new Map(partRows.map((p) => [`${p.kitTypeId} ${p.code}`, p.name]));

  return rows.map(({ lesson: l, className, kitTypeName, reliefTeacher, reliefEmail }) => ({
    id: l.id,
    title: l.title,
    startsAt: toLocal(l.startsAt),
    endsAt: toLocal(l.endsAt),
    className,
    kitTypeName,
    groupSize: l.groupSize,
    room: l.room,
    learningIntention: l.learningIntention,
    successCriteria: l.successCriteria,
    reliefNotes: l.reliefNotes,
    reliefTeacher: l.reliefTeacherId ? reliefTeacher || reliefEmail || 'someone' : null,
    tubs: booked
      .filter((b) => b.lessonId === l.id)
      .map((b) => b.label)
      .sort(byLabel),
    activities: activityRows
      .filter((a) => a.lessonId === l.id)
      .map((a) => ({
        id: a.id,
        title: a.title,
        kind: a.kind,
        minutes: a.minutes,
        materials: materialRows
          .filter((m) => m.activityId === a.id)
          .map((m) => ({
            partCode: m.partCode,
            consumable: m.consumable,
            name:
              m.partCode !== null
                ? (partName.get(`${l.kitTypeId} ${m.partCode}`) ?? m.partCode)
                : (m.consumable ?? ''),
            qty: m.qty,
            per: m.per,
            returnable: m.returnable,
          })),
        attachments: fileRows.filter((f) => f.activityId === a.id).map((f) => f.filename),
      })),
  }));
}

/** One lesson's snapshot, or null when there is no such lesson. */
export async function loadLessonSnapshot(tx: Tx, lessonId: string): Promise<LessonSnapshot | null> {
  const [lesson] = await loadLessons(tx, { lessonId });
  return lesson ?? null;
}

/** The unit's own fields and outcome codes, or null when there is no such unit. */
export async function loadUnitFields(tx: Tx, unitId: string): Promise<UnitFieldsSnapshot | null> {
  const [u] = await tx.select().from(units).where(eq(units.id, unitId));
  if (!u) return null;
  const codes = await tx
    .select({ code: outcomes.code })
    .from(unitOutcomes)
    .innerJoin(outcomes, eq(outcomes.id, unitOutcomes.outcomeId))
    .where(eq(unitOutcomes.unitId, unitId));
  return {
    title: u.title,
    yearLevel: u.yearLevel,
    learningArea: u.learningArea,
    term: u.term,
    overview: u.overview,
    outcomes: codes.map((c) => c.code).sort(byLabel),
  };
}

/** The whole unit's snapshot, or null when there is no such unit. */
export async function loadUnitSnapshot(tx: Tx, unitId: string): Promise<UnitSnapshot | null> {
  const fields = await loadUnitFields(tx, unitId);
  if (!fields) return null;
  return { ...fields, lessons: await loadLessons(tx, { unitId }) };
}
