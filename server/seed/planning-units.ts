/**
 * How the demo's units are written down and stored: a compact description of each lesson and
 * its activities' bills of materials, inserted with its outcomes, booked tubs and periods.
 */
import { eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  activities,
  lessonTubs,
  lessons,
  materials,
  unitEvents,
  unitOutcomes,
  units,
} from '../db/schema/index.js';
import type { SeededPeriod } from './planning-calendar.js';

export type Per = 'group' | 'student' | 'class';
export type ActivityKind = 'intro' | 'build' | 'code' | 'test' | 'reflect' | 'other';

/** A bill-of-materials line: a part of the lesson's kit type by code, or a consumable by name. */
export type MaterialSeed =
  | { part: string; qty: number; per: Per }
  | { consumable: string; qty: number; per: Per; returnable: boolean };

/** `qty` of a part for each group. */
export const perGroup = (part: string, qty: number): MaterialSeed => ({ part, qty, per: 'group' });
/** `qty` of a part for each student of a group. */
export const perStudent = (part: string, qty: number): MaterialSeed => ({
  part,
  qty,
  per: 'student',
});
/** A consumable; used up (not returnable) unless said otherwise. */
export const consumable = (
  name: string,
  qty: number,
  per: Per,
  returnable = false,
): MaterialSeed => ({
  consumable: name,
  qty,
  per,
  returnable,
});

export interface ActivitySeed {
  title: string;
  kind: ActivityKind;
  minutes: number;
  materials: MaterialSeed[];
}

export interface LessonSeed {
  /** School-local date, `YYYY-MM-DD`. */
  date: string;
  title: string;
  groupSize: number;
  learningIntention: string;
  successCriteria: string;
  reliefNotes: string;
  activities: ActivitySeed[];
  /** Whether the demo relief teacher is assigned to this lesson. */
  relief?: boolean;
}

export interface UnitSeed {
  title: string;
  yearLevel: number;
  learningArea: string;
  term: number;
  overview: string;
  status: 'draft' | 'in-review' | 'changes-requested' | 'endorsed';
  visibility: 'private' | 'school';
  outcomeCodes: string[];
}

/** Where and with what a unit's lessons run. */
export interface UnitPlace {
  schoolId: string;
  ownerId: string;
  classId: string;
  kitTypeId: string;
  /** Booked by every lesson (the lesson editor's default: every tub of the kit type). */
  tubIds: string[];
  period: SeededPeriod;
  room: string;
  outcomeIds: Record<string, string>;
  reliefTeacherId: string | null;
  copiedFromId: string | null;
  createdAt: Date;
}

/** Stores a unit with its outcomes, lessons, activities and materials; gives its id. */
export async function insertUnit(
  tx: Tx,
  place: UnitPlace,
  unit: UnitSeed,
  lessonSeeds: LessonSeed[],
): Promise<string> {
  const { outcomeCodes, ...fields } = unit;
  const [row] = await tx
    .insert(units)
    .values({
      schoolId: place.schoolId,
      ownerId: place.ownerId,
      copiedFromId: place.copiedFromId,
      createdAt: place.createdAt,
      updatedAt: place.createdAt,
      ...fields,
    })
    .returning({ id: units.id });
  const unitId = row!.id;
  await tx.insert(unitEvents).values({
    unitId,
    schoolId: place.schoolId,
    actorId: place.ownerId,
    action: 'created',
    summary: 'created the unit',
    at: place.createdAt,
  });
  await tx
    .insert(unitOutcomes)
    .values(outcomeCodes.map((code) => ({ unitId, outcomeId: place.outcomeIds[code]! })));
  for (const [position, l] of lessonSeeds.entries()) {
    const [lesson] = await tx
      .insert(lessons)
      .values({
        unitId,
        schoolId: place.schoolId,
        position,
        title: l.title,
        classId: place.classId,
        kitTypeId: place.kitTypeId,
        // Wall-clock times in the school's timezone, as the column stores them.
        startsAt: `${l.date} ${place.period.startsAt}:00`,
        endsAt: `${l.date} ${place.period.endsAt}:00`,
        periodId: place.period.id,
        room: place.room,
        groupSize: l.groupSize,
        learningIntention: l.learningIntention,
        successCriteria: l.successCriteria,
        reliefNotes: l.reliefNotes,
        reliefTeacherId: l.relief ? place.reliefTeacherId : null,
        createdAt: place.createdAt,
        updatedAt: place.createdAt,
      })
      .returning({ id: lessons.id });
    const lessonId = lesson!.id;
    await tx.insert(lessonTubs).values(place.tubIds.map((tubId) => ({ lessonId, tubId })));
    const acts = await tx
      .insert(activities)
      .values(
        l.activities.map((a, i) => ({
          lessonId,
          position: i,
          title: a.title,
          kind: a.kind,
          minutes: a.minutes,
        })),
      )
      .returning({ id: activities.id, position: activities.position });
    const rows = acts.flatMap((act) =>
      l.activities[act.position]!.materials.map((m, i) => ({
        activityId: act.id,
        position: i,
        partCode: 'part' in m ? m.part : null,
        consumable: 'consumable' in m ? m.consumable : null,
        qty: m.qty,
        per: m.per,
        returnable: 'part' in m ? true : m.returnable,
      })),
    );
    await tx.insert(materials).values(rows);
  }
  // The unit-changed triggers (migration 0011) stamp the unit with the clock's now() as its
  // lessons, activities and materials go in; a seeded unit was last changed when it was made, so
  // the seed sets that stamp once everything is in, and seeding twice gives the same data.
  await tx.update(units).set({ updatedAt: place.createdAt }).where(eq(units.id, unitId));
  return unitId;
}
