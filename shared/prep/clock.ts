/** Formats the instants of one plan quickly and consistently. */
import { clockTime } from '../text/clock.js';
import { DAY_MS, formatWithOffset, offsetMinutes } from './time.js';

/**
 * Formats a plan's instants in its zone. Offset lookups cost about a microsecond each, so when
 * the offset is the same a day before and a day after the lesson starts, it is used for every
 * instant in between: no zone changes its offset twice within two days (see `localToInstant`).
 * Instants outside that window, or any instant near a change, are looked up one by one.
 */
export class PlanClock {
  private readonly memo = new Map<number, string>();
  private readonly from: number;
  private readonly to: number;
  private readonly offset: number;

  constructor(
    readonly zone: string,
    anchorMs: number,
  ) {
    const before = offsetMinutes(zone, anchorMs - DAY_MS);
    const after = offsetMinutes(zone, anchorMs + DAY_MS);
    this.offset = before;
    // An empty window when the offset changes near the lesson: every instant is looked up.
    this.from = before === after ? anchorMs - DAY_MS : Infinity;
    this.to = before === after ? anchorMs + DAY_MS : -Infinity;
  }

  /** ISO 8601 with the zone's offset for that instant: `2026-07-28T11:54:00+09:30`. */
  iso(ms: number): string {
    let s = this.memo.get(ms);
    if (s === undefined) {
      const off = ms >= this.from && ms <= this.to ? this.offset : offsetMinutes(this.zone, ms);
      s = formatWithOffset(ms, off);
      this.memo.set(ms, s);
    }
    return s;
  }

  /** The wall-clock time of day for messages, in the one clock style: `11:54 am`. */
  time(ms: number): string {
    return clockTime(this.iso(ms));
  }
}
