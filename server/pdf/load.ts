/**
 * Loads what a printable needs from the database and computes the prep plan, giving the plain
 * JSON models of ./model.ts. Run inside one repeatable-read transaction per request, so a pack
 * matches the lesson as stored at that moment (nothing is cached between requests).
 */
import { asc, eq } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Tx } from '../db/client.js';
import {
  bellPeriods,
  classes,
  classTeachers,
  kitTypes,
  lessons,
  outcomes,
  schools,
  unitOutcomes,
  units,
  users,
} from '../db/schema/index.js';
import { toLocal } from '../planning/format.js';
import { planLesson } from '../prep/plan-lesson.js';
import { naturalCompare } from '../../shared/prep/index.js';
import type { LessonPackModel, PackOutcome, PrintContext, UnitOverviewModel } from './model.js';

/** The school's paper, clock and name, with the moment of the request. */
export async function loadPrintContext(
  tx: Tx,
  schoolId: string,
  generatedAt: Date,
): Promise<PrintContext> {
  const [school] = await tx
    .select({ name: schools.name, timezone: schools.timezone, paperSize: schools.paperSize })
    .from(schools)
    .where(eq(schools.id, schoolId));
  if (!school) throw new Error(`No school ${schoolId}`);
  return {
    paper: school.paperSize === 'Letter' ? 'Letter' : 'A4',
    timezone: school.timezone,
    schoolName: school.name,
    generatedAt: generatedAt.toISOString(),
  };
}

async function unitOutcomeList(tx: Tx, unitId: string): Promise<PackOutcome[]> {
  const rows = await tx
    .select({ code: outcomes.code, description: outcomes.description })
    .from(unitOutcomes)
    .innerJoin(outcomes, eq(outcomes.id, unitOutcomes.outcomeId))
    .where(eq(unitOutcomes.unitId, unitId));
  return rows.sort((a, b) => naturalCompare(a.code, b.code));
}

/**
 * The lesson's place in its unit, counted (positions have gaps after a delete, and the seed and
 * the API have started them at different numbers): lessons in the unit's order up to this one.
 */
async function lessonNumber(
  tx: Tx,
  unitId: string,
  lessonId: string,
): Promise<{ number: number; lessonCount: number }> {
  const ordered = await tx
    .select({ id: lessons.id })
    .from(lessons)
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position), asc(lessons.createdAt), asc(lessons.id));
  return {
    number: ordered.findIndex((l) => l.id === lessonId) + 1,
    lessonCount: ordered.length,
  };
}

const relief = alias(users, 'relief_teacher');
const owner = alias(users, 'unit_owner');

/** One lesson's pack model, or null when there is no such lesson. */
export async function loadLessonPack(tx: Tx, lessonId: string): Promise<LessonPackModel | null> {
  const [row] = await tx
    .select({
      id: lessons.id,
      unitId: lessons.unitId,
      position: lessons.position,
      title: lessons.title,
      unitTitle: units.title,
      classId: lessons.classId,
      className: classes.name,
      startsAt: lessons.startsAt,
      endsAt: lessons.endsAt,
      periodName: bellPeriods.name,
      room: lessons.room,
      kitTypeName: kitTypes.name,
      learningIntention: lessons.learningIntention,
      successCriteria: lessons.successCriteria,
      reliefNotes: lessons.reliefNotes,
      reliefName: relief.name,
      ownerName: owner.name,
    })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .innerJoin(kitTypes, eq(kitTypes.id, lessons.kitTypeId))
    .innerJoin(owner, eq(owner.id, units.ownerId))
    .leftJoin(bellPeriods, eq(bellPeriods.id, lessons.periodId))
    .leftJoin(relief, eq(relief.id, lessons.reliefTeacherId))
    .where(eq(lessons.id, lessonId));
  if (!row) return null;
  const planned = await planLesson(tx, lessonId);
  if (!planned) return null;
  const { input } = planned;
  const { number, lessonCount } = await lessonNumber(tx, row.unitId, lessonId);
  const teacherRows = await tx
    .select({ name: users.name })
    .from(classTeachers)
    .innerJoin(users, eq(users.id, classTeachers.userId))
    .where(eq(classTeachers.classId, row.classId))
    .orderBy(asc(users.name));

  const plan = planned.plannable ? planned.plan : null;
  const problems = planned.plannable ? [] : planned.problems.map((p) => p.message);
  // The parts the printed trays list: the pack's parts legend names only these.
  const named = new Set<string>();
  if (plan) {
    for (const g of plan.groups) for (const l of g.lines) named.add(l.partCode);
    for (const l of [...plan.classTray.lines, ...plan.sparesTray.lines]) named.add(l.partCode);
  }
  const usedUp = new Set<string>();
  for (const a of input.activities) {
    for (const m of a.materials) if (m.partCode && m.returnable === false) usedUp.add(m.partCode);
  }
  return {
    id: row.id,
    number,
    lessonCount,
    title: row.title,
    unitTitle: row.unitTitle,
    className: row.className,
    studentCount: input.class.studentCount,
    devices: input.class.devices,
    startsAt: toLocal(row.startsAt),
    endsAt: toLocal(row.endsAt),
    periodName: row.periodName,
    room: row.room,
    teachers: teacherRows.length ? teacherRows.map((t) => t.name) : [row.ownerName],
    reliefTeacher: row.reliefName,
    kitTypeName: row.kitTypeName,
    learningIntention: row.learningIntention,
    successCriteria: row.successCriteria,
    reliefNotes: row.reliefNotes,
    outcomes: await unitOutcomeList(tx, row.unitId),
    parts: input.parts
      .filter((p) => named.has(p.code))
      .map((p) => ({
        code: p.code,
        name: p.name,
        colour: p.colour ?? null,
        compartment: p.compartment ?? null,
        category: p.category,
        small: p.small,
        rechargeable: p.fullChargeMinutes != null,
      })),
    tubs: input.tubs.map((t) => ({
      label: t.label,
      controllerLabel: t.controllerLabel ?? null,
      status: t.status,
    })),
    usedUpParts: [...usedUp].filter((c) => named.has(c)),
    plan,
    problems,
  };
}

/** A unit's overview and every lesson's pack model, in lesson order; null when no such unit. */
export async function loadUnitPack(
  tx: Tx,
  unitId: string,
): Promise<{ unit: UnitOverviewModel; lessons: LessonPackModel[] } | null> {
  const [row] = await tx
    .select({
      id: units.id,
      title: units.title,
      yearLevel: units.yearLevel,
      learningArea: units.learningArea,
      term: units.term,
      overview: units.overview,
      ownerName: users.name,
    })
    .from(units)
    .innerJoin(users, eq(users.id, units.ownerId))
    .where(eq(units.id, unitId));
  if (!row) return null;
  const ids = await tx
    .select({ id: lessons.id })
    .from(lessons)
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position), asc(lessons.createdAt), asc(lessons.id));
  const packs: LessonPackModel[] = [];
  for (const { id } of ids) {
    const pack = await loadLessonPack(tx, id);
    if (pack) packs.push(pack);
  }
  return { unit: { ...row, outcomes: await unitOutcomeList(tx, unitId) }, lessons: packs };
}
