/**
 * R2 demand. Every material of an activity is k per group, k × group size per student, or k in
 * the class tray. Within an activity the same part adds up; across activities a returnable part
 * is reused (demand is the maximum) and a used-up part or consumable is summed. Each part's
 * demand is kept as terms a + b × size so the R6 search can re-evaluate it for other sizes.
 */
import type { PrepPart, ValidPrepInput } from './schema.js';

/** Demand terms of one part or consumable, over all activities. */
export interface DemandTerms {
  /** Returnable terms of each activity using it, flat: [a0, b0, a1, b1, …]. */
  ret: number[];
  /** Used-up demand per group: consA + consB × size. */
  consA: number;
  consB: number;
  /** Class-tray demand: returnable maximum and used-up sum. */
  classRet: number;
  classCons: number;
}

export interface ConsumableDemand extends DemandTerms {
  name: string;
}

/** Group demand of every group part for one group size. */
export interface SizeDemand {
  /** needed[k] for groupParts[k]. */
  needed: Float64Array;
  /** The returnable share of needed[k] (what comes back at pack-away). */
  returnable: Float64Array;
}

export interface DemandModel {
  parts: readonly PrepPart[];
  partIndex: Map<string, number>;
  terms: DemandTerms[];
  /** Indices of parts some group needs, in parts-list order (the same for every size ≥ 1). */
  groupParts: number[];
  /** Indices of parts the class tray needs, in parts-list order. */
  classParts: number[];
  consumables: ConsumableDemand[];
  /** Whether any activity is of kind `code` or `test` (R7). */
  needsDevices: boolean;
}

function emptyTerms(): DemandTerms {
  return { ret: [], consA: 0, consB: 0, classRet: 0, classCons: 0 };
}

/** Sums of one activity for one part or consumable, before they are folded into its terms. */
class ActivitySums {
  ra = 0;
  rb = 0;
  rc = 0;
  ca = 0;
  cb = 0;
  cc = 0;
  /** Index of the activity these sums belong to; -1 before the first. */
  activity = -1;

  add(qty: number, per: 'group' | 'student' | 'class', returnable: boolean): void {
    if (returnable) {
      if (per === 'group') this.ra += qty;
      else if (per === 'student') this.rb += qty;
      else this.rc += qty;
    } else if (per === 'group') this.ca += qty;
    else if (per === 'student') this.cb += qty;
    else this.cc += qty;
  }

  /** Folds the sums into the terms: the maximum for what comes back, the sum for the rest. */
  foldInto(t: DemandTerms): void {
    if (this.ra > 0 || this.rb > 0) t.ret.push(this.ra, this.rb);
    if (this.rc > t.classRet) t.classRet = this.rc;
    t.consA += this.ca;
    t.consB += this.cb;
    t.classCons += this.cc;
    this.ra = this.rb = this.rc = this.ca = this.cb = this.cc = 0;
  }
}

/**
 * Collects one activity's materials per target (part or consumable) with one reusable sums
 * object per target and a list of the targets touched, so no map is built per activity.
 */
class ActivityFolder<T extends DemandTerms> {
  private readonly sums: ActivitySums[] = [];
  private touched: number[] = [];

  constructor(readonly targets: T[]) {}

  add(i: number, activity: number, qty: number, per: 'group' | 'student' | 'class', ret: boolean) {
    let s = this.sums[i];
    if (s === undefined) this.sums[i] = s = new ActivitySums();
    if (s.activity !== activity) {
      s.activity = activity;
      this.touched.push(i);
    }
    s.add(qty, per, ret);
  }

  fold(): void {
    for (const i of this.touched) this.sums[i]!.foldInto(this.targets[i]!);
    this.touched = [];
  }
}

/** Builds the demand model of a validated input in one pass over its materials. */
export function buildDemand(input: ValidPrepInput): DemandModel {
  const parts = input.parts;
  const partIndex = new Map<string, number>();
  for (let i = 0; i < parts.length; i++) partIndex.set(parts[i]!.code, i);
  const terms = parts.map(emptyTerms);
  const consumables: ConsumableDemand[] = [];
  const consumableIndex = new Map<string, number>();
  const partFolder = new ActivityFolder(terms);
  const consumableFolder = new ActivityFolder(consumables);
  let needsDevices = false;
  input.activities.forEach((activity, a) => {
    if (activity.kind === 'code' || activity.kind === 'test') needsDevices = true;
    for (const m of activity.materials) {
      if (m.partCode != null) {
        partFolder.add(partIndex.get(m.partCode)!, a, m.qty, m.per, m.returnable ?? true);
        continue;
      }
      const name = m.consumable!;
      const key = name.toLowerCase();
      let i = consumableIndex.get(key);
      if (i === undefined) {
        i = consumables.length;
        consumableIndex.set(key, i);
        consumables.push({ name, ...emptyTerms() });
      }
      consumableFolder.add(i, a, m.qty, m.per, m.returnable ?? false);
    }
    partFolder.fold();
    consumableFolder.fold();
  });
  const groupParts: number[] = [];
  const classParts: number[] = [];
  for (let i = 0; i < terms.length; i++) {
    const t = terms[i]!;
    if (hasGroupDemand(t)) groupParts.push(i);
    if (t.classRet + t.classCons > 0) classParts.push(i);
  }
  return { parts, partIndex, terms, groupParts, classParts, consumables, needsDevices };
}

/** Whether a group of any size (at least 1) needs some of it: every coefficient is ≥ 0. */
function hasGroupDemand(t: DemandTerms): boolean {
  if (t.consA > 0 || t.consB > 0) return true;
  for (const x of t.ret) if (x > 0) return true;
  return false;
}

/** Returnable group demand for one size: the maximum over activities. */
export function returnableFor(t: DemandTerms, size: number): number {
  let best = 0;
  const r = t.ret;
  for (let j = 0; j < r.length; j += 2) {
    const v = r[j]! + r[j + 1]! * size;
    if (v > best) best = v;
  }
  return best;
}

/** Used-up group demand for one size: the sum over activities. */
export function consumedFor(t: DemandTerms, size: number): number {
  return t.consA + t.consB * size;
}

/** Demand of every group part for groups of `size`, memoised per size in `cache`. */
export function demandForSize(
  model: DemandModel,
  size: number,
  cache: Map<number, SizeDemand>,
): SizeDemand {
  const hit = cache.get(size);
  if (hit) return hit;
  const k = model.groupParts.length;
  const needed = new Float64Array(k);
  const returnable = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const t = model.terms[model.groupParts[j]!]!;
    const r = returnableFor(t, size);
    returnable[j] = r;
    needed[j] = r + consumedFor(t, size);
  }
  const d = { needed, returnable };
  cache.set(size, d);
  return d;
}
