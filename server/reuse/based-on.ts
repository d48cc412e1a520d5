/** A copy's provenance as the API answers it (`basedOn`), for one reader. */
import { eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { unitCopies } from '../db/schema/index.js';
import { canReadUnit, type Actor } from '../auth/policy.js';
import type { BasedOn } from '../../shared/schemas/units.js';
import { loadUnitFacts } from '../planning/access.js';

/** The stored provenance row of a copy, or null for an original. */
export async function copyRow(tx: Tx, unitId: string) {
  const [row] = await tx.select().from(unitCopies).where(eq(unitCopies.unitId, unitId));
  return row ?? null;
}

/**
 * Where the unit was copied from, as it was then, and whether this reader can still open the
 * original (it may since have been made private, or deleted); null for an original.
 */
export async function basedOnOf(tx: Tx, actor: Actor, unitId: string): Promise<BasedOn | null> {
  const row = await copyRow(tx, unitId);
  if (!row) return null;
  const facts = await loadUnitFacts(tx, row.sourceUnitId);
  return {
    unitId: row.sourceUnitId,
    title: row.sourceTitle,
    version: row.sourceVersion,
    ownerName: row.sourceOwnerName,
    copiedAt: row.copiedAt.toISOString(),
    readable: facts !== null && canReadUnit(actor, facts),
  };
}
