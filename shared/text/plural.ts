/**
 * Counts with their nouns, for every screen, message and printable: `1 piece`, `2 pieces`,
 * `1 lesson`, `from 1 tub`. One helper so no text says "1 pieces" or "lesson(s)".
 */

/** `1 minute`, `2 minutes`, `0 tubs`; `many` for nouns that do not just take an s. */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** The noun alone in the right number: `tub` or `tubs`. */
export function noun(n: number, one: string, many = `${one}s`): string {
  return n === 1 ? one : many;
}

/** `Tub 1`, `Tub 1 and Tub 3`, `Tub 1, Tub 2 and Tub 3`. */
export function listWords(words: readonly string[]): string {
  if (words.length <= 1) return words.join('');
  return `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}
