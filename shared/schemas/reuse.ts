/**
 * Reuse: copying a colleague's unit with its provenance, what changed in the original since, and
 * a unit's history. Request bodies and the records the API answers with (API.md, "Reuse").
 */
import * as z from 'zod';
import { uuidSchema } from './common.js';
import { basedOnSchema, requiredText } from './units.js';

export { basedOnSchema, type BasedOn } from './units.js';

/** The message when a request body is not a JSON object at all. */
const BODY = { message: 'Send the details as a JSON object.' };

const DATE_MESSAGE = 'Enter a date like 2026-10-06.';
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Whether `value` is a real calendar date written `YYYY-MM-DD` (no 31 June, no 29 Feb 2026). */
export function isCalendarDate(value: string): boolean {
  const m = DATE_PATTERN.exec(value);
  if (!m) return false;
  const [y, mo, d] = m.slice(1).map(Number) as [number, number, number];
  const t = new Date(Date.UTC(y, mo - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === d;
}

export const calendarDateSchema = z
  .string({ message: DATE_MESSAGE })
  .refine(isCalendarDate, { message: DATE_MESSAGE });

/**
 * `POST /api/units/:id/copy`. Without `title` the copy keeps the original's; without `classId`
 * its lessons keep their classes; without `startDate` they keep their dates.
 */
export const unitCopySchema = z.object(
  {
    // requiredText refuses control characters and line breaks (shared/schemas/text.ts).
    title: requiredText('a title', 200).optional(),
    classId: uuidSchema.optional(),
    startDate: calendarDateSchema.optional(),
  },
  BODY,
);
export type UnitCopy = z.infer<typeof unitCopySchema>;

/** A copied lesson's prep plan against the original's, for the summary after copying. */
export const copiedLessonSchema = z.object({
  lessonId: z.string(),
  sourceLessonId: z.string(),
  title: z.string(),
  /** Local `YYYY-MM-DDTHH:MM` in the school's timezone. */
  startsAt: z.string(),
  /** Why the new date is not a teaching day (weekend, a listed day, outside the terms), or null. */
  notTeaching: z.string().nullable(),
  /** Groups and shortfalls of the original's plan and the copy's (null when not plannable). */
  before: z.object({ groups: z.number(), shortfalls: z.number() }).nullable(),
  after: z.object({ groups: z.number(), shortfalls: z.number() }).nullable(),
});
export type CopiedLesson = z.infer<typeof copiedLessonSchema>;

export const copySummarySchema = z.object({
  /** One line a teacher reads: "7 groups instead of 9; 2 shortfalls fewer". */
  text: z.string(),
  lessons: z.array(copiedLessonSchema),
});
export type CopySummary = z.infer<typeof copySummarySchema>;

/** One entry of a unit's history. */
export const unitEventSchema = z.object({
  /** ISO 8601 with offset. */
  at: z.string(),
  /** Who made the change (id null once their account is gone). */
  actor: z.object({ id: z.string().nullable(), name: z.string() }),
  action: z.string(),
  summary: z.string(),
});
export type UnitEventRecord = z.infer<typeof unitEventSchema>;

/** `GET /api/units/:id/history`, newest first. */
export const unitHistorySchema = z.object({ events: z.array(unitEventSchema) });
export type UnitHistory = z.infer<typeof unitHistorySchema>;

/** `GET /api/units/:id/upstream`: what changed in the original since it was copied. */
export const upstreamSchema = z.object({
  basedOn: basedOnSchema,
  /** The original's version now. */
  sourceVersion: z.number(),
  /** Whether anything changed since the copy was made. */
  changed: z.boolean(),
  changes: z.array(z.object({ summary: z.string() })),
});
export type Upstream = z.infer<typeof upstreamSchema>;
