/**
 * Prep-task ticks of a lesson, shared by its teachers. Setting is idempotent (the first tick's
 * time and person stay), clearing is a delete; neither carries a version, since two teachers who
 * tick the same task want the same thing.
 */
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { prepTaskTicks, users } from '../db/schema/index.js';
import type { PrepTick } from '../../shared/schemas/prep-ticks.js';

/** The lesson's ticks of the tasks whose keys are given (the plan as stored now), oldest first. */
export async function readTicks(
  tx: Tx,
  lessonId: string,
  taskKeys: readonly string[],
): Promise<PrepTick[]> {
  if (taskKeys.length === 0) return [];
  const rows = await tx
    .select({
      taskKey: prepTaskTicks.taskKey,
      at: prepTaskTicks.tickedAt,
      byId: users.id,
      byName: users.name,
    })
    .from(prepTaskTicks)
    .leftJoin(users, eq(users.id, prepTaskTicks.tickedBy))
    .where(and(eq(prepTaskTicks.lessonId, lessonId), inArray(prepTaskTicks.taskKey, [...taskKeys])))
    .orderBy(asc(prepTaskTicks.tickedAt), asc(prepTaskTicks.taskKey));
  return rows.map((r) => ({
    taskKey: r.taskKey,
    at: r.at.toISOString(),
    by: r.byId && r.byName !== null ? { id: r.byId, name: r.byName } : null,
  }));
}

/** Ticks (`done`) or clears one task; the same call twice changes nothing more. */
export async function setTick(
  tx: Tx,
  actorId: string,
  lessonId: string,
  taskKey: string,
  done: boolean,
): Promise<void> {
  if (done) {
    await tx
      .insert(prepTaskTicks)
      .values({ lessonId, taskKey, tickedBy: actorId })
      .onConflictDoNothing();
  } else {
    await tx
      .delete(prepTaskTicks)
      .where(and(eq(prepTaskTicks.lessonId, lessonId), eq(prepTaskTicks.taskKey, taskKey)));
  }
}
