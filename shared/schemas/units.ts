/**
 * Units (a term's plan of lessons): request bodies, list filters and the records the API answers
 * with. The field builders at the top are shared with lessons.ts so every planning form words its
 * messages the same way.
 */
import * as z from 'zod';
import { VERSION_MAX, multiLine, singleLine } from './text.js';
import { uuidSchema } from './common.js';

/** The message when a request body is not a JSON object at all. */
const BODY = { message: 'Send the details as a JSON object.' };

/** A trimmed, required line of text (`what` names it in the message: "Enter a title."). */
export function requiredText(what: string, max: number) {
  return singleLine({ message: `Enter ${what}.` })
    .trim()
    .min(1, { message: `Enter ${what}.` })
    .max(max, { message: `Use at most ${max} characters.` });
}

/** Optional text, stored as '' when left empty. */
export function plainText(max: number) {
  return singleLine({ message: 'Enter text.' })
    .trim()
    .max(max, { message: `Use at most ${max} characters.` });
}

/** Markdown is not trimmed: leading spaces can be meaningful (an indented code block). */
export function markdownText(max: number) {
  return multiLine({ message: 'Enter text.' }).max(max, {
    message: `Use at most ${max.toLocaleString('en')} characters.`,
  });
}

/** A whole number in [min, max]; one message for a missing value, a fraction or a bad range. */
export function wholeNumber(
  min: number,
  max: number,
  message = `Use a whole number from ${min} to ${max}.`,
) {
  return z.int({ message }).min(min, { message }).max(max, { message });
}

/** The version a record was read at, sent back with every edit (a stale one is a 409). */
export const versionSchema = z
  .int({ message: 'Send the version you loaded.' })
  .min(1, { message: 'Send the version you loaded.' })
  .max(VERSION_MAX, { message: 'Send the version you loaded.' });

/** A list of distinct ids (an id twice is a mistake the client should hear about). */
export function distinctIds(max: number, what: string) {
  return z
    .array(uuidSchema, { message: `Send a list of ${what}.` })
    .max(max, { message: `Choose at most ${max} ${what}.` })
    .superRefine((ids, ctx) => {
      const seen = new Set<string>();
      ids.forEach((id, i) => {
        if (seen.has(id))
          ctx.addIssue({ code: 'custom', path: [i], message: 'This one is listed twice.' });
        seen.add(id);
      });
    });
}

export const UNIT_STATUSES = ['draft', 'in-review', 'changes-requested', 'endorsed'] as const;
export const unitStatusSchema = z.enum(UNIT_STATUSES, {
  message: 'Choose draft, in review, changes requested or endorsed.',
});
export type UnitStatus = z.infer<typeof unitStatusSchema>;
/** Words a teacher reads for each status. */
export const UNIT_STATUS_LABELS: Record<UnitStatus, string> = {
  draft: 'Draft',
  'in-review': 'In review',
  'changes-requested': 'Changes requested',
  endorsed: 'Endorsed',
};

export const UNIT_VISIBILITIES = ['private', 'school'] as const;
export const unitVisibilitySchema = z.enum(UNIT_VISIBILITIES, {
  message: 'Choose private or shared with the school.',
});
export type UnitVisibility = z.infer<typeof unitVisibilitySchema>;

/** Year 0 is the first year of school (Foundation / Reception). */
export const yearLevelSchema = wholeNumber(0, 12, 'Use a year level from 0 (Foundation) to 12.');
export const termSchema = wholeNumber(1, 4, 'Use a term from 1 to 4.');
export const OVERVIEW_MAX = 20_000;

const unitFields = {
  title: requiredText('a title', 200),
  yearLevel: yearLevelSchema,
  learningArea: plainText(100),
  term: termSchema.nullable(),
  overview: markdownText(OVERVIEW_MAX),
};

/** `POST /api/units`. */
export const unitCreateSchema = z.object(
  {
    title: unitFields.title,
    yearLevel: unitFields.yearLevel,
    learningArea: unitFields.learningArea.optional(),
    term: unitFields.term.optional(),
    overview: unitFields.overview.optional(),
  },
  BODY,
);
export type UnitCreate = z.infer<typeof unitCreateSchema>;

/** `PATCH /api/units/:id`: the version read, and any fields to change. */
export const unitUpdateSchema = z
  .object(
    {
      version: versionSchema,
      title: unitFields.title.optional(),
      yearLevel: unitFields.yearLevel.optional(),
      learningArea: unitFields.learningArea.optional(),
      term: unitFields.term.optional(),
      overview: unitFields.overview.optional(),
      visibility: unitVisibilitySchema.optional(),
      outcomeIds: distinctIds(300, 'outcomes').optional(),
      coauthorIds: distinctIds(20, 'co-authors').optional(),
    },
    BODY,
  )
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), {
    message: 'Change at least one field.',
  });
export type UnitUpdate = z.infer<typeof unitUpdateSchema>;

/** `PUT /api/units/:id/lesson-order`: every lesson of the unit, in the new order. */
export const lessonOrderSchema = z.object(
  {
    version: versionSchema,
    lessonIds: distinctIds(200, 'lessons'),
  },
  BODY,
);
export type LessonOrder = z.infer<typeof lessonOrderSchema>;

/** An empty query parameter means "no filter". */
const blankToUndefined = (v: unknown) => (v === '' ? undefined : v);
const queryNumber = (schema: z.ZodType<number, number>) =>
  z
    .preprocess(blankToUndefined, z.coerce.number({ message: 'Use a whole number.' }).pipe(schema))
    .optional();

/** `GET /api/units?scope=mine|library&yearLevel=&term=&status=&owner=&q=`. */
export const unitListQuerySchema = z.object({
  /** mine: owned or co-authored; library: shared with the school (for a lead, every unit). */
  scope: z.preprocess(
    blankToUndefined,
    z.enum(['mine', 'library'], { message: 'Choose mine or library.' }).default('mine'),
  ),
  yearLevel: queryNumber(yearLevelSchema),
  term: queryNumber(termSchema),
  status: z.preprocess(blankToUndefined, unitStatusSchema.optional()),
  owner: z.preprocess(blankToUndefined, uuidSchema.optional()),
  q: z.preprocess(blankToUndefined, plainText(200).optional()),
});
export type UnitListQuery = z.infer<typeof unitListQuerySchema>;

export const personRefSchema = z.object({ id: z.string(), name: z.string(), email: z.string() });
export type PersonRef = z.infer<typeof personRefSchema>;

/** A row of the "My units" and library tables. */
export const unitSummarySchema = z.object({
  id: z.string(),
  title: z.string(),
  yearLevel: z.number(),
  learningArea: z.string(),
  term: z.number().nullable(),
  status: unitStatusSchema,
  visibility: unitVisibilitySchema,
  owner: personRefSchema,
  lessonCount: z.number(),
  version: z.number(),
  /** ISO 8601 with offset. */
  updatedAt: z.string(),
  /** Whether the signed-in user may edit it (an owner or co-author). */
  canEdit: z.boolean(),
});
export type UnitSummary = z.infer<typeof unitSummarySchema>;
export const unitListSchema = z.object({ units: z.array(unitSummarySchema) });

/** A lesson as the unit lists it, in the unit's order. */
export const unitLessonSchema = z.object({
  id: z.string(),
  title: z.string(),
  /** `YYYY-MM-DD`, the lesson's local date. */
  date: z.string(),
  /** Local `YYYY-MM-DDTHH:MM` in the school's timezone. */
  startsAt: z.string(),
  endsAt: z.string(),
  classId: z.string(),
  className: z.string(),
  /** Set when the lesson is dated outside the unit's term (shared/calendar/terms.ts). */
  termNote: z.string().nullable().optional(),
});

export const unitOutcomeSchema = z.object({
  id: z.string(),
  code: z.string(),
  description: z.string(),
  frameworkId: z.string(),
  strand: z.string(),
  yearBand: z.string(),
});

/** Where a copy came from, as it was when copied (null on an original). */
export const basedOnSchema = z.object({
  unitId: z.string(),
  title: z.string(),
  version: z.number(),
  ownerName: z.string(),
  /** ISO 8601 with offset. */
  copiedAt: z.string(),
  /** Whether the signed-in user can still open the original (the link is shown only then). */
  readable: z.boolean(),
});
export type BasedOn = z.infer<typeof basedOnSchema>;

/** `GET /api/units/:id` (and every write of a unit, and `error.current` of a 409). */
export const unitSchema = unitSummarySchema.omit({ lessonCount: true }).extend({
  overview: z.string(),
  copiedFromId: z.string().nullable(),
  createdAt: z.string(),
  coauthors: z.array(personRefSchema),
  outcomes: z.array(unitOutcomeSchema),
  lessons: z.array(unitLessonSchema),
  /** Whether the signed-in user owns it (only the owner deletes it or changes co-authors). */
  isOwner: z.boolean(),
  /** The original this unit was copied from (API.md, "Reuse"), or null for an original. */
  basedOn: basedOnSchema.nullable(),
});
export type Unit = z.infer<typeof unitSchema>;
export type UnitLesson = z.infer<typeof unitLessonSchema>;
export type UnitOutcome = z.infer<typeof unitOutcomeSchema>;
