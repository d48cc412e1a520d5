/** R1: the number of groups and their balanced sizes. */

import { MAX_GROUP_SIZE } from '../definitions.js';

/** The largest group a lesson may have (PREP-RULES.md, `groupSize` 1–8). */
export { MAX_GROUP_SIZE };

/** n = ceil(S / g): the number of groups for S students in groups of at most g. */
export function groupCount(students: number, groupSize: number): number {
  return Math.ceil(students / groupSize);
}

/**
 * Balanced sizes of n groups for S students: q = floor(S / n), r = S − q·n; groups 1…r have
 * q + 1 students, the others q (27 students in 7 groups: 4,4,4,4,4,4,3).
 */
export function balancedSizes(students: number, groups: number): number[] {
  const q = Math.floor(students / groups);
  const r = students - q * groups;
  const sizes: number[] = [];
  for (let i = 0; i < groups; i++) sizes.push(i < r ? q + 1 : q);
  return sizes;
}

/** R1 as a whole: the sizes of the groups for S students and group size g. */
export function groupSizes(students: number, groupSize: number): number[] {
  return balancedSizes(students, groupCount(students, groupSize));
}

/** The fewest groups for S students with no group over `MAX_GROUP_SIZE` (the floor of R6). */
export function fewestGroups(students: number): number {
  return Math.max(1, Math.ceil(students / MAX_GROUP_SIZE));
}
