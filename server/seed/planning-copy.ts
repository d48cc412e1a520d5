/**
 * The teaching partner's "Rescue Rovers (4M)": a real copy of the teacher's unit, made with the
 * same code as `POST /api/units/:id/copy` (so it carries its provenance and the original's
 * snapshot), then adapted as the partner did: the first three lessons only, Period 5 in Room 14,
 * groups of four, their own relief notes, and shared with the school. Its history tells each step.
 */
import { and, eq, gte, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { lessons, unitEvents, units } from '../db/schema/index.js';
import { copyUnit } from '../reuse/copy.js';
import { lessonFieldChanges, lessonWhen, unitFieldChanges } from '../reuse/changes.js';
import { loadUnitSnapshot } from '../reuse/snapshot.js';
import type { SeededPeriod } from './planning-calendar.js';
import type { LessonSeed, UnitSeed } from './planning-units.js';

export interface SeedCopy {
  sourceUnitId: string;
  schoolId: string;
  ownerId: string;
  classId: string;
  period: SeededPeriod;
  room: string;
  /** The first lesson's date, `YYYY-MM-DD`. */
  startDate: string;
  at: Date;
  unit: UnitSeed;
  /** The lessons kept, in order; their dates follow from `startDate`. */
  lessonSeeds: LessonSeed[];
}

const minutesLater = (at: Date, minutes: number) => new Date(at.getTime() + minutes * 60_000);

/** Copies and adapts; gives the copy's id. */
export async function seedCopy(tx: Tx, c: SeedCopy): Promise<string> {
  const { unitId } = await copyUnit(tx, {
    sourceUnitId: c.sourceUnitId,
    ownerId: c.ownerId,
    schoolId: c.schoolId,
    title: c.unit.title,
    classId: c.classId,
    startDate: c.startDate,
    at: c.at,
  });
  // The copy's own event is dated with the copy (recordUnitEvent stamps the transaction's time).
  await tx.update(unitEvents).set({ at: c.at }).where(eq(unitEvents.unitId, unitId));
  const before = (await loadUnitSnapshot(tx, unitId))!;
  const events: { action: string; summary: string; lessonId?: string }[] = [];

  const kept = before.lessons.slice(0, c.lessonSeeds.length);
  const dropped = before.lessons.slice(c.lessonSeeds.length);
  if (dropped.length) {
    await tx.delete(lessons).where(
      inArray(
        lessons.id,
        dropped.map((l) => l.id),
      ),
    );
    for (const l of dropped)
      events.push({
        action: 'lesson-removed',
        summary: `removed lesson ${l.title} (${lessonWhen(l)})`,
        lessonId: l.id,
      });
  }
  for (const [i, l] of kept.entries()) {
    const seed = c.lessonSeeds[i]!;
    await tx
      .update(lessons)
      .set({
        startsAt: `${l.startsAt.slice(0, 10)} ${c.period.startsAt}:00`,
        endsAt: `${l.startsAt.slice(0, 10)} ${c.period.endsAt}:00`,
        periodId: c.period.id,
        room: c.room,
        groupSize: seed.groupSize,
        reliefNotes: seed.reliefNotes,
        updatedAt: c.at,
      })
      .where(eq(lessons.id, l.id));
  }
  await tx
    .update(units)
    .set({ overview: c.unit.overview, visibility: c.unit.visibility, updatedAt: c.at })
    .where(eq(units.id, unitId));

  const after = (await loadUnitSnapshot(tx, unitId))!;
  const fieldWords = unitFieldChanges(
    { ...before, visibility: 'private' },
    { ...after, visibility: c.unit.visibility },
  );
  if (fieldWords.length) events.unshift({ action: 'unit-edited', summary: fieldWords.join('; ') });
  for (const l of after.lessons) {
    const old = kept.find((k) => k.id === l.id)!;
    const words = lessonFieldChanges(old, l);
    if (words.length)
      events.push({
        action: 'lesson-edited',
        summary: `${l.title}: ${words.join('; ')}`,
        lessonId: l.id,
      });
  }
  // A minute apart, so the history lists them in the order they were made.
  await tx.insert(unitEvents).values(
    events.map((e, i) => ({
      unitId,
      schoolId: c.schoolId,
      actorId: c.ownerId,
      action: e.action,
      summary: e.summary,
      lessonId: e.lessonId ?? null,
      at: minutesLater(c.at, i + 1),
    })),
  );
  // Nothing else of the copy may be stamped later than its last change.
  await tx
    .update(units)
    .set({ updatedAt: minutesLater(c.at, events.length) })
    .where(and(eq(units.id, unitId), gte(units.updatedAt, c.at)));
  return unitId;
}
