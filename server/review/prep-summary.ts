/**
 * What a reviewer needs of each lesson's prep: how many groups, which parts fall short and how
 * long pack-away takes. Computed by the same engine as the prep page, from the lesson as stored.
 */
import type { Tx } from '../db/client.js';
import type { LessonPrepSummary } from '../../shared/schemas/review.js';
import type { UnitLesson } from '../../shared/schemas/units.js';
import { planLesson } from '../prep/plan-lesson.js';

/** The prep summary of one of the unit's lessons. */
export async function lessonPrepSummary(tx: Tx, lesson: UnitLesson): Promise<LessonPrepSummary> {
  const base = {
    id: lesson.id,
    title: lesson.title,
    date: lesson.date,
    className: lesson.className,
  };
  const empty = {
    ...base,
    groups: null,
    shortfalls: [],
    packAwayMinutes: null,
    plannedMinutes: null,
    windowMinutes: null,
  };
  const planned = await planLesson(tx, lesson.id);
  if (!planned) return { ...empty, problems: ['This lesson was removed.'] };
  if (!planned.plannable) return { ...empty, problems: planned.problems.map((p) => p.message) };
  const { plan, partNames } = planned;
  const missing = new Map<string, number>();
  for (const s of plan.shortfalls)
    missing.set(s.partCode, (missing.get(s.partCode) ?? 0) + s.needed - s.allocated);
  return {
    ...base,
    groups: plan.groups.length,
    shortfalls: [...missing].map(([partCode, n]) => ({
      partCode,
      name: partNames[partCode] ?? partCode,
      missing: n,
    })),
    packAwayMinutes: plan.timeline.packAwayMinutes,
    plannedMinutes: plan.timeline.plannedMinutes,
    windowMinutes: plan.timeline.windowMinutes,
    problems: [],
  };
}
