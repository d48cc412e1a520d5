/**
 * An endorsement is of the unit as it was: an edit to an endorsed unit, its lessons or their
 * activities puts it back to draft (API.md), in the edit's own transaction, and says so in the
 * unit's history. A unit in review stays in review when edited.
 */
import { and, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { units } from '../db/schema/index.js';
import type { Actor } from '../auth/policy.js';
import { recordUnitEvent } from '../planning/history.js';

/** Whether the unit was endorsed and is now a draft again. Call it in the edit's transaction. */
export async function withdrawEndorsement(tx: Tx, actor: Actor, unitId: string): Promise<boolean> {
  // One UPDATE that only matches an endorsed unit: two edits at once withdraw it once.
  const [row] = await tx
    .update(units)
    .set({ status: 'draft' })
    .where(and(eq(units.id, unitId), eq(units.status, 'endorsed')))
    .returning({ schoolId: units.schoolId });
  if (!row) return false;
  await recordUnitEvent(tx, {
    unitId,
    schoolId: row.schoolId,
    actorId: actor.id,
    action: 'review',
    summary: 'Edited after endorsement: Endorsed → Draft',
  });
  return true;
}
