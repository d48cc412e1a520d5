/**
 * Whether a lesson's date falls in its unit's term. A unit names its term by number (1 to 4);
 * the school's terms of the lesson's year, in date order, give that number its dates.
 */
import { SCHOOL_LOCALE } from '../text/clock.js';

export interface SchoolTerm {
  name: string;
  /** `YYYY-MM-DD`. */
  startsOn: string;
  endsOn: string;
}

/**
 * A note for a lesson dated outside its unit's term, or null when it is inside, or when the unit
 * has no term or the school has not entered that term for the lesson's year (nothing to say).
 */
export function outsideTermNote(
  date: string,
  unitTerm: number | null,
  terms: readonly SchoolTerm[],
): string | null {
  if (!unitTerm) return null;
  const year = date.slice(0, 4);
  const ofYear = terms
    .filter((t) => t.startsOn.slice(0, 4) === year)
    .sort((a, b) => a.startsOn.localeCompare(b.startsOn));
  const term = ofYear[unitTerm - 1];
  if (!term) return null;
  if (date >= term.startsOn && date <= term.endsOn) return null;
  return `Dated outside the unit's term: ${term.name} runs ${day(term.startsOn)} to ${day(term.endsOn)}.`;
}

/** `20 Jul 2026` in the school's locale (a calendar date: UTC in, UTC out). */
function day(date: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Intl.DateTimeFormat(SCHOOL_LOCALE, {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    timeZone: 'UTC',
  }).format(Date.UTC(y, m - 1, d));
}
