/**
 * A unit's history. Every change to a unit, its lessons or activities, a copy and every review
 * step records one event here, inside the transaction that makes the change, so the history
 * never claims a change that was rolled back and never misses one that was kept.
 */
import type { Tx } from '../db/client.js';
import { unitEvents } from '../db/schema/index.js';

/** The kinds of event a unit's history holds. */
export type UnitEventAction =
  | 'created'
  | 'copied'
  | 'unit-edited'
  | 'lesson-added'
  | 'lesson-edited'
  | 'lesson-removed'
  | 'activity-added'
  | 'activity-edited'
  | 'activity-removed'
  | 'review';

export interface UnitEvent {
  unitId: string;
  schoolId: string;
  /** Who made the change (null for the system, e.g. the demo seed). */
  actorId: string | null;
  action: UnitEventAction;
  summary: string;
  lessonId?: string | null;
}

/** Records one event of a unit's history; call it with the transaction of the change. */
export async function recordUnitEvent(tx: Tx, event: UnitEvent): Promise<void> {
  await tx.insert(unitEvents).values({ ...event, lessonId: event.lessonId ?? null });
}
