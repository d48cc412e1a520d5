/**
 * The one way to plan a stored lesson: load the engine's input, run the engine, and report a
 * lesson the engine refuses in one shape. Access is not decided here: every caller asks the
 * policy first (server/auth/policy.ts through planning/access.ts, or a token route's own check).
 */
import type { Tx } from '../db/client.js';
import { HttpError } from '../http.js';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import {
  computePrepPlan,
  planPartCodes,
  PrepInputError,
  type PrepInput,
  type LessonPart,
  type PrepPlan,
} from '../../shared/prep/index.js';
import { loadPrepInput } from './load.js';
import { bookingConflicts } from './booking-conflicts.js';

/** A lesson as planned now: the plan with its part names, or why the engine refused it. */
export type LessonPlan =
  | {
      plannable: true;
      input: PrepInput;
      plan: PrepPlan;
      partNames: Record<string, string>;
      parts: Record<string, LessonPart>;
    }
  | { plannable: false; input: PrepInput; problems: ApiErrorDetail[] };

/**
 * Plans the lesson as stored in `tx` (run it in one repeatable-read snapshot); null when there is
 * no such lesson. Only the engine's refusal of stored data becomes `plannable: false`: any other
 * error is thrown, never hidden.
 */
export async function planLesson(tx: Tx, lessonId: string): Promise<LessonPlan | null> {
  const input = await loadPrepInput(tx, lessonId);
  if (!input) return null;
  let plan: PrepPlan;
  try {
    plan = computePrepPlan(input);
  } catch (err) {
    if (!(err instanceof PrepInputError)) throw err;
    // Stored data the engine refuses (e.g. a material whose part left the parts list).
    const problems = err.issues.map((i) => ({
      path: i.path.map(String).join('.'),
      message: i.message,
    }));
    return { plannable: false, input, problems };
  }
  // After the engine's own warnings: the lessons that double-book its tubs.
  for (const c of await bookingConflicts(tx, lessonId))
    plan.warnings.push({ code: 'booking-conflict', message: c.message });
  const known = new Map(input.parts.map((p) => [p.code, p]));
  const partNames: Record<string, string> = {};
  const parts: Record<string, LessonPart> = {};
  for (const code of planPartCodes(plan)) {
    const part = known.get(code);
    partNames[code] = part?.name ?? code;
    parts[code] = {
      name: part?.name ?? code,
      colour: part?.colour || null,
      compartment: part?.compartment || null,
    };
  }
  return { plannable: true, input, plan, partNames, parts };
}

/** The one answer for a lesson the engine refuses: 422 with the engine's reasons. */
export function notPlannable(
  problems: ApiErrorDetail[],
  message = 'This lesson cannot be planned yet.',
): HttpError {
  return new HttpError(422, 'lesson-not-plannable', message, problems);
}
