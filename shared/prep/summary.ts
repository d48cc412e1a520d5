/** Shortfalls, the borrow return map, R6 suggestions and the stock and device warnings. */
import type { BorrowRecord, GroupAllocation } from './allocate.js';
import type { DemandModel, SizeDemand } from './demand.js';
import { plural } from './math.js';
import type {
  PrepBorrow,
  PrepLine,
  PrepShortfall,
  PrepSuggestion,
  PrepWarning,
} from './plan-schema.js';
import type { TubPool } from './pool.js';
import type { TubStatus, ValidPrepInput } from './schema.js';
import { groupSuggestion, largestFittingGroupCount, partSuggestion } from './suggest.js';

const STATUS_WORDS: Record<TubStatus, string> = {
  ready: 'is ready',
  'needs-sorting': 'needs sorting',
  'on-loan': 'is on loan',
  retired: 'is retired',
};

export interface SummaryInput {
  model: DemandModel;
  pool: TubPool;
  allocs: GroupAllocation[];
  borrows: BorrowRecord[];
  classLines: PrepLine[];
  classWants: { part: number }[];
  spareLines: PrepLine[];
  spares: { part: number }[];
  /** Demand of all groups per part index. */
  groupNeeded: Float64Array;
  /** Usable stock at the start per part index. */
  usable: Float64Array;
  cache: Map<number, SizeDemand>;
  input: ValidPrepInput;
}

export interface Summary {
  shortfalls: PrepShortfall[];
  borrows: PrepBorrow[];
  suggestions: PrepSuggestion[];
  warnings: PrepWarning[];
}

function shortBy(line: PrepLine): string {
  return `(needs ${line.needed}, gets ${line.allocated})`;
}

export function summarise(x: SummaryInput): Summary {
  const { model, pool } = x;
  const names = model.parts.map((p) => p.name);
  const shortfalls: PrepShortfall[] = [];
  const shortParts = new Set<number>();
  x.allocs.forEach((a, g) => {
    a.lines.forEach((line, j) => {
      if (line.allocated >= line.needed) return;
      const p = model.groupParts[j]!;
      shortParts.add(p);
      shortfalls.push({
        partCode: line.partCode,
        where: 'group',
        group: g + 1,
        needed: line.needed,
        allocated: line.allocated,
        message: `Group ${g + 1} is short of ${line.needed - line.allocated} × ${names[p]} ${shortBy(line)}.`,
      });
    });
  });
  const groupShort = shortfalls.length > 0;
  x.classLines.forEach((line, i) => {
    if (line.allocated >= line.needed) return;
    const p = x.classWants[i]!.part;
    shortParts.add(p);
    shortfalls.push({
      partCode: line.partCode,
      where: 'class',
      needed: line.needed,
      allocated: line.allocated,
      message: `The class tray is short of ${line.needed - line.allocated} × ${names[p]} ${shortBy(line)}.`,
    });
  });

  const borrows = x.borrows.map((b): PrepBorrow => {
    const fromTub = pool.tubs[b.tub]!.label;
    return {
      group: b.group,
      partCode: model.parts[b.part]!.code,
      qty: b.qty,
      fromTub,
      homeTub: pool.tubs[x.allocs[b.group - 1]!.home]!.label,
      message: `Group ${b.group}: return ${b.qty} × ${names[b.part]} to ${fromTub}.`,
    };
  });

  const n = x.allocs.length;
  const students = x.input.class.studentCount;
  const suggestions: PrepSuggestion[] = [];
  if (groupShort) {
    const m = largestFittingGroupCount(model, students, n, x.cache, x.usable);
    if (m !== null) suggestions.push(groupSuggestion(m, students));
  }
  for (const p of [...shortParts].sort((a, b) => a - b)) {
    const classNeed = model.terms[p]!.classRet + model.terms[p]!.classCons;
    suggestions.push(partSuggestion(model, pool, p, x.usable[p]!, x.groupNeeded[p]!, classNeed, n));
  }

  const warnings: PrepWarning[] = pool.unusable.map((t) => ({
    code: 'tub-unusable',
    message: `${t.label} ${STATUS_WORDS[t.status]} and is not used for this lesson.`,
  }));
  x.spareLines.forEach((line, i) => {
    if (line.allocated >= line.needed) return;
    const name = names[x.spares[i]!.part];
    warnings.push({
      code: 'spares-short',
      message:
        `The spares tray is short of ${line.needed - line.allocated} × ${name} ` +
        `(wants ${line.needed}, gets ${line.allocated}).`,
    });
  });
  if (model.needsDevices && x.input.class.devices < n) {
    warnings.push({
      code: 'devices-short',
      message:
        `${plural(n, 'group')} ${n === 1 ? 'needs' : 'need'} ${plural(n, 'device')}; ` +
        `the class has ${x.input.class.devices}.`,
    });
  }
  return { shortfalls, borrows, suggestions, warnings };
}
