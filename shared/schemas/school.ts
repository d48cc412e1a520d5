/**
 * School settings: name, IANA timezone, paper size, the prep allowances of PREP-RULES.md, and the
 * calendar (terms, bell periods, non-teaching days). Used by the server and the client alike.
 */
import * as z from 'zod';
import { VERSION_MAX, singleLine } from './text.js';
import { uuidSchema, whole } from './common.js';
import { DEFAULT_PREP } from '../definitions.js';
import { isIanaTimeZone, timeZoneNames } from '../prep/time.js';

export const PAPER_SIZES = ['A4', 'Letter'] as const;
export const paperSizeSchema = z.enum(PAPER_SIZES, { error: 'Pick A4 or Letter.' });
export type PaperSize = z.infer<typeof paperSizeSchema>;

export { isIanaTimeZone, timeZoneNames };

export const timeZoneSchema = singleLine({ error: 'Pick a time zone, like Australia/Adelaide.' })
  .trim()
  .refine(isIanaTimeZone, { error: 'Pick a time zone from the list, like Australia/Adelaide.' });

/** The prep allowances and their defaults (PREP-RULES.md, "settings"; shared/definitions). */
export { DEFAULT_PREP };
export type PrepAllowances = { -readonly [K in keyof typeof DEFAULT_PREP]: number };

const d = DEFAULT_PREP;
// Upper bounds match the prep engine's input schema, so whatever is saved here it accepts.
export const prepAllowancesSchema = z.object({
  setOutMinutes: whole(0, 480).default(d.setOutMinutes),
  packAwayBaseMinutes: whole(0, 480).default(d.packAwayBaseMinutes),
  packAwaySecondsPerPiece: whole(0, 3600).default(d.packAwaySecondsPerPiece),
  pullBaseMinutes: whole(0, 1440).default(d.pullBaseMinutes),
  pullSecondsPerLine: whole(0, 3600).default(d.pullSecondsPerLine),
  pullSecondsPerPiece: whole(0, 3600).default(d.pullSecondsPerPiece),
  sparesPercent: whole(0, 50).default(d.sparesPercent),
  chargeBufferMinutes: whole(0, 1440).default(d.chargeBufferMinutes),
  sortMinutesPerTub: whole(0, 1440).default(d.sortMinutesPerTub),
  deviceCheckMinutesPerDevice: whole(0, 60).default(d.deviceCheckMinutesPerDevice),
});

/** Whether `s` is a real calendar date written `YYYY-MM-DD`. */
export function isCalendarDate(s: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(s);
  if (!m) return false;
  const [y, mo, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const t = new Date(Date.UTC(y, mo - 1, day));
  return t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === day;
}

const dateSchema = z
  .string({ error: 'Enter a date like 2026-07-20.' })
  .refine(isCalendarDate, { error: 'Enter a date like 2026-07-20.' });
/** `HH:MM` on the 24-hour clock; such strings compare in time order. */
const CLOCK = /^([01]\d|2[0-3]):[0-5]\d$/;
const clockSchema = z
  .string({ error: 'Enter a time like 09:10.' })
  .regex(CLOCK, { error: 'Enter a time like 09:10 (24-hour clock).' });
const label = (what: string, max: number) =>
  singleLine({ error: `Enter a name for the ${what}.` })
    .trim()
    .min(1, { error: `Enter a name for the ${what}.` })
    .max(max, { error: `A ${what} name is at most ${max} characters.` });

export const termSchema = z
  .object({
    /** Present for a term that exists; left out for a new one. */
    id: uuidSchema.optional(),
    name: label('term', 60),
    startsOn: dateSchema,
    endsOn: dateSchema,
  })
  .refine(
    (t) => !isCalendarDate(t.startsOn) || !isCalendarDate(t.endsOn) || t.startsOn <= t.endsOn,
    {
      path: ['endsOn'],
      error: 'The term must end on or after the day it starts.',
    },
  );

export const bellPeriodSchema = z
  .object({
    id: uuidSchema.optional(),
    name: label('period', 40),
    startsAt: clockSchema,
    endsAt: clockSchema,
  })
  .refine((p) => !CLOCK.test(p.startsAt) || !CLOCK.test(p.endsAt) || p.startsAt < p.endsAt, {
    path: ['endsAt'],
    error: 'The period must end after it starts.',
  });

export const nonTeachingDaySchema = z.object({
  id: uuidSchema.optional(),
  date: dateSchema,
  reason: singleLine({ error: 'Enter a reason.' })
    .trim()
    .max(200, { error: 'A reason is at most 200 characters.' })
    .default(''),
});

export type Term = { id: string; name: string; startsOn: string; endsOn: string };
export type BellPeriod = { id: string; name: string; startsAt: string; endsAt: string };
export type NonTeachingDay = { id: string; date: string; reason: string };

/** Adds an issue for every item that overlaps an earlier one; items of a bad shape are skipped. */
function noOverlaps(
  items: unknown,
  read: (x: Record<string, unknown>) => { from: string; to: string; name: string } | null,
  inclusive: boolean,
  path: string,
  ctx: z.RefinementCtx,
): void {
  if (!Array.isArray(items)) return;
  const spans = items.map((x) =>
    x && typeof x === 'object' ? read(x as Record<string, unknown>) : null,
  );
  spans.forEach((a, i) => {
    if (!a) return;
    const b = spans
      .slice(0, i)
      .find(
        (o) => o && (inclusive ? a.from <= o.to && o.from <= a.to : a.from < o.to && o.from < a.to),
      );
    if (b)
      ctx.addIssue({
        code: 'custom',
        path: [path, i],
        message: `Overlaps ${b.name} (${b.from} to ${b.to}).`,
      });
  });
}

const text = (v: unknown) => (typeof v === 'string' ? v.trim() : '');
const termSpan = (t: Record<string, unknown>) =>
  isCalendarDate(text(t['startsOn'])) && isCalendarDate(text(t['endsOn']))
    ? { from: text(t['startsOn']), to: text(t['endsOn']), name: text(t['name']) || 'another term' }
    : null;
const periodSpan = (p: Record<string, unknown>) =>
  CLOCK.test(text(p['startsAt'])) && CLOCK.test(text(p['endsAt']))
    ? {
        from: text(p['startsAt']),
        to: text(p['endsAt']),
        name: text(p['name']) || 'another period',
      }
    : null;

/**
 * Rules between items: terms may not share a day, periods may not overlap (one may start as
 * another ends), a date is a non-teaching day once. They run even when a field is wrong
 * (`when`), so the form shows every problem at once.
 */
function crossChecks(v: Record<string, unknown>, ctx: z.RefinementCtx): void {
  noOverlaps(v['terms'], termSpan, true, 'terms', ctx);
  noOverlaps(v['periods'], periodSpan, false, 'periods', ctx);
  const days = Array.isArray(v['nonTeachingDays']) ? (v['nonTeachingDays'] as unknown[]) : [];
  const dates = days.map((x) =>
    x && typeof x === 'object' ? text((x as Record<string, unknown>)['date']) : '',
  );
  dates.forEach((date, i) => {
    if (date && dates.indexOf(date) < i) {
      ctx.addIssue({
        code: 'custom',
        path: ['nonTeachingDays', i, 'date'],
        message: `${date} is listed twice.`,
      });
    }
  });
}

/** The whole settings form, sent by PUT /api/school with the `version` it was read at. */
export const schoolSettingsUpdateSchema = z
  .object({
    version: z
      .number({ error: 'Send the version you read.' })
      .refine((v) => Number.isInteger(v) && v >= 1 && v <= VERSION_MAX, {
        error: 'Send the version you read.',
      }),
    name: singleLine({ error: 'Enter the school name.' })
      .trim()
      .min(1, { error: 'Enter the school name.' })
      .max(120, { error: 'A school name is at most 120 characters.' }),
    timezone: timeZoneSchema,
    paperSize: paperSizeSchema,
    prep: prepAllowancesSchema.prefault({}),
    terms: z.array(termSchema).max(12, { error: 'At most 12 terms.' }).default([]),
    periods: z.array(bellPeriodSchema).max(20, { error: 'At most 20 periods.' }).default([]),
    nonTeachingDays: z
      .array(nonTeachingDaySchema)
      .max(366, { error: 'At most 366 non-teaching days.' })
      .default([]),
  })
  .superRefine((v, ctx) => crossChecks(v as unknown as Record<string, unknown>, ctx), {
    when: (payload) => typeof payload.value === 'object' && payload.value !== null,
  });
export type SchoolSettingsUpdate = z.input<typeof schoolSettingsUpdateSchema>;

/** GET /api/school: everything above with defaults filled in, terms and days by date. */
export const schoolSettingsSchema = z.object({
  id: z.string(),
  name: z.string(),
  timezone: z.string(),
  paperSize: paperSizeSchema,
  prep: prepAllowancesSchema,
  terms: z.array(
    z.object({ id: z.string(), name: z.string(), startsOn: z.string(), endsOn: z.string() }),
  ),
  periods: z.array(
    z.object({ id: z.string(), name: z.string(), startsAt: z.string(), endsAt: z.string() }),
  ),
  nonTeachingDays: z.array(z.object({ id: z.string(), date: z.string(), reason: z.string() })),
  version: z.int(),
});
export type SchoolSettings = z.infer<typeof schoolSettingsSchema>;
export const schoolSettingsResponseSchema = z.object({ school: schoolSettingsSchema });

export const timeZoneListSchema = z.object({ timezones: z.array(z.string()) });
