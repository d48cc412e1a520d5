/**
 * The "pack model": everything a printable needs, as plain JSON. The route loads it from the
 * database and computes the prep plan; the worker thread turns it into PDF bytes. Nothing here
 * holds a function, a Date or a class instance, so it crosses to the worker by structured clone.
 */
import type { PrepPlan, TubStatus } from '../../shared/prep/index.js';
import type { PaperSize } from '../../shared/schemas/school.js';
import type { PackAttachment } from './attachments.js';
import type { CoverageJob } from './coverage.js';

/** Where and when a file is printed: the school's paper and clock. */
export interface PrintContext {
  paper: PaperSize;
  /** The school's IANA timezone; every time on the page is read in it. */
  timezone: string;
  schoolName: string;
  /** When the file was asked for (ISO 8601 in UTC): the one clock reading, taken by the route. */
  generatedAt: string;
}

/** A part of the kit type as the sheets name it. */
export interface PackPart {
  code: string;
  name: string;
  colour: string | null;
  compartment: string | null;
  category: string;
  /** Whether it is a small part (choking hazard, counted back in). */
  small: boolean;
  /** Whether it is rechargeable (has a full-charge time). */
  rechargeable: boolean;
}

/** A tub booked for the lesson. */
export interface PackTub {
  label: string;
  controllerLabel: string | null;
  status: TubStatus;
}

export interface PackOutcome {
  code: string;
  description: string;
}

/** One lesson, ready to print. */
export interface LessonPackModel {
  id: string;
  /** Position in its unit, from 1. */
  number: number;
  /** How many lessons the unit has. */
  lessonCount: number;
  title: string;
  unitTitle: string;
  className: string;
  studentCount: number;
  devices: number;
  /** Wall-clock start and end in the school's timezone, `2026-07-28T11:10`. */
  startsAt: string;
  endsAt: string;
  periodName: string | null;
  room: string;
  /** The class's teachers (or the unit's owner when the class has none recorded). */
  teachers: string[];
  reliefTeacher: string | null;
  kitTypeName: string;
  /** Markdown. */
  learningIntention: string;
  /** Markdown. */
  successCriteria: string;
  /** Markdown. */
  reliefNotes: string;
  outcomes: PackOutcome[];
  /** The parts the plan names, in parts-list order. */
  parts: PackPart[];
  tubs: PackTub[];
  /** Codes of parts that some activity uses up (not all of them come back at pack-away). */
  usedUpParts: string[];
  /** The prep plan, or null when the stored lesson cannot be planned (see `problems`). */
  plan: PrepPlan | null;
  /** Why no plan could be made, in the engine's words. */
  problems: string[];
}

/** The first pages of a unit pack. */
export interface UnitOverviewModel {
  id: string;
  title: string;
  yearLevel: number;
  learningArea: string;
  term: number | null;
  /** Markdown. */
  overview: string;
  ownerName: string;
  outcomes: PackOutcome[];
}

/** What the worker is asked to render. */
export type RenderJob =
  | {
      kind: 'lesson-pack';
      print: PrintContext;
      lesson: LessonPackModel;
      /** The activities' build instructions (none when left out). */
      attachments?: PackAttachment[];
    }
  | {
      kind: 'unit-pack';
      print: PrintContext;
      unit: UnitOverviewModel;
      lessons: LessonPackModel[];
      /** Every lesson's build instructions (none when left out). */
      attachments?: PackAttachment[];
    }
  | {
      kind: 'labels';
      print: PrintContext;
      lesson: LessonPackModel & { plan: PrepPlan };
      /** The address of each group's tray page, in group order (encoded in the QR codes). */
      groupUrls: string[];
      /** Each group's short tray code, printed under its QR code (`K7QM-3XPA`). */
      groupCodes: string[];
    }
  | CoverageJob;
