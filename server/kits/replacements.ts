/** The replacement list of a kit type: missing pieces per part summed over its tubs, tubs named. */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { parts, tubMissing, tubs } from '../db/schema/index.js';
import { naturalCompare } from '../../shared/prep/index.js';
import { schoolKitType } from './kit-types.js';

export interface ReplacementLine {
  partCode: string;
  name: string;
  missing: number;
  tubs: { label: string; count: number }[];
}

/** The kit type's parts that any tub misses, in parts-list order, tubs in natural label order. */
export async function replacementList(tx: Tx, schoolId: string, kitTypeId: string) {
  const kit = await schoolKitType(tx, schoolId, kitTypeId);
  const partRows = await tx
    .select()
    .from(parts)
    .where(eq(parts.kitTypeId, kit.id))
    .orderBy(asc(parts.position));
  const tubRows = await tx.select().from(tubs).where(eq(tubs.kitTypeId, kit.id));
  const missing = tubRows.length
    ? await tx
        .select()
        .from(tubMissing)
        .where(
          inArray(
            tubMissing.tubId,
            tubRows.map((t) => t.id),
          ),
        )
    : [];
  const label = new Map(tubRows.map((t) => [t.id, t.label]));
  const lines: ReplacementLine[] = [];
  for (const p of partRows) {
    const here = missing
      .filter((m) => m.partCode === p.code && m.count > 0)
      .map((m) => ({ label: label.get(m.tubId)!, count: m.count }))
      .sort((a, b) => naturalCompare(a.label, b.label));
    if (here.length) {
      lines.push({
        partCode: p.code,
        name: p.name,
        missing: here.reduce((n, x) => n + x.count, 0),
        tubs: here,
      });
    }
  }
  return { kit, lines };
}
