/**
 * The lesson's plan for its trays, through the one planning path (server/prep/plan-lesson.ts).
 * Access is decided by the caller: a tray token, or the policy for a teacher.
 */
import type { Tx } from '../db/client.js';
import type { PrepInput, PrepPlan } from '../../shared/prep/index.js';
import { planLesson } from '../prep/plan-lesson.js';

/** The plan and its input, or null when there is no lesson or the engine refuses it. */
export async function trayPlan(
  tx: Tx,
  lessonId: string,
): Promise<{ input: PrepInput; plan: PrepPlan } | null> {
  const planned = await planLesson(tx, lessonId);
  return planned?.plannable ? { input: planned.input, plan: planned.plan } : null;
}
