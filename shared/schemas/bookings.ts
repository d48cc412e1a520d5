/**
 * The school-wide bookings view (`GET /api/bookings?from=&to=`): which tubs each lesson books,
 * day by day, with double bookings marked.
 */
import * as z from 'zod';
import { schoolDate } from './text.js';
import { bookingConflictSchema } from './lessons.js';

/** The longest range one request may ask for: a school term and a little more. */
export const BOOKINGS_MAX_DAYS = 100;

const DAY_MS = 86_400_000;
const utc = (date: string) => Date.parse(`${date}T00:00:00Z`);

/** `from` included, `to` excluded, both local dates of the school. */
export const bookingsQuerySchema = z
  .object({
    from: schoolDate('Give the first day as a date that exists, like 2026-07-27.'),
    to: schoolDate('Give the day after the last as a date that exists, like 2026-08-03.'),
  })
  .refine((q) => utc(q.to) > utc(q.from), {
    path: ['to'],
    error: 'The end date must come after the start date.',
  })
  .refine((q) => utc(q.to) - utc(q.from) <= BOOKINGS_MAX_DAYS * DAY_MS, {
    path: ['to'],
    error: `Ask for at most ${BOOKINGS_MAX_DAYS} days at a time.`,
  });

export const bookingSchema = z.object({
  lessonId: z.string(),
  lessonTitle: z.string(),
  /** Empty when the actor may not read the lesson (a colleague's private unit, or any for admins). */
  unitTitle: z.string(),
  /** Whether the actor may open the lesson (the screen links it only then). */
  readable: z.boolean(),
  className: z.string(),
  /** Local date-times of the school, `2026-07-28T11:10`. */
  startsAt: z.string(),
  endsAt: z.string(),
  tubs: z.array(z.object({ id: z.string(), label: z.string(), kitTypeName: z.string() })),
  /** True when another lesson at an overlapping time books one of these tubs. */
  conflict: z.boolean(),
  /** Those other lessons and the tubs they share (empty when `conflict` is false). */
  conflicts: z.array(bookingConflictSchema),
});
export type Booking = z.infer<typeof bookingSchema>;

export const bookingsResponseSchema = z.object({
  days: z.array(z.object({ date: z.string(), bookings: z.array(bookingSchema) })),
});
export type BookingsResponse = z.infer<typeof bookingsResponseSchema>;
