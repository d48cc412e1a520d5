/**
 * Answers of `GET /api/lessons/:id/prep` kept by their entity tag (server/prep/plan-tag.ts). The
 * tag digests every row the answer is computed from and the planning code, so an entry can never
 * be stale: a change anywhere gives a new tag, and the old entry is simply never asked for again
 * (it ages out). Each instance keeps its own; a miss only costs the computation. Access is
 * decided before the cache is asked.
 */
import type { LessonPrep } from '../../shared/prep/index.js';

/** How many answers one instance keeps (a demo-sized school's lessons for several weeks). */
const CAPACITY = 256;

const entries = new Map<string, LessonPrep>();

/** The answer stored for this tag, or undefined. */
export function cachedPlan(tag: string): LessonPrep | undefined {
  const hit = entries.get(tag);
  if (hit) {
    // Most recently used last, so the oldest is the first to go.
    entries.delete(tag);
    entries.set(tag, hit);
  }
  return hit;
}

/** Keeps the answer computed in the snapshot whose tag is `tag`. */
export function keepPlan(tag: string, answer: LessonPrep): void {
  entries.delete(tag);
  entries.set(tag, answer);
  while (entries.size > CAPACITY) entries.delete(entries.keys().next().value!);
}
