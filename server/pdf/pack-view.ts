/** What every section builder of a lesson pack reads: the lesson, its plan, lookups, the page. */
import {
  groupController as sharedGroupController,
  type PrepGroup,
  type PrepLine,
  type PrepPlan,
} from '../../shared/prep/index.js';
import type { LessonPackModel, PackPart, PrintContext } from './model.js';
import { contentWidth } from './layout.js';
import { clockTime, localClockTime, shortDate } from './format.js';

export interface PackView {
  lesson: LessonPackModel;
  plan: PrepPlan;
  print: PrintContext;
  /** Width of the page's content area in points. */
  width: number;
  /** The lesson's local date, `2026-07-28`. */
  day: string;
  part(code: string): PackPart;
  /** `11:10 am` of a plan instant. */
  clock(iso: string): string;
  /** Controller label of each booked tub, by tub label. */
  controllers: Map<string, string | null>;
}

/** Builds the view of a plannable lesson. */
export function packView(lesson: LessonPackModel, plan: PrepPlan, print: PrintContext): PackView {
  const parts = new Map(lesson.parts.map((p) => [p.code, p]));
  return {
    lesson,
    plan,
    print,
    width: contentWidth(print.paper),
    day: lesson.startsAt.slice(0, 10),
    part: (code) =>
      parts.get(code) ?? {
        code,
        name: code,
        colour: null,
        compartment: null,
        category: 'other',
        small: false,
        rechargeable: false,
      },
    clock: (iso) => clockTime(iso, print.timezone),
    controllers: new Map(lesson.tubs.map((t) => [t.label, t.controllerLabel])),
  };
}

/** `4K · Tue 28 Jul 2026 · 11:10 am – 12:00 pm`: which lesson a sheet belongs to. */
export function lessonLine(lesson: LessonPackModel, timezone: string): string {
  const when = `${localClockTime(lesson.startsAt, timezone)} – ${localClockTime(lesson.endsAt, timezone)}`;
  return `${lesson.className} · ${shortDate(lesson.startsAt, timezone)} · ${when}`;
}

/** `Lesson 2 of 8: Drive straight` for headers. */
export function lessonHeading(lesson: LessonPackModel): string {
  return `Lesson ${lesson.number} of ${lesson.lessonCount}: ${lesson.title}`;
}

/**
 * Where a line's pieces come from, with borrowed ones marked and where they go back to:
 * `Tub 1: 1` / `Tub 3: 1 (borrowed, return to Tub 3)`.
 */
export function sourceLines(line: PrepLine, homeTub: string | null): string[] {
  if (!line.sources.length) return ['—'];
  return line.sources.map((s) =>
    homeTub !== null && s.tub !== homeTub
      ? `${s.tub}: ${s.qty} borrowed, back to ${s.tub}`
      : `${s.tub}: ${s.qty}`,
  );
}

/** The controller a group pairs with, as printed (shared/prep/controller.ts says how). */
export function groupController(view: PackView, group: PrepGroup): string {
  return (
    sharedGroupController(
      group,
      (code) => view.part(code).category,
      (tub) => view.controllers.get(tub),
    ) ?? 'not labelled'
  );
}

/** Pieces each tub gave out (groups, class tray, spares tray): what must come back to it. */
export function countBack(plan: PrepPlan): Map<string, Map<string, number>> {
  const byTub = new Map<string, Map<string, number>>();
  const add = (lines: readonly PrepLine[]) => {
    for (const line of lines) {
      for (const s of line.sources) {
        const tub = byTub.get(s.tub) ?? new Map<string, number>();
        tub.set(line.partCode, (tub.get(line.partCode) ?? 0) + s.qty);
        byTub.set(s.tub, tub);
      }
    }
  };
  for (const g of plan.groups) add(g.lines);
  add(plan.classTray.lines);
  add(plan.sparesTray.lines);
  return byTub;
}
