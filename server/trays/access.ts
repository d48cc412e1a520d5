/** The policy's answer for running a lesson on the day, loaded from the database. */
import type { Tx } from '../db/client.js';
import { forbidden } from '../http.js';
import { canRunLesson, type Actor } from '../auth/policy.js';
import { readableLesson, type LessonFacts } from '../planning/access.js';

/** The lesson's facts when the actor runs it; 404 when they cannot read it, 403 if only read. */
export async function runnableLesson(tx: Tx, actor: Actor, lessonId: string): Promise<LessonFacts> {
  const facts = await readableLesson(tx, actor, lessonId);
  if (!canRunLesson(actor, facts.unit, facts)) {
    throw forbidden('Only the lesson’s teachers and its relief teacher can do this.');
  }
  return facts;
}
