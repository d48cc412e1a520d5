/**
 * R5: deterministic greedy allocation. Groups first from their home tubs, then from the other
 * tubs (most remaining first, ties by label order), then the class tray, then the spares tray.
 * Stock is a flat Float64Array, so each step is linear in groups × part lines × tubs.
 */
import { demandForSize, type DemandModel, type SizeDemand } from './demand.js';
import type { PrepLine } from './plan-schema.js';
import { homeTubIndex, type TubPool } from './pool.js';

/** One group's allocation: `lines[j]` is the line of part `model.groupParts[j]`. */
export interface GroupAllocation {
  size: number;
  /** Index of the home tub in `pool.tubs`, -1 with none. */
  home: number;
  demand: SizeDemand;
  lines: PrepLine[];
}

/** A piece taken from a tub other than the group's home tub. */
export interface BorrowRecord {
  group: number;
  part: number;
  tub: number;
  qty: number;
}

/**
 * Takes up to `need` pieces of part p from the tubs with the most remaining (ties by label
 * order, i.e. by index), skipping tub `skip`. Writes each draw as (tub, qty) into `picks` and
 * returns how many draws it made; `need` minus their sum is what is still missing. (A callback
 * per draw was a fifth of the allocation time.)
 */
export function takeFromFullest(
  remaining: Float64Array,
  pool: TubPool,
  p: number,
  need: number,
  skip: number,
  picks: number[],
): number {
  const stride = pool.partCount;
  const count = pool.tubs.length;
  let n = 0;
  while (need > 0) {
    let best = -1;
    let most = 0;
    for (let t = 0; t < count; t++) {
      const left = remaining[t * stride + p]!;
      if (t !== skip && left > most) {
        best = t;
        most = left;
      }
    }
    if (best < 0) break;
    const qty = most < need ? most : need;
    remaining[best * stride + p] = most - qty;
    need -= qty;
    picks[2 * n] = best;
    picks[2 * n + 1] = qty;
    n++;
  }
  return n;
}

/** Steps 1 and 2 of R5 for the groups of `sizes`; fills `borrows`. */
export function allocateGroups(
  model: DemandModel,
  pool: TubPool,
  sizes: readonly number[],
  cache: Map<number, SizeDemand>,
  remaining: Float64Array,
  borrows: BorrowRecord[],
): GroupAllocation[] {
  const stride = pool.partCount;
  const gp = model.groupParts;
  const codes = model.parts.map((p) => p.code);
  const groups: GroupAllocation[] = [];
  for (let g = 0; g < sizes.length; g++) {
    const size = sizes[g]!;
    const home = homeTubIndex(pool, g);
    const demand = demandForSize(model, size, cache);
    const label = home < 0 ? '' : pool.tubs[home]!.label;
    const lines: PrepLine[] = new Array(gp.length);
    for (let j = 0; j < gp.length; j++) {
      // Every group part has demand > 0 for any group size (see DemandModel.groupParts).
      const need = demand.needed[j]!;
      const p = gp[j]!;
      let got = 0;
      if (home >= 0) {
        const left = remaining[home * stride + p]!;
        got = left < need ? left : need;
        remaining[home * stride + p] = left - got;
      }
      const sources = got > 0 ? [{ tub: label, qty: got }] : [];
      lines[j] = { partCode: codes[p]!, needed: need, allocated: got, sources };
    }
    groups.push({ size, home, demand, lines });
  }
  const picks: number[] = [];
  for (let g = 0; g < groups.length; g++) {
    const group = groups[g]!;
    for (let j = 0; j < gp.length; j++) {
      const line = group.lines[j]!;
      if (line.allocated >= line.needed) continue;
      const p = gp[j]!;
      const draws = takeFromFullest(
        remaining,
        pool,
        p,
        line.needed - line.allocated,
        group.home,
        picks,
      );
      for (let d = 0; d < draws; d++) {
        const t = picks[2 * d]!;
        const qty = picks[2 * d + 1]!;
        line.allocated += qty;
        line.sources.push({ tub: pool.tubs[t]!.label, qty });
        borrows.push({ group: g + 1, part: p, tub: t, qty });
      }
    }
  }
  return groups;
}

/**
 * Whether groups of these sizes all get every part (R6's test), without allocating: under R5 a
 * group is short of a part exactly when the groups' total demand for it is over its usable
 * stock. Over: allocation never takes more than there is. Not over: a group is short only once
 * every tub is out of the part, so the groups have taken all the stock, yet less than their
 * total demand (this group still misses some), a contradiction. Parts do not affect each other.
 * The property tests check this against full allocations.
 */
export function groupsFit(
  model: DemandModel,
  sizes: readonly number[],
  cache: Map<number, SizeDemand>,
  usable: Float64Array,
): boolean {
  const gp = model.groupParts;
  // Balanced sizes take at most two values: count the groups of each.
  const counts = new Map<number, number>();
  for (const size of sizes) counts.set(size, (counts.get(size) ?? 0) + 1);
  const demands = [...counts].map(([size, n]) => ({
    n,
    needed: demandForSize(model, size, cache).needed,
  }));
  for (let j = 0; j < gp.length; j++) {
    let total = 0;
    for (const d of demands) total += d.n * d.needed[j]!;
    if (total > usable[gp[j]!]!) return false;
  }
  return true;
}

/** Steps 3 and 4 style: a tray (class or spares) filled from the fullest tubs. */
export function allocateTray(
  pool: TubPool,
  remaining: Float64Array,
  partCodes: readonly string[],
  wants: readonly { part: number; qty: number }[],
): PrepLine[] {
  const picks: number[] = [];
  return wants.map(({ part, qty }) => {
    const line: PrepLine = { partCode: partCodes[part]!, needed: qty, allocated: 0, sources: [] };
    const draws = takeFromFullest(remaining, pool, part, qty, -1, picks);
    for (let d = 0; d < draws; d++) {
      const got = picks[2 * d + 1]!;
      line.allocated += got;
      line.sources.push({ tub: pool.tubs[picks[2 * d]!]!.label, qty: got });
    }
    return line;
  });
}
