/** `Foundation` for year 0 (the first year of school), otherwise `Year N`. */
export function yearLabel(year: number): string {
  return year === 0 ? 'Foundation' : `Year ${year}`;
}

/** The year levels a unit may have (0–12, as `yearLevelSchema`). */
export const YEAR_LEVELS: readonly number[] = Array.from({ length: 13 }, (_, i) => i);
export const TERMS: readonly number[] = [1, 2, 3, 4];
