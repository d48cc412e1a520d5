/**
 * What a group's tray holds during a lesson (the plan as stored now, with the group's ticks and
 * missing counts), and the teacher's board of every group.
 */
import { and, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { classes, lessons, trayLines } from '../db/schema/index.js';
import { HttpError } from '../http.js';
import type { PrepGroup, PrepInput, PrepPlan } from '../../shared/prep/index.js';
import type { TrayBoard, TrayLine, TrayView } from '../../shared/schemas/trays.js';
import { trayPlan } from './plan.js';

type LineState = { out: boolean; back: boolean; missing: number };
const UNTOUCHED: LineState = { out: false, back: false, missing: 0 };

/** Saved ticks of the lesson: group → part code → state. */
async function savedLines(tx: Tx, lessonId: string, group?: number) {
  const rows = await tx
    .select()
    .from(trayLines)
    .where(
      group === undefined
        ? eq(trayLines.lessonId, lessonId)
        : and(eq(trayLines.lessonId, lessonId), eq(trayLines.groupNumber, group)),
    );
  const byGroup = new Map<number, Map<string, LineState>>();
  for (const r of rows) {
    const lines = byGroup.get(r.groupNumber) ?? new Map<string, LineState>();
    lines.set(r.partCode, { out: r.out, back: r.back, missing: r.missing });
    byGroup.set(r.groupNumber, lines);
  }
  return byGroup;
}

/** A group's lines as the tray page shows them. */
export function trayLinesOf(
  input: PrepInput,
  group: PrepGroup,
  saved: ReadonlyMap<string, LineState>,
): TrayLine[] {
  const parts = new Map(input.parts.map((p) => [p.code, p]));
  return group.lines.map((line) => {
    const part = parts.get(line.partCode);
    const state = saved.get(line.partCode) ?? UNTOUCHED;
    return {
      partCode: line.partCode,
      name: part?.name ?? line.partCode,
      colour: part?.colour ?? null,
      compartment: part?.compartment ?? null,
      qty: line.allocated,
      needed: line.needed,
      sources: line.sources,
      small: part?.small ?? false,
      rechargeable: (part?.fullChargeMinutes ?? null) !== null,
      out: state.out,
      back: state.back,
      // A count saved before the plan shrank never shows more than the tray now holds.
      missing: Math.min(state.missing, line.allocated),
    };
  });
}

const trayGone = () =>
  new HttpError(
    410,
    'tray-not-planned',
    'This tray is no longer in the lesson’s plan. Ask the teacher for a new label.',
  );

/** The plan's group of an open tray; 410 when the lesson no longer plans it. */
export async function trayGroup(
  tx: Tx,
  lessonId: string,
  group: number,
): Promise<{ input: PrepInput; plan: PrepPlan; group: PrepGroup }> {
  const planned = await trayPlan(tx, lessonId);
  const g = planned?.plan.groups.find((x) => x.number === group);
  if (!planned || !g) throw trayGone();
  return { ...planned, group: g };
}

/** GET /api/trays/:token's answer. */
export async function trayView(
  tx: Tx,
  lessonId: string,
  groupNumber: number,
  expiresAt: Date,
): Promise<TrayView> {
  const { input, group } = await trayGroup(tx, lessonId, groupNumber);
  const [lesson] = await tx
    .select({ title: lessons.title, className: classes.name })
    .from(lessons)
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .where(eq(lessons.id, lessonId));
  const saved = (await savedLines(tx, lessonId, groupNumber)).get(groupNumber) ?? new Map();
  return {
    lesson: {
      title: lesson!.title,
      startsAt: input.lesson.startsAt,
      endsAt: input.lesson.endsAt,
      className: lesson!.className,
    },
    group: {
      number: group.number,
      size: group.size,
      homeTub: group.homeTub,
      controllerLabel: group.controllerLabel,
      lines: trayLinesOf(input, group, saved),
    },
    expiresAt: expiresAt.toISOString(),
  };
}

/** The teacher's board: every planned group's counts (empty when the lesson cannot be planned). */
export async function trayBoard(tx: Tx, lessonId: string): Promise<TrayBoard> {
  const planned = await trayPlan(tx, lessonId);
  if (!planned) return { groups: [] };
  const saved = await savedLines(tx, lessonId);
  return {
    groups: planned.plan.groups.map((group) => {
      const lines = trayLinesOf(planned.input, group, saved.get(group.number) ?? new Map());
      return {
        number: group.number,
        lines: lines.length,
        linesOut: lines.filter((l) => l.out).length,
        linesBack: lines.filter((l) => l.back).length,
        missing: lines
          .filter((l) => l.missing > 0)
          .map((l) => ({ partCode: l.partCode, count: l.missing })),
      };
    }),
  };
}
