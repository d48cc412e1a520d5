/** Which dates the booking-conflicts view opens on, and the API's exclusive end date. */

export interface TermDates {
  startsOn: string;
  endsOn: string;
}

/** The term around `today`, else the next one to start; null when none is current or ahead. */
export function termThatMatters<T extends TermDates>(terms: readonly T[], today: string): T | null {
  const current = terms.find((t) => t.startsOn <= today && today <= t.endsOn);
  if (current) return current;
  const ahead = terms
    .filter((t) => t.startsOn > today)
    .sort((a, b) => a.startsOn.localeCompare(b.startsOn));
  return ahead[0] ?? null;
}

/** `2026-09-26` for `2026-09-25`: the view's "To" day is included, the API's `to` is not. */
export function dayAfter(date: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + 1)).toISOString().slice(0, 10);
}
