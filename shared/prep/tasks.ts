/** R9: prep tasks (charge, sort, pull, devices) with due times, and recharge-gap warnings. */
import type { PlanClock } from './clock.js';
import { ceilDiv, listWords, plural } from './math.js';
import { TASK_KINDS, type PrepTask, type PrepWarning } from './plan-schema.js';
import type { TubPool } from './pool.js';
import type { PrepPart, PrepSettings, ValidPrepInput } from './schema.js';
import { addMinutes, localToInstant, minutesBetween } from './time.js';

export interface TaskInput {
  parts: readonly PrepPart[];
  pool: TubPool;
  /** Allocated pieces per part index over groups, class tray and spares tray. */
  allocatedByPart: Float64Array;
  remaining: Float64Array;
  /** L and P of R9. */
  lines: number;
  pieces: number;
  groups: number;
  needsDevices: boolean;
  startMs: number;
  settings: PrepSettings;
  earlierSameDay: ValidPrepInput['earlierSameDay'];
  clock: PlanClock;
}

interface TimedTask {
  task: PrepTask;
  startMs: number;
  order: number;
}

/**
 * A task's key within its lesson's plan: its kind and what it is about (the part charged, the
 * tub sorted), never its counts or times, so a tick stays on its task when the plan changes.
 */
export function taskKey(kind: PrepTask['kind'], subject?: string): string {
  return subject === undefined ? kind : `${kind}:${subject}`;
}

/** pull minutes = base + ceil((L × s/line + P × s/piece) / 60), in integer arithmetic. */
export function pullMinutes(settings: PrepSettings, lines: number, pieces: number): number {
  const seconds = lines * settings.pullSecondsPerLine + pieces * settings.pullSecondsPerPiece;
  return settings.pullBaseMinutes + ceilDiv(seconds, 60);
}

export function buildTasks(x: TaskInput): { tasks: PrepTask[]; warnings: PrepWarning[] } {
  const timed: TimedTask[] = [];
  const add = (
    kind: PrepTask['kind'],
    key: string,
    label: string,
    minutes: number,
    doneMs: number,
  ) => {
    const startMs = addMinutes(doneMs, -minutes);
    const task = {
      kind,
      key,
      label,
      minutes,
      startBy: x.clock.iso(startMs),
      doneBy: x.clock.iso(doneMs),
    };
    timed.push({ task, startMs, order: timed.length });
  };
  const chargeDone = addMinutes(x.startMs, -x.settings.chargeBufferMinutes);
  const warnings: PrepWarning[] = [];
  x.parts.forEach((part, p) => {
    const units = x.allocatedByPart[p]!;
    if (part.fullChargeMinutes === null || units <= 0) return;
    add(
      'charge',
      taskKey('charge', part.code),
      `Charge ${units} × ${part.name}`,
      part.fullChargeMinutes,
      chargeDone,
    );
    warnings.push(...rechargeGaps(x, part, p));
  });
  for (const tub of x.pool.unusable) {
    if (tub.status === 'needs-sorting') {
      add(
        'sort',
        taskKey('sort', tub.id),
        `Sort and count ${tub.label}`,
        x.settings.sortMinutesPerTub,
        x.startMs,
      );
    }
  }
  if (x.pieces > 0) {
    const label = `Pull ${plural(x.pieces, 'piece')} (${plural(x.lines, 'line')}) into the trays`;
    add('pull', taskKey('pull'), label, pullMinutes(x.settings, x.lines, x.pieces), x.startMs);
  }
  if (x.needsDevices) {
    const minutes = x.groups * x.settings.deviceCheckMinutesPerDevice;
    add(
      'devices',
      taskKey('devices'),
      `Check and pair ${plural(x.groups, 'device')}`,
      minutes,
      x.startMs,
    );
  }
  timed.sort(
    (a, b) =>
      a.startMs - b.startMs ||
      TASK_KINDS.indexOf(a.task.kind) - TASK_KINDS.indexOf(b.task.kind) ||
      a.order - b.order,
  );
  return { tasks: timed.map((t) => t.task), warnings };
}

/**
 * A recharge-gap warning for each earlier lesson that day ending less than a full charge before
 * this lesson starts and sharing a tub that supplies this rechargeable part.
 */
function rechargeGaps(x: TaskInput, part: PrepPart, p: number): PrepWarning[] {
  const full = part.fullChargeMinutes!;
  const stride = x.pool.partCount;
  const supplying = x.pool.tubs.filter(
    (_, t) => x.remaining[t * stride + p]! < x.pool.stock[t * stride + p]!,
  );
  const earlier = x.earlierSameDay
    .map((e, i) => ({ e, i, endMs: localToInstant(e.endsAt, x.clock.zone)! }))
    .sort((a, b) => a.endMs - b.endMs || a.i - b.i);
  const out: PrepWarning[] = [];
  for (const { e, endMs } of earlier) {
    const gap = minutesBetween(endMs, x.startMs);
    if (gap >= full) continue;
    const ids = new Set(e.tubIds);
    const shared = supplying.filter((t) => ids.has(t.id)).map((t) => t.label);
    if (shared.length === 0) continue;
    const verb = shared.length === 1 ? 'is' : 'are';
    const left = gap > 0 ? `leaving ${plural(gap, 'minute')}` : 'leaving no time';
    out.push({
      code: 'recharge-gap',
      message:
        `${listWords(shared)} ${verb} used in a lesson that ends at ${x.clock.time(endMs)}, ` +
        `${left} to recharge the ${part.name} before this lesson; a full charge takes about ` +
        `${plural(full, 'minute')}.`,
    });
  }
  return out;
}
