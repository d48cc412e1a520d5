/**
 * The lesson's plan for its trays: the engine run on the lesson as stored now. Access is decided
 * by the caller (a tray token, or the policy for a teacher).
 */
import type { Tx } from '../db/client.js';
import {
  computePrepPlan,
  PrepInputError,
  type PrepInput,
  type PrepPlan,
} from '../../shared/prep/index.js';
import { loadPrepInput } from '../prep/load.js';

/** The plan and its input, or null when there is no lesson or the engine refuses it. */
export async function trayPlan(
  tx: Tx,
  lessonId: string,
): Promise<{ input: PrepInput; plan: PrepPlan } | null> {
  const input = await loadPrepInput(tx, lessonId);
  if (!input) return null;
  try {
    return { input, plan: computePrepPlan(input) };
  } catch (err) {
    if (err instanceof PrepInputError) return null;
    throw err;
  }
}
