/**
 * Loads a unit for its review and asks the policy: who sees it (404 otherwise: another school's
 * unit is not told apart from a missing one) and how the actor stands to it.
 */
import { eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { units } from '../db/schema/index.js';
import { notFound } from '../http.js';
import { canSeeInReview, type Actor, type ReviewFacts } from '../auth/policy.js';
import { loadUnitFacts } from '../planning/access.js';
import type { UnitStatus } from '../../shared/schemas/units.js';
import type { Standing } from './transitions.js';

export interface ReviewUnitFacts extends ReviewFacts {
  id: string;
  title: string;
  status: UnitStatus;
  version: number;
}

/**
 * The unit's facts when the actor may see it in review, else 404. With `lock`, the row is held
 * until the transaction ends, so two steps on one unit happen one after the other.
 */
export async function reviewableUnit(
  tx: Tx,
  actor: Actor,
  unitId: string,
  lock = false,
): Promise<ReviewUnitFacts> {
  const query = tx
    .select({
      id: units.id,
      title: units.title,
      status: units.status,
      version: units.version,
    })
    .from(units)
    .where(eq(units.id, unitId));
  const [row] = lock ? await query.for('update') : await query;
  const facts = row ? await loadUnitFacts(tx, unitId) : null;
  if (!row || !facts) throw notFound('That unit');
  const unit = { ...facts, ...row, status: row.status as UnitStatus };
  if (!canSeeInReview(actor, unit)) throw notFound('That unit');
  return unit;
}

/** How the actor stands to the unit, for the state machine. */
export function standing(actor: Actor, unit: ReviewFacts): Standing {
  return {
    role: actor.role,
    owner: unit.ownerId === actor.id,
    coauthor: unit.coauthorIds.includes(actor.id),
  };
}
