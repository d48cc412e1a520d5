/**
 * ceil(a / b) for whole numbers a ≥ 0, b > 0 by integer division: floating point gets
 * ceil(30 × 0.1) wrong (0.1 × 30 is 3.0000000000000004, whose ceiling is 4).
 */
export function ceilDiv(a: number, b: number): number {
  const r = a % b;
  return (a - r) / b + (r > 0 ? 1 : 0);
}

/** `1 minute`, `2 minutes`: a count with its noun in the right number. */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** `Tub 1`, `Tub 1 and Tub 3`, `Tub 1, Tub 2 and Tub 3`. */
export function listWords(words: readonly string[]): string {
  if (words.length <= 1) return words.join('');
  return `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}
