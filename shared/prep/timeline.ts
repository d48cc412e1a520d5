/** R8: the lesson timeline with clock times, pack-away and overrun. */
import type { PlanClock } from './clock.js';
import { ceilDiv, plural } from './math.js';
import type { PrepSegment, PrepTimeline, PrepWarning } from './plan-schema.js';
import type { PrepActivity, PrepSettings } from './schema.js';
import { addMinutes, minutesBetween } from './time.js';

/** pack-away = base + ceil(max_g P_g × seconds per piece / 60), in integer arithmetic. */
export function packAwayMinutes(settings: PrepSettings, maxGroupPieces: number): number {
  return (
    settings.packAwayBaseMinutes + ceilDiv(maxGroupPieces * settings.packAwaySecondsPerPiece, 60)
  );
}

export interface TimelineResult {
  timeline: PrepTimeline;
  warnings: PrepWarning[];
}

export function buildTimeline(
  startMs: number,
  endMs: number,
  activities: readonly PrepActivity[],
  settings: PrepSettings,
  maxGroupPieces: number,
  clock: PlanClock,
): TimelineResult {
  const windowMinutes = minutesBetween(startMs, endMs);
  const packAway = packAwayMinutes(settings, maxGroupPieces);
  let activityMinutes = 0;
  for (const a of activities) activityMinutes += a.minutes;
  const plannedMinutes = settings.setOutMinutes + activityMinutes + packAway;
  const slackMinutes = windowMinutes - plannedMinutes;
  const packAwayStart = addMinutes(endMs, -packAway);
  const segments: PrepSegment[] = [];
  const segment = (label: string, kind: PrepSegment['kind'], from: number, minutes: number) => {
    const to = addMinutes(from, minutes);
    // Only activities are flagged: they are what the teacher shortens.
    const overrun = kind === 'activity' && to > packAwayStart;
    segments.push({
      label,
      kind,
      startsAt: clock.iso(from),
      endsAt: clock.iso(to),
      minutes,
      overrun,
    });
    return to;
  };
  let at = segment('Set out', 'set-out', startMs, settings.setOutMinutes);
  for (const a of activities) at = segment(a.title, 'activity', at, a.minutes);
  if (slackMinutes > 0) segment('Buffer', 'buffer', at, slackMinutes);
  segment('Pack away', 'pack-away', packAwayStart, packAway);
  const warnings: PrepWarning[] = [];
  if (slackMinutes < 0) {
    warnings.push({
      code: 'overrun',
      message:
        `Activities overrun by ${plural(-slackMinutes, 'minute')}: set-out, activities and ` +
        `pack-away take ${plannedMinutes} minutes but the lesson is ${windowMinutes} minutes ` +
        `long, so pack-away at ${clock.time(packAwayStart)} cuts into the activities.`,
    });
  }
  return {
    timeline: {
      windowMinutes,
      plannedMinutes,
      slackMinutes,
      packAwayMinutes: packAway,
      packAwayStartsAt: clock.iso(packAwayStart),
      segments,
    },
    warnings,
  };
}
