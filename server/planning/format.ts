/** Small conversions between what PostgreSQL stores and what the API speaks. */

/**
 * A `timestamp without time zone` as the driver returns it (`2026-07-28 11:10:00`) as the API's
 * local `2026-07-28T11:10`. Lessons are planned to the minute, so seconds are dropped.
 */
export function toLocal(stored: string): string {
  return stored.slice(0, 16).replace(' ', 'T');
}

/** An ILIKE pattern that finds `text` anywhere, with `%`, `_` and `\` taken literally. */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
