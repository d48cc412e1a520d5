/** R4: which booked tubs are allocated from, their order, and their stock as a flat table. */
import { ownValue } from './checks.js';
import { naturalCompare } from './natural.js';
import type { PrepTub, ValidPrepInput } from './schema.js';

export interface TubPool {
  /** Usable (`ready`) tubs in natural label order. */
  tubs: PrepTub[];
  /** Booked tubs that are not `ready`, in natural label order. */
  unusable: PrepTub[];
  /** Number of parts: the stride of `stock`. */
  partCount: number;
  /** Pieces at the start, `stock[t * partCount + p]` for usable tub t and part p. */
  stock: Float64Array;
}

function byLabel(a: PrepTub, b: PrepTub): number {
  return naturalCompare(a.label, b.label);
}

export function buildPool(input: ValidPrepInput): TubPool {
  const tubs = input.tubs.filter((t) => t.status === 'ready').sort(byLabel);
  const unusable = input.tubs.filter((t) => t.status !== 'ready').sort(byLabel);
  const partCount = input.parts.length;
  const stock = new Float64Array(tubs.length * partCount);
  // Walk the parts list and look each code up: about four times faster than iterating the
  // keys of a 250-key object and looking them up in a Map.
  const parts = input.parts;
  for (let t = 0; t < tubs.length; t++) {
    const counts = tubs[t]!.stock;
    const base = t * partCount;
    for (let p = 0; p < partCount; p++) {
      const code = parts[p]!.code;
      const v = counts[code];
      // A number is always the tub's own entry; anything else may come from the prototype.
      if (typeof v === 'number') stock[base + p] = v;
      else if (v !== undefined) stock[base + p] = Number(ownValue(counts, code) ?? 0);
    }
  }
  return { tubs, unusable, partCount, stock };
}

/** Index of group i's (from 0) home tub in `pool.tubs`, or -1 with no usable tub. */
export function homeTubIndex(pool: TubPool, group: number): number {
  return pool.tubs.length === 0 ? -1 : group % pool.tubs.length;
}

/** Total pieces of each part over the usable tubs at the start, by part index. */
export function usableStock(pool: TubPool): Float64Array {
  const sums = new Float64Array(pool.partCount);
  for (let t = 0; t < pool.tubs.length; t++) {
    const base = t * pool.partCount;
    for (let p = 0; p < pool.partCount; p++) sums[p] = sums[p]! + pool.stock[base + p]!;
  }
  return sums;
}
