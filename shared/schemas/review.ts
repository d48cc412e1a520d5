/**
 * Review and coverage: the review step a unit takes, comments, the review queue, the lead's
 * summary and the coverage matrix. Rules in API.md, "Review and coverage".
 */
import * as z from 'zod';
import { uuidSchema } from './common.js';
import {
  markdownText,
  termSchema,
  unitSchema,
  unitStatusSchema,
  versionSchema,
  yearLevelSchema,
} from './units.js';

const BODY = { message: 'Send the details as a JSON object.' };

export const COMMENT_MAX = 5000;

/**
 * A comment's Markdown: 1–5,000 characters, not only spaces; markdownText already refuses
 * control characters.
 */
export const commentBodySchema = markdownText(COMMENT_MAX).refine((v) => v.trim().length > 0, {
  message: 'Write a comment.',
});

export const REVIEW_ACTIONS = ['submit', 'request-changes', 'endorse', 'reopen'] as const;
export const reviewActionSchema = z.enum(REVIEW_ACTIONS, {
  message: 'Choose submit, request-changes, endorse or reopen.',
});
export type ReviewAction = z.infer<typeof reviewActionSchema>;

/** Words a teacher reads for each step. */
export const REVIEW_ACTION_LABELS: Record<ReviewAction, string> = {
  submit: 'Sent for review',
  'request-changes': 'Changes requested',
  endorse: 'Endorsed',
  reopen: 'Reopened',
};

/** `POST /api/units/:id/review`. A request for changes must say what. */
export const reviewStepSchema = z
  .object(
    {
      action: reviewActionSchema,
      version: versionSchema,
      comment: commentBodySchema.optional(),
    },
    BODY,
  )
  .superRefine((v, ctx) => {
    if (v.action === 'request-changes' && v.comment === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['comment'],
        message: 'Say what should change.',
      });
    }
  });
export type ReviewStep = z.infer<typeof reviewStepSchema>;

/** `POST /api/units/:id/comments`. */
export const commentCreateSchema = z.object(
  {
    body: commentBodySchema,
    lessonId: uuidSchema.optional(),
  },
  BODY,
);
export type CommentCreate = z.infer<typeof commentCreateSchema>;

export const commentSchema = z.object({
  id: z.string(),
  /** Markdown as written; shown sanitised. */
  body: z.string(),
  author: z.object({ id: z.string(), name: z.string() }).nullable(),
  /** ISO 8601 with offset. */
  at: z.string(),
  lessonId: z.string().nullable(),
  /** The review step it came with, if any. */
  step: reviewActionSchema.nullable(),
});
export type UnitComment = z.infer<typeof commentSchema>;
export const commentListSchema = z.object({ comments: z.array(commentSchema) });

/** An empty query parameter means "no filter". */
const blank = (v: unknown) => (v === '' ? undefined : v);
const queryNumber = (schema: z.ZodType<number, number>) =>
  z.preprocess(blank, z.coerce.number({ message: 'Use a whole number.' }).pipe(schema)).optional();

/** `GET /api/review/queue?yearLevel=&term=&status=`. */
export const reviewQueueQuerySchema = z.object({
  yearLevel: queryNumber(yearLevelSchema),
  term: queryNumber(termSchema),
  /** in-review (the default: what waits for a decision) or changes-requested. */
  status: z.preprocess(
    blank,
    z
      .enum(['in-review', 'changes-requested'], {
        message: 'Choose in-review or changes-requested.',
      })
      .default('in-review'),
  ),
});
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

export const queueRowSchema = z.object({
  id: z.string(),
  title: z.string(),
  yearLevel: z.number(),
  term: z.number().nullable(),
  status: unitStatusSchema,
  owner: z.object({ id: z.string(), name: z.string() }),
  lessonCount: z.number(),
  /** When it was sent for review, ISO 8601 with offset. */
  waitingSince: z.string(),
  /** Whole days since then. */
  daysWaiting: z.number(),
  version: z.number(),
});
export type QueueRow = z.infer<typeof queueRowSchema>;
export const reviewQueueSchema = z.object({ units: z.array(queueRowSchema) });

/** A lesson's prep as the reviewer sees it: groups, shortfalls and pack-away. */
export const lessonPrepSummarySchema = z.object({
  id: z.string(),
  title: z.string(),
  date: z.string(),
  className: z.string(),
  /** Null when the lesson cannot be planned yet (see `problems`). */
  groups: z.number().nullable(),
  shortfalls: z.array(z.object({ partCode: z.string(), name: z.string(), missing: z.number() })),
  packAwayMinutes: z.number().nullable(),
  plannedMinutes: z.number().nullable(),
  windowMinutes: z.number().nullable(),
  problems: z.array(z.string()),
});
export type LessonPrepSummary = z.infer<typeof lessonPrepSummarySchema>;

/** `GET /api/review/units/:id`: the unit, its lessons' prep and what the reviewer may do. */
export const reviewUnitSchema = z.object({
  unit: unitSchema,
  lessons: z.array(lessonPrepSummarySchema),
  /** The steps the signed-in person may take now. */
  actions: z.array(reviewActionSchema),
});
export type ReviewUnit = z.infer<typeof reviewUnitSchema>;

/** `GET /api/review/summary`: the lead's Home. */
export const reviewSummarySchema = z.object({
  waiting: z.number(),
  oldest: z.array(queueRowSchema),
  term: z.object({ number: z.number(), name: z.string(), year: z.number() }).nullable(),
  frameworks: z.array(
    z.object({ id: z.string(), name: z.string(), outcomes: z.number(), gaps: z.number() }),
  ),
});
export type ReviewSummary = z.infer<typeof reviewSummarySchema>;

export const COVERAGE_STATUSES = ['any', 'endorsed'] as const;

/** `GET /api/coverage` and `/api/coverage.csv`. */
export const coverageQuerySchema = z.object({
  frameworkId: uuidSchema,
  yearLevel: queryNumber(yearLevelSchema),
  term: queryNumber(termSchema),
  status: z.preprocess(
    blank,
    z.enum(COVERAGE_STATUSES, { message: 'Choose endorsed or any.' }).default('any'),
  ),
});
export type CoverageQuery = z.infer<typeof coverageQuerySchema>;

export const coverageColumnSchema = z.object({ yearLevel: z.number(), term: z.number() });
export type CoverageColumn = z.infer<typeof coverageColumnSchema>;

export const coverageUnitSchema = z.object({
  id: z.string(),
  title: z.string(),
  status: unitStatusSchema,
});
export type CoverageUnit = z.infer<typeof coverageUnitSchema>;

export const coverageSchema = z.object({
  framework: z.object({ id: z.string(), name: z.string() }),
  columns: z.array(coverageColumnSchema),
  outcomes: z.array(
    z.object({
      id: z.string(),
      code: z.string(),
      description: z.string(),
      /** How the framework groups its outcomes (its strand; '' when it has none). */
      strand: z.string(),
      cells: z.array(coverageColumnSchema.extend({ units: z.array(coverageUnitSchema) })),
    }),
  ),
});
export type Coverage = z.infer<typeof coverageSchema>;
export type CoverageOutcome = Coverage['outcomes'][number];
