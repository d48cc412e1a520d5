/** The policy's answer for sharing a lesson, loaded from the database (404 / 403 as usual). */
import type { Tx } from '../db/client.js';
import { forbidden, notFound } from '../http.js';
import { canReadLesson, canShareLesson, type Actor } from '../auth/policy.js';
import { loadLessonFacts, type LessonFacts } from '../planning/access.js';

/**
 * The lesson's facts when the actor may share it; 404 when they may not even see it (another
 * school's lesson looks missing), 403 when they read it but may not share it.
 */
export async function shareableLesson(
  tx: Tx,
  actor: Actor,
  lessonId: string,
): Promise<LessonFacts> {
  const facts = await loadLessonFacts(tx, lessonId);
  if (!facts) throw notFound('That lesson');
  if (canShareLesson(actor, facts.unit)) return facts;
  if (canReadLesson(actor, facts.unit, facts)) {
    throw forbidden('Only the lesson’s authors and school admins can share it.');
  }
  throw notFound('That lesson');
}
