/**
 * VTIMEZONE components (RFC 5545, 3.6.5) made from the runtime's own IANA time zone data (via
 * Luxon and Intl), so no zone table has to be shipped. Each offset change in the range becomes a
 * STANDARD or DAYLIGHT sub-component with its own DTSTART (the local time before the change,
 * as RFC 5545 writes onsets) and TZOFFSETFROM/TZOFFSETTO; a zone without changes gets one
 * STANDARD component.
 */
import { DateTime } from 'luxon';

const MINUTE = 60_000;
const DAY = 24 * 60 * MINUTE;

function offsetAt(ms: number, zone: string): number {
  return DateTime.fromMillis(ms, { zone }).offset;
}

/** `+0930`, `-0500`. */
export function formatOffset(minutes: number): string {
  const sign = minutes < 0 ? '-' : '+';
  const abs = Math.abs(minutes);
  return `${sign}${String(Math.floor(abs / 60)).padStart(2, '0')}${String(abs % 60).padStart(2, '0')}`;
}

/** Instants (ms) where the zone's UTC offset changes within [fromMs, toMs), to the minute. */
export function offsetChanges(zone: string, fromMs: number, toMs: number): number[] {
  const changes: number[] = [];
  let before = offsetAt(fromMs, zone);
  for (let t = fromMs; t < toMs; t += DAY) {
    const next = Math.min(t + DAY, toMs);
    const after = offsetAt(next, zone);
    if (after === before) continue;
    // Binary search for the first minute with the new offset.
    let lo = t;
    let hi = next;
    while (hi - lo > MINUTE) {
      const mid = lo + Math.floor((hi - lo) / 2 / MINUTE) * MINUTE;
      if (offsetAt(mid, zone) === before) lo = mid;
      else hi = mid;
    }
    changes.push(hi);
    before = after;
  }
  return changes;
}

/** Short zone name (`ACST`) when the locale data has a real one, not `GMT+9:30`. */
function abbreviation(ms: number, zone: string): string | null {
  const name = DateTime.fromMillis(ms, { zone }).setLocale('en-AU').offsetNameShort;
  return name && /^[A-Z]{2,6}$/.test(name) ? name : null;
}

function subComponent(zone: string, onsetMs: number, from: number, to: number): string[] {
  const dt = DateTime.fromMillis(onsetMs, { zone });
  const kind = dt.isInDST ? 'DAYLIGHT' : 'STANDARD';
  // The onset in local time before the change (RFC 5545: DTSTART in TZOFFSETFROM's time).
  const local = DateTime.fromMillis(onsetMs + from * MINUTE, { zone: 'UTC' }).toFormat(
    "yyyyMMdd'T'HHmmss",
  );
  const name = abbreviation(onsetMs, zone);
  return [
    `BEGIN:${kind}`,
    `DTSTART:${local}`,
    `TZOFFSETFROM:${formatOffset(from)}`,
    `TZOFFSETTO:${formatOffset(to)}`,
    ...(name ? [`TZNAME:${name}`] : []),
    `END:${kind}`,
  ];
}

/**
 * The VTIMEZONE of `zone` covering [fromMs, toMs) with a year of margin either side, CRLF line
 * ends, ready for ical-generator's timezone generator.
 */
export function vtimezone(zone: string, fromMs: number, toMs: number): string {
  const start = DateTime.fromMillis(fromMs, { zone })
    .minus({ years: 1 })
    .startOf('year')
    .toMillis();
  const end = DateTime.fromMillis(toMs, { zone }).plus({ years: 1 }).endOf('year').toMillis();
  const first = offsetAt(start, zone);
  const lines = ['BEGIN:VTIMEZONE', `TZID:${zone}`, ...subComponent(zone, start, first, first)];
  let previous = first;
  for (const change of offsetChanges(zone, start, end)) {
    const next = offsetAt(change, zone);
    lines.push(...subComponent(zone, change, previous, next));
    previous = next;
  }
  lines.push('END:VTIMEZONE');
  return lines.join('\r\n');
}
