/** The prep engine: validated input in, a complete prep plan out (PREP-RULES.md R1–R9). */
import { allocateGroups, allocateTray, type BorrowRecord } from './allocate.js';
import { PlanClock } from './clock.js';
import {
  buildDemand,
  consumedFor,
  returnableFor,
  type DemandModel,
  type SizeDemand,
} from './demand.js';
import { balancedSizes, groupSizes, MAX_GROUP_SIZE } from './groups.js';
import { ceilDiv } from './math.js';
import type { PrepConsumable, PrepGroup, PrepLine, PrepPlan } from './plan-schema.js';
import { buildPool, usableStock } from './pool.js';
import type { PrepInput, ValidPrepInput } from './schema.js';
import { summarise } from './summary.js';
import { buildTasks } from './tasks.js';
import { localToInstant } from './time.js';
import { buildTimeline } from './timeline.js';
import { validatePrepInput } from './validate.js';

export interface PlanOptions {
  /**
   * Plan for this many balanced groups instead of ceil(S / groupSize), e.g. to preview an R6
   * suggestion. Throws a RangeError when a group would have more than 8 or fewer than 1 student.
   */
  groupCount?: number;
}

/** Validates raw input and computes its prep plan; throws `PrepInputError` on bad input. */
export function computePrepPlan(input: PrepInput, options?: PlanOptions): PrepPlan {
  return computeValidated(validatePrepInput(input), options);
}

function sizesFor(input: ValidPrepInput, options?: PlanOptions): number[] {
  const students = input.class.studentCount;
  const n = options?.groupCount;
  if (n === undefined) return groupSizes(students, input.lesson.groupSize);
  if (!Number.isInteger(n) || n < 1 || n > students || n * MAX_GROUP_SIZE < students) {
    throw new RangeError(`${students} students cannot make ${n} groups of 1 to 8 students.`);
  }
  return balancedSizes(students, n);
}

function consumablesFor(model: DemandModel, size: number): PrepConsumable[] {
  const out: PrepConsumable[] = [];
  for (const c of model.consumables) {
    const qty = returnableFor(c, size) + consumedFor(c, size);
    if (qty > 0) out.push({ name: c.name, qty });
  }
  return out;
}

/** R3: spares of each small part from the returnable demand of all groups and the class tray. */
function spareWants(
  model: DemandModel,
  groupReturnable: Float64Array,
  percent: number,
): { part: number; qty: number }[] {
  const wants: { part: number; qty: number }[] = [];
  for (let p = 0; p < model.parts.length; p++) {
    if (!model.parts[p]!.small) continue;
    const qty = ceilDiv((groupReturnable[p]! + model.terms[p]!.classRet) * percent, 100);
    if (qty > 0) wants.push({ part: p, qty });
  }
  return wants;
}

/** Computes the prep plan of input already checked by `validatePrepInput` (no re-validation). */
export function computeValidated(input: ValidPrepInput, options?: PlanOptions): PrepPlan {
  const startMs = localToInstant(input.lesson.startsAt, input.timezone)!;
  const endMs = localToInstant(input.lesson.endsAt, input.timezone)!;
  const clock = new PlanClock(input.timezone, startMs);
  const model = buildDemand(input);
  const pool = buildPool(input);
  const sizes = sizesFor(input, options);
  const cache = new Map<number, SizeDemand>();
  const remaining = pool.stock.slice();
  const borrows: BorrowRecord[] = [];
  const allocs = allocateGroups(model, pool, sizes, cache, remaining, borrows);

  const partCount = model.parts.length;
  const groupNeeded = new Float64Array(partCount);
  const groupReturnable = new Float64Array(partCount);
  const allocatedByPart = new Float64Array(partCount);
  const gp = model.groupParts;
  let lines = 0;
  let pieces = 0;
  let maxReturnable = 0;
  const groups: PrepGroup[] = allocs.map((a, g) => {
    let groupPieces = 0;
    let returnablePieces = 0;
    for (let j = 0; j < gp.length; j++) {
      const p = gp[j]!;
      const got = a.lines[j]!.allocated;
      const back = a.demand.returnable[j]!;
      groupNeeded[p] = groupNeeded[p]! + a.demand.needed[j]!;
      groupReturnable[p] = groupReturnable[p]! + back;
      allocatedByPart[p] = allocatedByPart[p]! + got;
      groupPieces += got;
      // P_g of R8: what comes back, so never more than the returnable demand.
      returnablePieces += got < back ? got : back;
      if (got > 0) lines++;
    }
    pieces += groupPieces;
    if (returnablePieces > maxReturnable) maxReturnable = returnablePieces;
    const home = a.home < 0 ? null : pool.tubs[a.home]!;
    return {
      number: g + 1,
      size: a.size,
      homeTub: home ? home.label : null,
      controllerLabel: home?.controllerLabel ? home.controllerLabel : null,
      lines: a.lines,
      consumables: consumablesFor(model, a.size),
      pieces: groupPieces,
      returnablePieces,
    };
  });

  const codes = model.parts.map((p) => p.code);
  const classWants = model.classParts.map((p) => {
    const t = model.terms[p]!;
    return { part: p, qty: t.classRet + t.classCons };
  });
  const classLines = allocateTray(pool, remaining, codes, classWants);
  const spares = spareWants(model, groupReturnable, input.settings.sparesPercent);
  const spareLines = allocateTray(pool, remaining, codes, spares);
  const trayTotals = (tray: PrepLine[], wants: { part: number }[]) => {
    tray.forEach((line, i) => {
      const p = wants[i]!.part;
      allocatedByPart[p] = allocatedByPart[p]! + line.allocated;
      pieces += line.allocated;
      if (line.allocated > 0) lines++;
    });
  };
  trayTotals(classLines, classWants);
  trayTotals(spareLines, spares);

  const summary = summarise({
    model,
    pool,
    allocs,
    borrows,
    classLines,
    classWants,
    spareLines,
    spares,
    groupNeeded,
    usable: usableStock(pool),
    cache,
    input,
  });
  const time = buildTimeline(
    startMs,
    endMs,
    input.activities,
    input.settings,
    maxReturnable,
    clock,
  );
  const work = buildTasks({
    parts: model.parts,
    pool,
    allocatedByPart,
    remaining,
    lines,
    pieces,
    groups: sizes.length,
    needsDevices: model.needsDevices,
    startMs,
    settings: input.settings,
    earlierSameDay: input.earlierSameDay,
    clock,
  });

  return {
    groups,
    classTray: {
      lines: classLines,
      consumables: model.consumables
        .filter((c) => c.classRet + c.classCons > 0)
        .map((c) => ({ name: c.name, qty: c.classRet + c.classCons })),
    },
    sparesTray: { lines: spareLines },
    shortfalls: summary.shortfalls,
    borrows: summary.borrows,
    suggestions: summary.suggestions,
    warnings: [...summary.warnings, ...time.warnings, ...work.warnings],
    timeline: time.timeline,
    tasks: work.tasks,
    totals: {
      groups: sizes.length,
      pieces,
      lines,
      tubsUsed: tubsUsed(pool.stock, remaining, pool.tubs.length),
    },
  };
}

/** Tubs that supply at least one piece. */
function tubsUsed(stock: Float64Array, remaining: Float64Array, tubs: number): number {
  const stride = tubs === 0 ? 0 : stock.length / tubs;
  let used = 0;
  for (let t = 0; t < tubs; t++) {
    for (let at = t * stride; at < (t + 1) * stride; at++) {
      if (remaining[at]! < stock[at]!) {
        used++;
        break;
      }
    }
  }
  return used;
}
