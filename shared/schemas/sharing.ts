/**
 * Relief without an account: share links of a lesson, the shared lesson as the relief page shows
 * it, the relief teacher's day, and the personal calendar feed (API.md, "Relief without an
 * account, and calendars").
 */
import * as z from 'zod';
import { emailSchema } from './common.js';
import { activityKindSchema, attachmentSchema } from './lessons.js';
import { prepPlanSchema, prepTaskSchema } from '../prep/plan-schema.js';

/** The longest a share link may live, in days (API.md). */
export const SHARE_LINK_MAX_DAYS = 14;

/** `POST /api/lessons/:id/share-links`. */
export const shareLinkCreateSchema = z.object(
  {
    email: emailSchema.optional(),
    /** ISO 8601 with an offset; between now and 14 days from now (checked by the server's clock). */
    expiresAt: z
      .string({ message: 'Give the end as a date and time, like 2026-08-04T17:00:00+09:30.' })
      .max(40, { message: 'Give the end as a date and time, like 2026-08-04T17:00:00+09:30.' })
      .pipe(
        z.iso.datetime({
          offset: true,
          message: 'Give the end as a date and time, like 2026-08-04T17:00:00+09:30.',
        }),
      )
      .optional(),
  },
  { message: 'Send the details as a JSON object.' },
);
export type ShareLinkCreate = z.input<typeof shareLinkCreateSchema>;

/** The answer of a new link: the only time its address (and so its token) is ever shown. */
export const shareLinkCreatedSchema = z.object({
  id: z.string(),
  url: z.string(),
  expiresAt: z.string(),
});
export type ShareLinkCreated = z.infer<typeof shareLinkCreatedSchema>;

/** A link as the lesson page lists it (never its token). */
export const shareLinkSchema = z.object({
  id: z.string(),
  expiresAt: z.string(),
  email: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ShareLink = z.infer<typeof shareLinkSchema>;
export const shareLinkListSchema = z.object({ links: z.array(shareLinkSchema) });

/** A part the shared pull lists name. */
export const sharedPartSchema = z.object({
  code: z.string(),
  name: z.string(),
  colour: z.string().nullable(),
  compartment: z.string().nullable(),
  small: z.boolean(),
  rechargeable: z.boolean(),
});

/** An activity of the shared lesson, with its attachments' names (build instructions). */
export const sharedActivitySchema = z.object({
  id: z.string(),
  title: z.string(),
  kind: activityKindSchema,
  minutes: z.number(),
  attachments: z.array(attachmentSchema),
});
export type SharedActivity = z.infer<typeof sharedActivitySchema>;

/** `GET /api/share/:token`: the lesson as the relief page shows it, and nothing else. */
export const sharedLessonSchema = z.object({
  lesson: z.object({
    title: z.string(),
    unitTitle: z.string(),
    number: z.number(),
    lessonCount: z.number(),
    schoolName: z.string(),
    className: z.string(),
    studentCount: z.number(),
    startsAt: z.string(),
    endsAt: z.string(),
    periodName: z.string().nullable(),
    room: z.string(),
    kitTypeName: z.string(),
    learningIntention: z.string(),
    successCriteria: z.string(),
    reliefNotes: z.string(),
    activities: z.array(sharedActivitySchema),
  }),
  parts: z.array(sharedPartSchema),
  plan: prepPlanSchema.nullable(),
  /** Why the lesson cannot be planned yet (empty when `plan` is there). */
  problems: z.array(z.string()),
  cautions: z.array(z.object({ title: z.string(), text: z.string() })),
  expiresAt: z.string(),
});
export type SharedLesson = z.infer<typeof sharedLessonSchema>;

/** `POST /api/account/calendar-feed`. */
export const calendarFeedSchema = z.object({ url: z.string() });

/** `GET /api/relief/today`: the relief teacher's lessons of today, in time order. */
export const reliefDaySchema = z.object({
  /** Today in the school's timezone, `2026-08-04`. */
  date: z.string(),
  lessons: z.array(
    z.object({
      id: z.string(),
      title: z.string(),
      unitTitle: z.string(),
      className: z.string(),
      startsAt: z.string(),
      endsAt: z.string(),
      periodName: z.string().nullable(),
      room: z.string(),
      reliefNotes: z.string(),
      /** Whether the lesson can be planned (and so printed) as stored. */
      plannable: z.boolean(),
      /** Prep tasks whose done-by time has not passed. */
      openTasks: z.array(prepTaskSchema),
      activities: z.array(sharedActivitySchema),
    }),
  ),
});
export type ReliefDay = z.infer<typeof reliefDaySchema>;
