/**
 * Outcomes frameworks (a school's curriculum outcomes, imported from CSV) and their outcomes:
 * request bodies, the CSV row rules and the records the API answers with.
 */
import * as z from 'zod';
import { multiLine, singleLine } from './text.js';
import { uuidSchema } from './common.js';

/** The message when a request body is not a JSON object at all. */
const BODY = { message: 'Send the details as a JSON object.' };

/** `POST /api/outcomes/frameworks`. */
export const frameworkCreateSchema = z.object(
  {
    name: singleLine({ message: 'Enter a name.' })
      .trim()
      .min(1, { message: 'Enter a name.' })
      .max(200, { message: 'Use at most 200 characters.' }),
  },
  BODY,
);
export type FrameworkCreate = z.infer<typeof frameworkCreateSchema>;

/** Columns of the outcomes CSV (header names in any order, any case). */
export const OUTCOME_CSV_COLUMNS = ['code', 'description', 'strand', 'year_band'] as const;
export const OUTCOME_CSV_REQUIRED = ['code', 'description'] as const;
export const OUTCOME_CSV_MAX_ROWS = 5000;
export const OUTCOME_CSV_MAX_BYTES = 2 * 1024 * 1024;

/** One row of the outcomes CSV, after the header has mapped its columns. */
export const outcomeRowSchema = z.object({
  code: singleLine()
    .trim()
    .min(1, { message: 'Enter a code.' })
    .max(40, { message: 'A code is at most 40 characters.' }),
  description: multiLine()
    .trim()
    .min(1, { message: 'Enter a description.' })
    .max(2000, { message: 'A description is at most 2000 characters.' }),
  strand: singleLine().trim().max(200, { message: 'A strand is at most 200 characters.' }),
  yearBand: singleLine().trim().max(40, { message: 'A year band is at most 40 characters.' }),
});
export type OutcomeRow = z.infer<typeof outcomeRowSchema>;

const blankToUndefined = (v: unknown) => (v === '' ? undefined : v);

/** `GET /api/outcomes?frameworkId=&q=&yearBand=`: browse and search the school's outcomes. */
export const outcomeQuerySchema = z.object({
  frameworkId: z.preprocess(blankToUndefined, uuidSchema.optional()),
  /** Words looked for in the code, description and strand. */
  q: z.preprocess(
    blankToUndefined,
    singleLine().trim().max(200, { message: 'Use at most 200 characters.' }).optional(),
  ),
  yearBand: z.preprocess(
    blankToUndefined,
    singleLine().trim().max(40, { message: 'Use at most 40 characters.' }).optional(),
  ),
});
export type OutcomeQuery = z.infer<typeof outcomeQuerySchema>;

export const outcomeSchema = z.object({
  id: z.string(),
  frameworkId: z.string(),
  code: z.string(),
  description: z.string(),
  strand: z.string(),
  yearBand: z.string(),
});
export type Outcome = z.infer<typeof outcomeSchema>;
/** At most this many outcomes come back from one browse; `truncated` says when more matched. */
export const OUTCOME_PAGE_MAX = 500;
export const outcomeListSchema = z.object({
  outcomes: z.array(outcomeSchema),
  truncated: z.boolean(),
});

export const frameworkSchema = z.object({
  id: z.string(),
  name: z.string(),
  outcomeCount: z.number(),
  /** The distinct year bands of its outcomes, for a filter. */
  yearBands: z.array(z.string()),
  createdAt: z.string(),
});
export type Framework = z.infer<typeof frameworkSchema>;
export const frameworkListSchema = z.object({ frameworks: z.array(frameworkSchema) });

/** The answer to an import: how many rows, and what changed against the list before. */
export const outcomeImportResultSchema = z.object({
  imported: z.number(),
  added: z.number(),
  updated: z.number(),
  removed: z.number(),
});
export type OutcomeImportResult = z.infer<typeof outcomeImportResultSchema>;
