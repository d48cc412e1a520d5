/**
 * The copy's summary: how many groups and shortfalls each copied lesson's prep plan has against
 * the original's, worked out by the same engine every printable and screen uses.
 */
import type { Tx } from '../db/client.js';
import type { CopiedLesson } from '../../shared/schemas/reuse.js';
import { planLesson } from '../prep/plan-lesson.js';

export interface PlanCounts {
  groups: number;
  shortfalls: number;
}

/** Groups and shortfalls of the lesson's plan as stored in `tx`; null when it cannot be planned. */
export async function planCounts(tx: Tx, lessonId: string): Promise<PlanCounts | null> {
  const planned = await planLesson(tx, lessonId);
  if (!planned?.plannable) return null;
  return { groups: planned.plan.totals.groups, shortfalls: planned.plan.shortfalls.length };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * "7 groups instead of 9; 2 shortfalls fewer", over the lessons both plans exist for (summed, as
 * a teacher reads a unit's worth of pull lists); a lesson that cannot be planned is said apart.
 */
export function summaryText(lessons: CopiedLesson[]): string {
  if (lessons.length === 0) return 'The unit has no lessons to plan.';
  const both = lessons.filter((l) => l.before && l.after);
  const sum = (pick: (l: CopiedLesson) => number) => both.reduce((n, l) => n + pick(l), 0);
  const groupsBefore = sum((l) => l.before!.groups);
  const groupsAfter = sum((l) => l.after!.groups);
  const shortBefore = sum((l) => l.before!.shortfalls);
  const shortAfter = sum((l) => l.after!.shortfalls);
  const parts: string[] = [];
  if (both.length) {
    parts.push(
      groupsAfter === groupsBefore
        ? `${plural(groupsAfter, 'group')} as before`
        : `${plural(groupsAfter, 'group')} instead of ${groupsBefore}`,
    );
    const diff = shortAfter - shortBefore;
    if (diff === 0)
      parts.push(
        shortAfter === 0 ? 'no shortfalls' : `${plural(shortAfter, 'shortfall')} as before`,
      );
    else if (diff < 0) parts.push(`${plural(-diff, 'shortfall')} fewer`);
    else parts.push(`${plural(diff, 'shortfall')} more`);
  }
  const unplanned = lessons.length - both.length;
  if (unplanned) parts.push(`${plural(unplanned, 'lesson')} cannot be planned yet`);
  const flagged = lessons.filter((l) => l.notTeaching).length;
  if (flagged) parts.push(`${plural(flagged, 'lesson')} on a day without teaching`);
  return parts.join('; ');
}
