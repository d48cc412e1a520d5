/**
 * Lessons, their activities and each activity's bill of materials: request bodies and the records
 * the API answers with. Limits follow PREP-RULES.md (group size 1–8, minutes 0–480, quantities
 * 0–10000, a window of at most 480 minutes) so whatever is stored can be planned.
 */
import * as z from 'zod';
import { singleLine } from './text.js';
import { uuidSchema } from './common.js';
import { ACTIVITY_KINDS, MATERIAL_PER, MAX_GROUP_SIZE } from '../definitions.js';

export { ACTIVITY_KINDS, MATERIAL_PER, MAX_GROUP_SIZE };
import {
  distinctIds,
  markdownText,
  plainText,
  requiredText,
  unitStatusSchema,
  versionSchema,
  wholeNumber,
} from './units.js';

/** The message when a request body is not a JSON object at all. */
const BODY = { message: 'Send the details as a JSON object.' };
const LINE = { message: 'Send each line of materials as an object.' };

export const activityKindSchema = z.enum(ACTIVITY_KINDS, {
  message: 'Choose intro, build, code, test, reflect or other.',
});
export type ActivityKind = z.infer<typeof activityKindSchema>;
export const ACTIVITY_KIND_LABELS: Record<ActivityKind, string> = {
  intro: 'Introduction',
  build: 'Build',
  code: 'Code',
  test: 'Test',
  reflect: 'Reflect',
  other: 'Other',
};

export const materialPerSchema = z.enum(MATERIAL_PER, {
  message: 'Choose per group, per student or per class.',
});
export type MaterialPer = z.infer<typeof materialPerSchema>;

/** The longest lesson window the prep engine plans (PREP-RULES.md, "Bad input"). */
export const MAX_LESSON_MINUTES = 480;

/** `2026-07-28T11:10`: a wall-clock time in the school's timezone, to the minute, no offset. */
export const LOCAL_DATE_TIME_PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;

/** Wall-clock minutes since 1970 of a local date-time, or null when it is no real date. */
export function localMinutes(value: string): number | null {
  const m = LOCAL_DATE_TIME_PATTERN.exec(value);
  if (!m) return null;
  const [y, mo, d, h, mi] = m.slice(1).map(Number) as [number, number, number, number, number];
  const t = new Date(Date.UTC(y, mo - 1, d, h, mi));
  const real =
    t.getUTCFullYear() === y &&
    t.getUTCMonth() === mo - 1 &&
    t.getUTCDate() === d &&
    t.getUTCHours() === h;
  return real && mi < 60 ? t.getTime() / 60_000 : null;
}

export const localDateTimeSchema = z
  .string({ message: 'Enter a date and time like 2026-07-28T11:10.' })
  .refine((v) => localMinutes(v) !== null, {
    message: 'Enter a date and time like 2026-07-28T11:10.',
  });

/**
 * What is wrong with a lesson window on the wall clock, or null. The server checks the same
 * window again in elapsed time in the school's timezone (a daylight-saving change can add an hour).
 */
export function lessonWindowProblem(startsAt: string, endsAt: string): string | null {
  const from = localMinutes(startsAt);
  const to = localMinutes(endsAt);
  if (from === null || to === null) return null;
  if (to <= from) return 'The lesson must end after it starts.';
  if (to - from > MAX_LESSON_MINUTES) {
    return `A lesson is at most ${MAX_LESSON_MINUTES} minutes long; this one is ${to - from}.`;
  }
  return null;
}

export const groupSizeSchema = wholeNumber(
  1,
  MAX_GROUP_SIZE,
  `Use a group size from 1 to ${MAX_GROUP_SIZE}.`,
);

const lessonFields = {
  title: requiredText('a title', 200),
  classId: uuidSchema,
  kitTypeId: uuidSchema,
  startsAt: localDateTimeSchema,
  endsAt: localDateTimeSchema,
  groupSize: groupSizeSchema,
  tubIds: distinctIds(200, 'tubs'),
  periodId: uuidSchema.nullable(),
  room: plainText(100),
  learningIntention: markdownText(5000),
  successCriteria: markdownText(5000),
  reliefNotes: markdownText(10_000),
  reliefTeacherId: uuidSchema.nullable(),
};

/** `POST /api/units/:id/lessons`; without `tubIds` it books every tub of the kit type not retired. */
export const lessonCreateSchema = z
  .object(
    {
      title: lessonFields.title,
      classId: lessonFields.classId,
      kitTypeId: lessonFields.kitTypeId,
      startsAt: lessonFields.startsAt,
      endsAt: lessonFields.endsAt,
      groupSize: lessonFields.groupSize,
      tubIds: lessonFields.tubIds.optional(),
      periodId: lessonFields.periodId.optional(),
      room: lessonFields.room.optional(),
      learningIntention: lessonFields.learningIntention.optional(),
      successCriteria: lessonFields.successCriteria.optional(),
      reliefNotes: lessonFields.reliefNotes.optional(),
      reliefTeacherId: lessonFields.reliefTeacherId.optional(),
    },
    BODY,
  )
  .superRefine((v, ctx) => {
    const problem = lessonWindowProblem(v.startsAt, v.endsAt);
    if (problem) ctx.addIssue({ code: 'custom', path: ['endsAt'], message: problem });
  });
export type LessonCreate = z.infer<typeof lessonCreateSchema>;

/**
 * `PATCH /api/lessons/:id`. A window given whole is checked here; one end alone is checked on the
 * server against the stored other end.
 */
/** A part code in a kit-type switch's map. */
const switchCode = singleLine({ message: 'Enter a part code.' })
  .trim()
  .min(1, { message: 'Enter a part code.' })
  .max(64);

export const lessonUpdateSchema = z
  .object(
    {
      version: versionSchema,
      title: lessonFields.title.optional(),
      classId: lessonFields.classId.optional(),
      kitTypeId: lessonFields.kitTypeId.optional(),
      startsAt: lessonFields.startsAt.optional(),
      endsAt: lessonFields.endsAt.optional(),
      groupSize: lessonFields.groupSize.optional(),
      tubIds: lessonFields.tubIds.optional(),
      periodId: lessonFields.periodId.optional(),
      room: lessonFields.room.optional(),
      learningIntention: lessonFields.learningIntention.optional(),
      successCriteria: lessonFields.successCriteria.optional(),
      reliefNotes: lessonFields.reliefNotes.optional(),
      reliefTeacherId: lessonFields.reliefTeacherId.optional(),
      /**
       * With a new kit type: the parts of the old one the activities use, mapped to parts of the
       * new one (old code → new code), in the same save.
       */
      partMap: z
        .record(switchCode, switchCode, { error: 'Map each part code to a part code.' })
        .refine((m) => Object.keys(m).length <= 500, { error: 'At most 500 parts can be mapped.' })
        .optional(),
      /** With a new kit type: leave out the material lines whose parts it lacks (unmapped). */
      dropMissingParts: z.boolean({ error: 'Say whether to leave those parts out.' }).optional(),
    },
    BODY,
  )
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), {
    message: 'Change at least one field.',
  })
  .superRefine((v, ctx) => {
    if (v.startsAt === undefined || v.endsAt === undefined) return;
    const problem = lessonWindowProblem(v.startsAt, v.endsAt);
    if (problem) ctx.addIssue({ code: 'custom', path: ['endsAt'], message: problem });
  });
export type LessonUpdate = z.infer<typeof lessonUpdateSchema>;

/** `PUT /api/lessons/:id/activity-order`: every activity of the lesson, in the new order. */
export const activityOrderSchema = z.object(
  {
    version: versionSchema,
    activityIds: distinctIds(100, 'activities'),
  },
  BODY,
);
export type ActivityOrder = z.infer<typeof activityOrderSchema>;

/** The message of a line with both or neither of a part code and a consumable. */
export const MATERIAL_ONE_OF_MESSAGE = 'Pick a part or name a consumable (one of the two).';

/** A line of a bill of materials: a part code (of the lesson's kit type) or a consumable, not both. */
export const materialInputSchema = z
  .object(
    {
      partCode: singleLine({ message: 'Enter a part code.' })
        .trim()
        .min(1, { message: 'Enter a part code.' })
        .max(64)
        .optional(),
      consumable: requiredText('what the consumable is', 200).optional(),
      qty: wholeNumber(0, 10_000, 'Use a whole number from 0 to 10000.'),
      per: materialPerSchema,
      /** Whether the pieces come back; defaults to true for a part and false for a consumable. */
      returnable: z.boolean({ message: 'Choose yes or no.' }).optional(),
    },
    LINE,
  )
  // zod skips this once a field of the line fails; the server then reports it on its own.
  .refine((v) => (v.partCode === undefined) !== (v.consumable === undefined), {
    path: ['partCode'],
    message: MATERIAL_ONE_OF_MESSAGE,
  });
export type MaterialInput = z.input<typeof materialInputSchema>;

const activityFields = {
  title: requiredText('a title', 200),
  kind: activityKindSchema,
  minutes: wholeNumber(0, 480, 'Use a whole number of minutes from 0 to 480.'),
  materials: z.array(materialInputSchema, { message: 'Send a list of materials.' }).max(200, {
    message: 'An activity has at most 200 materials.',
  }),
};

/** `POST /api/lessons/:id/activities`, appended at the end of the lesson. */
export const activityCreateSchema = z.object(
  {
    ...activityFields,
    materials: activityFields.materials.default([]),
  },
  BODY,
);
export type ActivityCreate = z.input<typeof activityCreateSchema>;

/** `PATCH /api/activities/:id`; `materials`, when sent, replace the whole list. */
export const activityUpdateSchema = z
  .object(
    {
      version: versionSchema,
      title: activityFields.title.optional(),
      kind: activityFields.kind.optional(),
      minutes: activityFields.minutes.optional(),
      materials: activityFields.materials.optional(),
    },
    BODY,
  )
  .refine((v) => Object.keys(v).some((k) => k !== 'version'), {
    message: 'Change at least one field.',
  });
export type ActivityUpdate = z.input<typeof activityUpdateSchema>;

/** Attachments: build instructions as PDF or images, sniffed from their bytes. */
export const ATTACHMENT_TYPES = [
  'application/pdf',
  'image/png',
  'image/jpeg',
  'image/webp',
] as const;
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

export const materialSchema = z.object({
  id: z.string(),
  partCode: z.string().nullable(),
  /** The part's name in the kit type's parts list (null for a consumable or a removed part). */
  partName: z.string().nullable(),
  consumable: z.string().nullable(),
  qty: z.number(),
  per: materialPerSchema,
  returnable: z.boolean(),
});
export type Material = z.infer<typeof materialSchema>;

export const attachmentSchema = z.object({
  id: z.string(),
  filename: z.string(),
  size: z.number(),
  contentType: z.string(),
});
export type Attachment = z.infer<typeof attachmentSchema>;

/** An activity with its materials and attachments in order (also `error.current` of its 409). */
export const activitySchema = z.object({
  id: z.string(),
  lessonId: z.string(),
  version: z.number(),
  position: z.number(),
  title: z.string(),
  kind: activityKindSchema,
  minutes: z.number(),
  materials: z.array(materialSchema),
  attachments: z.array(attachmentSchema),
});
export type Activity = z.infer<typeof activitySchema>;

/** `GET /api/lessons/:id` (and every write of a lesson, and `error.current` of its 409). */
/** Another lesson that books some of the same tubs at an overlapping time (PREP-RULES.md). */
export const bookingConflictSchema = z.object({
  lessonId: z.string(),
  title: z.string(),
  className: z.string(),
  /** Local `YYYY-MM-DDTHH:MM`, school time. */
  startsAt: z.string(),
  endsAt: z.string(),
  tubs: z.array(z.string()),
  message: z.string(),
});
export type BookingConflict = z.infer<typeof bookingConflictSchema>;

export const lessonSchema = z.object({
  id: z.string(),
  version: z.number(),
  position: z.number(),
  title: z.string(),
  /** Its unit; `status` so an editor can warn that an edit returns an endorsed unit to draft. */
  unit: z.object({ id: z.string(), title: z.string(), status: unitStatusSchema }),
  class: z.object({
    id: z.string(),
    name: z.string(),
    yearLevel: z.number(),
    studentCount: z.number(),
    devices: z.number(),
  }),
  kitType: z.object({ id: z.string(), name: z.string() }),
  /** Booked tubs, by label. */
  tubIds: z.array(z.string()),
  tubs: z.array(z.object({ id: z.string(), label: z.string(), status: z.string() })),
  startsAt: z.string(),
  endsAt: z.string(),
  periodId: z.string().nullable(),
  room: z.string(),
  groupSize: z.number(),
  learningIntention: z.string(),
  successCriteria: z.string(),
  reliefNotes: z.string(),
  reliefTeacherId: z.string().nullable(),
  /** Whether the signed-in user may edit it (an author of its unit). */
  canEdit: z.boolean(),
  activities: z.array(activitySchema),
  updatedAt: z.string(),
  /** Lessons that double-book its tubs: saving answers them beside the lesson. */
  bookingConflicts: z.array(bookingConflictSchema),
});
export type Lesson = z.infer<typeof lessonSchema>;
