/** R6: a smaller number of groups that has no group shortfall, and each short part's totals. */
import { groupsFit } from './allocate.js';
import type { DemandModel, SizeDemand } from './demand.js';
import { balancedSizes, fewestGroups } from './groups.js';
import { listWords, plural } from './math.js';
import type { PrepSuggestion } from './plan-schema.js';
import type { TubPool } from './pool.js';

/**
 * The largest n' < n whose balanced groups (each at most 8) all get every part, or null.
 * Fitting need not be monotone in n' (per-group and per-student demand grow differently), so
 * every count is tried from n − 1 down; each try is linear in the part lines.
 */
export function largestFittingGroupCount(
  model: DemandModel,
  students: number,
  n: number,
  cache: Map<number, SizeDemand>,
  usable: Float64Array,
): number | null {
  for (let m = n - 1; m >= fewestGroups(students); m--) {
    if (groupsFit(model, balancedSizes(students, m), cache, usable)) return m;
  }
  return null;
}

export function groupSuggestion(groups: number, students: number): PrepSuggestion {
  const sizes = balancedSizes(students, groups);
  return {
    kind: 'groups',
    groups,
    sizes,
    message:
      `With ${plural(groups, 'group')} (${listWords(sizes.map(String))} students) ` +
      `no group is short of parts.`,
  };
}

function isController(category: string): boolean {
  return category.trim().toLowerCase() === 'controller';
}

/**
 * A suggestion naming a short part with its usable stock and the total needed (groups and class
 * tray). A controller every group needs is worded in controllers per group.
 */
export function partSuggestion(
  model: DemandModel,
  pool: TubPool,
  p: number,
  usable: number,
  groupNeeded: number,
  classNeeded: number,
  groupCount: number,
): PrepSuggestion {
  const part = model.parts[p]!;
  const needed = groupNeeded + classNeeded;
  // Every group needs a part with group demand: its terms are the same for every size ≥ 1.
  const everyGroup = groupCount > 0 && groupNeeded > 0;
  let message: string;
  if (isController(part.category) && everyGroup) {
    const tubs = pool.tubs.length;
    message =
      `${plural(groupCount, 'group')} ${groupCount === 1 ? 'needs' : 'need'} ` +
      `${plural(groupNeeded, 'controller')}; ${plural(tubs, 'usable tub')} ` +
      `${tubs === 1 ? 'holds' : 'hold'} ${usable}.`;
  } else {
    message = `${part.name}: the lesson needs ${needed} and the usable tubs hold ${usable}.`;
  }
  return { kind: 'part', partCode: part.code, usable, needed, message };
}
