/** Reading a unit's history (written by server/planning/history.ts), newest first. */
import { desc, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { unitEvents, users } from '../db/schema/index.js';
import type { UnitEventRecord } from '../../shared/schemas/reuse.js';

/** At most this many entries are answered: a unit's working life, not an audit export. */
const HISTORY_LIMIT = 500;

export async function unitHistory(tx: Tx, unitId: string): Promise<UnitEventRecord[]> {
  const rows = await tx
    .select({
      at: unitEvents.at,
      action: unitEvents.action,
      summary: unitEvents.summary,
      actorId: unitEvents.actorId,
      name: users.name,
      email: users.email,
    })
    .from(unitEvents)
    .leftJoin(users, eq(users.id, unitEvents.actorId))
    .where(eq(unitEvents.unitId, unitId))
    .orderBy(desc(unitEvents.at))
    .limit(HISTORY_LIMIT);
  return rows.map((r) => ({
    at: r.at.toISOString(),
    actor: {
      id: r.actorId,
      // The account may be gone (actor set null) or never have had a name.
      name: r.actorId === null ? 'A former member' : r.name || r.email || 'Someone',
    },
    action: r.action,
    summary: r.summary,
  }));
}
