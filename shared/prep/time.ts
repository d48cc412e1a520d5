/**
 * Wall-clock arithmetic in a school's IANA time zone. Zone names are checked here once for the
 * engine and the settings form alike (`isIanaTimeZone`); offsets come from `Intl` (the same tz
 * database Luxon reads, but about seven times faster than Luxon's own lookup, which matters
 * because a plan formats a few dozen instants). Durations are always
 * elapsed time (epoch milliseconds). The tests check all of this against Luxon.
 */
const MINUTE_MS = 60_000;
/** `2026-07-28T11:10`, optionally with `:00` seconds: lessons are planned to the minute. */
export const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::00)?$/;

/** Zone names the runtime's own tz data lists, plus `UTC` (which the list leaves out). */
export function timeZoneNames(): string[] {
  const names = new Set(Intl.supportedValuesOf('timeZone'));
  names.add('UTC');
  return [...names].sort();
}

let listed: Set<string> | null = null;
/** An `Area/Location` name as the IANA database writes them (not an offset or abbreviation). */
const AREA_LOCATION = /^[A-Z][A-Za-z_-]*(\/[A-Za-z0-9_+-]+)+$/;

/**
 * Whether `name` is an IANA time zone: listed by `Intl.supportedValuesOf`, or (for the aliases
 * and newer names that list omits, like `Asia/Kolkata` on some ICU builds) an `Area/Location`
 * name that `Intl.DateTimeFormat` accepts. Abbreviations such as `EST` and offsets are refused.
 */
export function isIanaTimeZone(name: string): boolean {
  listed ??= new Set(timeZoneNames());
  if (listed.has(name)) return true;
  if (!AREA_LOCATION.test(name)) return false;
  try {
    new Intl.DateTimeFormat('en', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

const offsetFormats = new Map<string, Intl.DateTimeFormat>();

function offsetFormat(zone: string): Intl.DateTimeFormat {
  let f = offsetFormats.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'longOffset' });
    offsetFormats.set(zone, f);
  }
  return f;
}

const OFFSET = /GMT([+-])(\d{2}):(\d{2})/;

/** The zone's offset from UTC in minutes at the instant `ms` (e.g. 570 for +09:30). */
export function offsetMinutes(zone: string, ms: number): number {
  const m = OFFSET.exec(offsetFormat(zone).format(ms));
  // `GMT` alone means an offset of zero.
  if (!m) return 0;
  const minutes = Number(m[2]) * 60 + Number(m[3]);
  return m[1] === '-' ? -minutes : minutes;
}

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/** Formats an instant as ISO 8601 in the zone, seconds included, no milliseconds. */
export function formatInstant(ms: number, zone: string): string {
  return formatWithOffset(ms, offsetMinutes(zone, ms));
}

/** Formats an instant as ISO 8601 at a known offset (minutes east of UTC). */
export function formatWithOffset(ms: number, off: number): string {
  const local = new Date(ms + off * MINUTE_MS).toISOString().slice(0, 19);
  const abs = Math.abs(off);
  return `${local}${off < 0 ? '-' : '+'}${pad2(Math.floor(abs / 60))}:${pad2(abs % 60)}`;
}

export const DAY_MS = 86_400_000;

/**
 * The instant of a local date-time in the zone, or null when it is malformed or does not exist
 * there (the hour skipped when daylight time begins). An hour repeated when daylight time ends
 * gives its earlier instant. Not Luxon's `fromObject`: that guesses the offset from the current
 * clock, so a repeated hour could resolve differently depending on the day it runs; this reads
 * the zone's offsets a day either side instead. That relies on no zone changing its offset twice
 * within two days: checked for every zone of the tz database from 2000 to 2040 with hourly
 * samples, the closest two changes are seven days apart (tests/shared/prep-time.test.ts checks
 * every zone through 2026 again).
 */
export function localToInstant(local: string, zone: string): number | null {
  const m = LOCAL_DATE_TIME.exec(local);
  if (!m) return null;
  const [y, mo, d, h, mi] = m.slice(1, 6).map(Number) as [number, number, number, number, number];
  const wall = Date.UTC(y, mo - 1, d, h, mi);
  const t = new Date(wall);
  // Date.UTC rolls 31 June over into July: such a date does not exist.
  if (t.getUTCDate() !== d || t.getUTCMonth() !== mo - 1 || t.getUTCHours() !== h) return null;
  if (t.getUTCMinutes() !== mi || t.getUTCFullYear() !== y) return null;
  const before = offsetMinutes(zone, wall - DAY_MS);
  const after = offsetMinutes(zone, wall + DAY_MS);
  // A repeated hour only happens when the offset drops, so the offset before the change gives
  // its earlier instant: try it first. A time in a skipped hour fits neither.
  for (const off of [before, after]) {
    const ms = wall - off * MINUTE_MS;
    if (offsetMinutes(zone, ms) === off) return ms;
  }
  return null;
}

/** Adds elapsed minutes to an instant. */
export function addMinutes(ms: number, minutes: number): number {
  return ms + minutes * MINUTE_MS;
}

/** Whole elapsed minutes from `fromMs` to `toMs` (negative when `toMs` is earlier). */
export function minutesBetween(fromMs: number, toMs: number): number {
  return Math.trunc((toMs - fromMs) / MINUTE_MS);
}

/** A time span; ends are ISO 8601 strings with an offset (or `Z`) or epoch milliseconds. */
export interface TimeSpan {
  startsAt: string | number;
  endsAt: string | number;
}

const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

function toMs(v: string | number): number {
  if (typeof v === 'number') return v;
  // A local time without an offset would be read in the machine's own zone: refuse it.
  if (!ISO_WITH_OFFSET.test(v)) throw new RangeError(`Not an ISO time with an offset: ${v}`);
  return Date.parse(v);
}

/**
 * Whether two half-open spans [startsAt, endsAt) overlap: a lesson ending at 11:00 does not clash
 * with one starting at 11:00. Used for booking conflicts between lessons that share a tub.
 */
export function intervalsOverlap(a: TimeSpan, b: TimeSpan): boolean {
  const [as, ae, bs, be] = [toMs(a.startsAt), toMs(a.endsAt), toMs(b.startsAt), toMs(b.endsAt)];
  // An empty span holds no time, so it cannot clash with anything.
  if (!(as < ae) || !(bs < be)) return false;
  return as < be && bs < ae;
}
