/** Reading lessons and activities: the records their routes answer with. */
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
  parts,
  tubs,
  units,
} from '../db/schema/index.js';
import { notFound } from '../http.js';
import type { Actor } from '../auth/policy.js';
import { canEditUnit } from '../auth/policy.js';
import type { Activity, Lesson } from '../../shared/schemas/lessons.js';
import { loadLessonFacts } from './access.js';
import { naturalCompare } from '../../shared/prep/index.js';
import { toLocal } from './format.js';
import { bookingConflicts } from '../prep/booking-conflicts.js';

/** Part code → name of a kit type's parts list. */
async function partNames(tx: Tx, kitTypeId: string): Promise<Map<string, string>> {
  const rows = await tx
    .select({ code: parts.code, name: parts.name })
    .from(parts)
    .where(eq(parts.kitTypeId, kitTypeId));
  return new Map(rows.map((p) => [p.code, p.name]));
}

/** Activities of one lesson in order, each with its materials and attachments in order. */
async function activitiesOf(
  tx: Tx,
  lessonId: string,
  kitTypeId: string,
  onlyId?: string,
): Promise<Activity[]> {
  const rows = await tx
    .select()
    .from(activities)
    .where(eq(activities.lessonId, lessonId))
    .orderBy(asc(activities.position), asc(activities.id));
  const chosen = onlyId ? rows.filter((a) => a.id === onlyId) : rows;
  if (chosen.length === 0) return [];
  const ids = chosen.map((a) => a.id);
  const materialRows = await tx
    .select()
    .from(materials)
    .where(inArray(materials.activityId, ids))
    .orderBy(asc(materials.position), asc(materials.id));
  const attachmentRows = await tx
    .select({
      id: attachments.id,
      activityId: attachments.activityId,
      filename: attachments.filename,
      size: attachments.size,
      contentType: attachments.contentType,
    })
    .from(attachments)
    .where(inArray(attachments.activityId, ids))
    .orderBy(asc(attachments.createdAt), asc(attachments.id));
  const names = await partNames(tx, kitTypeId);
  return chosen.map((a) => ({
    id: a.id,
    lessonId: a.lessonId,
    version: a.version,
    position: a.position,
    title: a.title,
    kind: a.kind,
    minutes: a.minutes,
    materials: materialRows
      .filter((m) => m.activityId === a.id)
      .map((m) => ({
        id: m.id,
        partCode: m.partCode,
        partName: m.partCode === null ? null : (names.get(m.partCode) ?? null),
        consumable: m.consumable,
        qty: m.qty,
        per: m.per,
        returnable: m.returnable,
      })),
    attachments: attachmentRows
      .filter((f) => f.activityId === a.id)
      .map(({ id, filename, size, contentType }) => ({ id, filename, size, contentType })),
  }));
}

/** One activity as its routes answer it (the caller has checked the actor may read it). */
export async function activityDetail(tx: Tx, activityId: string): Promise<Activity> {
  const [row] = await tx
    .select({ lessonId: activities.lessonId, kitTypeId: lessons.kitTypeId })
    .from(activities)
    .innerJoin(lessons, eq(lessons.id, activities.lessonId))
    .where(eq(activities.id, activityId));
  if (!row) throw notFound('That activity');
  const [activity] = await activitiesOf(tx, row.lessonId, row.kitTypeId, activityId);
  if (!activity) throw notFound('That activity');
  return activity;
}

/** The lesson as `GET /api/lessons/:id` answers it, for this actor (404 when there is none). */
export async function lessonDetail(tx: Tx, actor: Actor, lessonId: string): Promise<Lesson> {
  const [row] = await tx
    .select({
      lesson: lessons,
      unit: { id: units.id, title: units.title, status: units.status },
      cls: classes,
      kit: { id: kitTypes.id, name: kitTypes.name },
    })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .innerJoin(kitTypes, eq(kitTypes.id, lessons.kitTypeId))
    .where(eq(lessons.id, lessonId));
  const facts = await loadLessonFacts(tx, lessonId);
  if (!row || !facts) throw notFound('That lesson');
  const booked = await tx
    .select({ id: tubs.id, label: tubs.label, status: tubs.status })
    .from(lessonTubs)
    .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
    .where(eq(lessonTubs.lessonId, lessonId));
  booked.sort((a, b) => naturalCompare(a.label, b.label));
  const l = row.lesson;
  return {
    id: l.id,
    version: l.version,
    position: l.position,
    title: l.title,
    unit: row.unit,
    class: {
      id: row.cls.id,
      name: row.cls.name,
      yearLevel: row.cls.yearLevel,
      studentCount: row.cls.studentCount,
      devices: row.cls.devices,
    },
    kitType: row.kit,
    tubIds: booked.map((t) => t.id),
    tubs: booked,
    startsAt: toLocal(l.startsAt),
    endsAt: toLocal(l.endsAt),
    periodId: l.periodId,
    room: l.room,
    groupSize: l.groupSize,
    learningIntention: l.learningIntention,
    successCriteria: l.successCriteria,
    reliefNotes: l.reliefNotes,
    reliefTeacherId: l.reliefTeacherId,
    canEdit: canEditUnit(actor, facts.unit),
    activities: await activitiesOf(tx, lessonId, l.kitTypeId),
    updatedAt: l.updatedAt.toISOString(),
    bookingConflicts: await bookingConflicts(tx, lessonId),
  };
}
