import type { PrepPlan } from '../../../shared/prep/index';
import type { TrayBoard } from '../../../shared/schemas/trays';

/** One booked tub's side of the pack-away audit. */
export interface TubPackAway {
  tubId: string;
  label: string;
  missing: { partCode: string; count: number }[];
}

/**
 * The pack-away audit as the groups reported it: each group's missing pieces charged to the tubs
 * they came from. Borrowed pieces go back to their own tub first (the plan's return map), so a
 * group's loss falls on its home tub before a lender's; what is left over falls on the lenders
 * in the plan's order. Tubs with nothing missing are listed too (each booked tub is audited).
 */
export function prefillPackAway(
  plan: PrepPlan,
  board: TrayBoard,
  tubs: readonly { id: string; label: string }[],
): TubPackAway[] {
  const byLabel = new Map(tubs.map((t) => [t.label, new Map<string, number>()]));
  for (const g of board.groups) {
    const group = plan.groups.find((p) => p.number === g.number);
    if (!group) continue;
    for (const m of g.missing) {
      const line = group.lines.find((l) => l.partCode === m.partCode);
      if (!line) continue;
      const home = line.sources.filter((s) => s.tub === group.homeTub);
      const lent = line.sources.filter((s) => s.tub !== group.homeTub);
      let left = m.count;
      for (const source of [...home, ...lent]) {
        const take = Math.min(left, source.qty);
        if (take <= 0) continue;
        const counts = byLabel.get(source.tub);
        if (counts) counts.set(m.partCode, (counts.get(m.partCode) ?? 0) + take);
        left -= take;
      }
    }
  }
  return tubs.map((t) => ({
    tubId: t.id,
    label: t.label,
    missing: [...byLabel.get(t.label)!].map(([partCode, count]) => ({ partCode, count })),
  }));
}
