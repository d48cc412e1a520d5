import { MAX_GROUP_SIZE } from '../../../shared/schemas/lessons';

/**
 * The group size that gives `groups` groups for `students` students under R1 of PREP-RULES.md
 * (n = ceil(S / g)): the smallest g in 1…8 with ceil(S / g) = groups, or null when no group size
 * gives exactly that many groups (e.g. 10 students can make 4 or 5 groups, never 6).
 */
export function groupSizeFor(students: number, groups: number): number | null {
  for (let g = 1; g <= MAX_GROUP_SIZE; g++) {
    if (Math.ceil(students / g) === groups) return g;
  }
  return null;
}
