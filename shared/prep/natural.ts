/**
 * Natural-order comparison of labels (`Tub 2` before `Tub 10`), written out by hand so that the
 * order is the same in every runtime: `Intl.Collator` depends on the ICU build, and the server,
 * the browser and the PDF worker must agree on the order of tubs.
 */

const CHUNK = /\d+|\D+/g;

function chunks(s: string): string[] {
  return s.match(CHUNK) ?? [];
}

function isDigits(s: string): boolean {
  const c = s.charCodeAt(0);
  return c >= 48 && c <= 57;
}

function compareDigits(a: string, b: string): number {
  // Compare by value without Number(): a run of digits may be longer than a double holds.
  const x = a.replace(/^0+(?=\d)/, '');
  const y = b.replace(/^0+(?=\d)/, '');
  if (x.length !== y.length) return x.length < y.length ? -1 : 1;
  return x < y ? -1 : x > y ? 1 : 0;
}

function compareText(a: string, b: string): number {
  const x = a.toLowerCase();
  const y = b.toLowerCase();
  return x < y ? -1 : x > y ? 1 : 0;
}

/**
 * Compares two labels in natural order: runs of digits by their value, other text ignoring case.
 * Labels that differ only in case or leading zeros are ordered by their code units, so the result
 * is 0 only for identical strings and every sort built on it is total and deterministic.
 */
export function naturalCompare(a: string, b: string): number {
  if (a === b) return 0;
  const ca = chunks(a);
  const cb = chunks(b);
  const n = Math.min(ca.length, cb.length);
  for (let i = 0; i < n; i++) {
    const x = ca[i]!;
    const y = cb[i]!;
    const dx = isDigits(x);
    const dy = isDigits(y);
    const c = dx && dy ? compareDigits(x, y) : compareText(x, y);
    if (c !== 0) return c;
  }
  if (ca.length !== cb.length) return ca.length < cb.length ? -1 : 1;
  return a < b ? -1 : 1;
}

/** Returns a copy of `items` sorted by `label` in natural order. */
export function sortByLabel<T extends { label: string }>(items: readonly T[]): T[] {
  return [...items].sort((a, b) => naturalCompare(a.label, b.label));
}
