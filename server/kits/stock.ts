/** A tub's stock: the parts list's quantity less what the tub is missing (never below 0). */
export function stockOf(qty: number, missing: number | undefined): number {
  return Math.max(0, qty - (missing ?? 0));
}

/** Part code → stock for one tub, in parts-list order. */
export function tubStock(
  partsList: readonly { code: string; qty: number }[],
  missing: ReadonlyMap<string, number>,
): Record<string, number> {
  return Object.fromEntries(partsList.map((p) => [p.code, stockOf(p.qty, missing.get(p.code))]));
}
