/**
 * Copying a unit into someone's own units (API.md, "Reuse"): the unit with its outcome links,
 * every lesson with its activities in order, their materials and attachments, in the caller's
 * transaction, so a failure anywhere leaves nothing behind. The copy is private, a draft, owned by
 * the caller, and remembers where it came from (unit_copies) with a snapshot of the original.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  activities,
  attachments,
  classes,
  kitTypes,
  lessons,
  lessonTubs,
  materials,
  nonTeachingDays,
  schools,
  terms,
  unitCopies,
  unitOutcomes,
  units,
  users,
} from '../db/schema/index.js';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import type { CopiedLesson, CopySummary, UnitCopy } from '../../shared/schemas/reuse.js';
import { defaultTubIds, invalid } from '../planning/checks.js';
import { recordUnitEvent } from '../planning/history.js';
import { toLocal } from '../planning/format.js';
import { daysBetween, notTeachingReason, shiftLocal, type SchoolCalendar } from './dates.js';
import { loadUnitSnapshot } from './snapshot.js';
import { planCounts, summaryText } from './plan-counts.js';

export interface CopyRequest extends UnitCopy {
  sourceUnitId: string;
  /** The new owner (the caller) and their school. */
  ownerId: string;
  schoolId: string;
  /** When the copy is made (the demo seed dates its copy; otherwise now). */
  at?: Date;
}

export interface CopyResult {
  unitId: string;
  summary: CopySummary;
}

async function schoolCalendar(tx: Tx, schoolId: string): Promise<SchoolCalendar> {
  const days = await tx
    .select({ date: nonTeachingDays.date, reason: nonTeachingDays.reason })
    .from(nonTeachingDays)
    .where(eq(nonTeachingDays.schoolId, schoolId));
  const termRows = await tx
    .select({ name: terms.name, startsOn: terms.startsOn, endsOn: terms.endsOn })
    .from(terms)
    .where(eq(terms.schoolId, schoolId));
  return { nonTeaching: new Map(days.map((d) => [d.date, d.reason])), terms: termRows };
}

/**
 * Everything the copy takes must be the caller's school's: the class asked for, and the classes,
 * kit types and files of the lessons copied. A stray record of another school is refused (400)
 * before anything is written.
 */
async function schoolProblems(
  tx: Tx,
  request: CopyRequest,
  sourceLessons: {
    id: string;
    title: string;
    schoolId: string;
    classId: string;
    kitTypeId: string;
  }[],
): Promise<ApiErrorDetail[]> {
  const out: ApiErrorDetail[] = [];
  if (request.classId) {
    const [cls] = await tx
      .select({ id: classes.id })
      .from(classes)
      .where(and(eq(classes.id, request.classId), eq(classes.schoolId, request.schoolId)));
    if (!cls) out.push({ path: 'classId', message: 'Choose a class of your school.' });
  }
  if (sourceLessons.length === 0) return out;
  const ids = sourceLessons.map((l) => l.id);
  const kitOk = new Set(
    (
      await tx
        .select({ id: kitTypes.id })
        .from(kitTypes)
        .where(
          and(
            inArray(kitTypes.id, [...new Set(sourceLessons.map((l) => l.kitTypeId))]),
            eq(kitTypes.schoolId, request.schoolId),
          ),
        )
    ).map((k) => k.id),
  );
  const classOk = new Set(
    (
      await tx
        .select({ id: classes.id })
        .from(classes)
        .where(
          and(
            inArray(classes.id, [...new Set(sourceLessons.map((l) => l.classId))]),
            eq(classes.schoolId, request.schoolId),
          ),
        )
    ).map((c) => c.id),
  );
  // Files hang off activities of these lessons; any under a lesson of another school is stray.
  const strayFiles = await tx
    .select({ lessonId: lessons.id, filename: attachments.filename })
    .from(attachments)
    .innerJoin(activities, eq(activities.id, attachments.activityId))
    .innerJoin(lessons, eq(lessons.id, activities.lessonId))
    .where(and(inArray(lessons.id, ids), sql`${lessons.schoolId} <> ${request.schoolId}`));
  for (const l of sourceLessons) {
    const where = `Lesson “${l.title}”`;
    if (l.schoolId !== request.schoolId || strayFiles.some((f) => f.lessonId === l.id))
      out.push({ path: '', message: `${where} and its files belong to another school.` });
    else if (!kitOk.has(l.kitTypeId))
      out.push({ path: '', message: `${where} uses a kit type of another school.` });
    else if (!request.classId && !classOk.has(l.classId))
      out.push({ path: '', message: `${where} is on a class of another school.` });
  }
  return out;
}

/**
 * Copies the unit (whose reading the caller has checked) and answers the new unit's id with the
 * summary of how the plans changed. Run it in one transaction: it writes many rows.
 */
export async function copyUnit(tx: Tx, request: CopyRequest): Promise<CopyResult> {
  const [source] = await tx
    .select({ unit: units, ownerName: users.name, ownerEmail: users.email })
    .from(units)
    .innerJoin(users, eq(users.id, units.ownerId))
    .where(eq(units.id, request.sourceUnitId));
  if (!source) throw invalid([{ path: '', message: 'That unit no longer exists.' }]);
  const sourceLessons = await tx
    .select()
    .from(lessons)
    .where(eq(lessons.unitId, request.sourceUnitId))
    .orderBy(asc(lessons.position), asc(lessons.createdAt), asc(lessons.id));
  const problems = await schoolProblems(tx, request, sourceLessons);
  if (problems.length) throw invalid(problems);

  const [school] = await tx
    .select({ timezone: schools.timezone })
    .from(schools)
    .where(eq(schools.id, request.schoolId));
  const zone = school?.timezone ?? 'UTC';
  // The first lesson in time (not in the unit's order) lands on the start date.
  const first = sourceLessons.map((l) => toLocal(l.startsAt)).sort()[0];
  const shift = request.startDate && first ? daysBetween(first.slice(0, 10), request.startDate) : 0;
  const calendar = await schoolCalendar(tx, request.schoolId);
  const snapshot = await loadUnitSnapshot(tx, request.sourceUnitId);

  const s = source.unit;
  const [created] = await tx
    .insert(units)
    .values({
      schoolId: request.schoolId,
      ownerId: request.ownerId,
      title: request.title ?? s.title,
      yearLevel: s.yearLevel,
      learningArea: s.learningArea,
      term: s.term,
      overview: s.overview,
      status: 'draft',
      visibility: 'private',
      copiedFromId: s.id,
      ...(request.at ? { createdAt: request.at, updatedAt: request.at } : {}),
    })
    .returning({ id: units.id });
  const unitId = created!.id;
  const ownerName = source.ownerName || source.ownerEmail;
  await tx.insert(unitCopies).values({
    unitId,
    sourceUnitId: s.id,
    sourceVersion: s.version,
    sourceTitle: s.title,
    sourceOwnerName: ownerName,
    snapshot,
    ...(request.at ? { copiedAt: request.at } : {}),
  });
  await tx.execute(sql`
    INSERT INTO ${unitOutcomes} (unit_id, outcome_id)
    SELECT ${unitId}::uuid, outcome_id FROM ${unitOutcomes} WHERE unit_id = ${s.id}::uuid`);

  const copied: CopiedLesson[] = [];
  for (const l of sourceLessons) {
    const startsAt = shiftLocal(toLocal(l.startsAt), shift, zone);
    const endsAt = shiftLocal(toLocal(l.endsAt), shift, zone);
    const [lesson] = await tx
      .insert(lessons)
      .values({
        unitId,
        schoolId: request.schoolId,
        position: l.position,
        title: l.title,
        classId: request.classId ?? l.classId,
        kitTypeId: l.kitTypeId,
        startsAt,
        endsAt,
        periodId: l.periodId,
        room: l.room,
        groupSize: l.groupSize,
        learningIntention: l.learningIntention,
        successCriteria: l.successCriteria,
        reliefNotes: l.reliefNotes,
        reliefTeacherId: null,
        ...(request.at ? { createdAt: request.at, updatedAt: request.at } : {}),
      })
      .returning({ id: lessons.id });
    const lessonId = lesson!.id;
    const tubIds = await defaultTubIds(tx, l.kitTypeId);
    if (tubIds.length)
      await tx.insert(lessonTubs).values(tubIds.map((tubId) => ({ lessonId, tubId })));
    await copyActivities(tx, l.id, lessonId);
    copied.push({
      lessonId,
      sourceLessonId: l.id,
      title: l.title,
      startsAt,
      notTeaching: notTeachingReason(startsAt.slice(0, 10), calendar),
      before: await planCounts(tx, l.id),
      after: await planCounts(tx, lessonId),
    });
  }

  await recordUnitEvent(tx, {
    unitId,
    schoolId: request.schoolId,
    actorId: request.ownerId,
    action: 'copied',
    summary: `copied from version ${s.version} of ${s.title} by ${ownerName}`,
  });
  return { unitId, summary: { text: summaryText(copied), lessons: copied } };
}

/** A lesson's activities in order, each with its materials and attachments (bytes copied in SQL). */
async function copyActivities(tx: Tx, fromLessonId: string, toLessonId: string): Promise<void> {
  const list = await tx
    .select()
    .from(activities)
    .where(eq(activities.lessonId, fromLessonId))
    .orderBy(asc(activities.position), asc(activities.id));
  for (const a of list) {
    const [row] = await tx
      .insert(activities)
      .values({
        lessonId: toLessonId,
        position: a.position,
        title: a.title,
        kind: a.kind,
        minutes: a.minutes,
      })
      .returning({ id: activities.id });
    const activityId = row!.id;
    const lines = await tx
      .select()
      .from(materials)
      .where(eq(materials.activityId, a.id))
      .orderBy(asc(materials.position), asc(materials.id));
    if (lines.length)
      await tx.insert(materials).values(
        lines.map((m) => ({
          activityId,
          position: m.position,
          partCode: m.partCode,
          consumable: m.consumable,
          qty: m.qty,
          per: m.per,
          returnable: m.returnable,
        })),
      );
    // The files' bytes stay in the database: copied row by row, in their order, without a
    // round trip through the server's memory.
    await tx.execute(sql`
      INSERT INTO ${attachments} (activity_id, filename, content_type, size, bytes, created_at)
      SELECT ${activityId}::uuid, filename, content_type, size, bytes, created_at
      FROM ${attachments} WHERE activity_id = ${a.id}::uuid
      ORDER BY created_at, id`);
  }
}
