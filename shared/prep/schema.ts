/**
 * The zod schema of the prep engine's input (PREP-RULES.md, "Input"). Shapes and ranges are
 * checked here; rules that relate fields to each other (part codes, duplicate labels, times in
 * the school's zone) are in `checks.ts` and run from the same schema.
 */
import * as z from 'zod';
import { crossCheck } from './checks.js';
import { isIanaTimeZone, LOCAL_DATE_TIME } from './time.js';
import {
  ACTIVITY_KINDS,
  DEFAULT_PREP,
  MATERIAL_PER,
  TUB_STATUSES,
  type ActivityKind,
  type TubStatus,
} from '../definitions.js';

export { ACTIVITY_KINDS, MATERIAL_PER, TUB_STATUSES };

/** A whole number in [min, max] with messages a teacher or admin can read. */
function whole(min: number, max: number) {
  return z
    .int({ error: (iss) => (iss.input === undefined ? 'Required.' : 'Must be a whole number.') })
    .min(min, { error: `Must be at least ${min}.` })
    .max(max, { error: `Must be at most ${max}.` });
}

function text(max: number) {
  return z
    .string({ error: 'Must be text.' })
    .trim()
    .min(1, { error: 'Must not be empty.' })
    .max(max, { error: `Must be at most ${max} characters.` });
}

function optionalText(max: number) {
  return z
    .string({ error: 'Must be text.' })
    .trim()
    .max(max, { error: `Must be at most ${max} characters.` })
    .nullish();
}

/** A code or id compared exactly, so it is not trimmed. */
function key(max: number) {
  return z
    .string({ error: 'Must be text.' })
    .min(1, { error: 'Must not be empty.' })
    .max(max, { error: `Must be at most ${max} characters.` });
}

/** "Required." for a missing field, otherwise what the field must be. */
function shapeError(what: string) {
  return { error: (iss: { input: unknown }) => (iss.input === undefined ? 'Required.' : what) };
}

const localDateTime = z
  .string({ error: 'Must be a local date and time like 2026-07-28T11:10.' })
  .regex(LOCAL_DATE_TIME, { error: 'Must be a local date and time like 2026-07-28T11:10.' });

/**
 * Part code → count. Only the shape is checked here; the counts and codes are checked with the
 * parts list in `checks.ts`, in one pass (a `z.record` took 0.6 ms for eight tubs of 250 parts).
 */
const stockSchema = z.custom<Record<string, number>>(
  (v) => typeof v === 'object' && v !== null && !Array.isArray(v),
  { error: 'Must map part codes to counts.' },
);

export const prepPartSchema = z.object({
  code: key(64),
  name: text(200),
  colour: optionalText(60),
  category: text(60),
  compartment: optionalText(60),
  /** Whether the part is small (a choking hazard); small parts get spares. */
  small: z.boolean({ error: 'Must be true or false.' }),
  /** Minutes to charge from empty, or null for a part that is not rechargeable. */
  fullChargeMinutes: whole(1, 1440).nullable().default(null),
});

export const prepTubSchema = z.object({
  id: key(100),
  label: text(100),
  controllerLabel: optionalText(100),
  status: z.enum(TUB_STATUSES, { error: `Must be one of ${TUB_STATUSES.join(', ')}.` }),
  /** Part code → pieces in the tub (its quantity minus what is known missing). */
  stock: stockSchema.default({}),
});

export const prepMaterialSchema = z.object({
  partCode: key(64).nullish(),
  consumable: text(200).nullish(),
  qty: whole(0, 10_000),
  per: z.enum(MATERIAL_PER, { error: `Must be one of ${MATERIAL_PER.join(', ')}.` }),
  /** Whether the pieces come back; defaults to true for a part, false for a consumable. */
  returnable: z.boolean({ error: 'Must be true or false.' }).nullish(),
});

export const prepActivitySchema = z.object({
  title: text(200),
  kind: z.enum(ACTIVITY_KINDS, { error: `Must be one of ${ACTIVITY_KINDS.join(', ')}.` }),
  minutes: whole(0, 480),
  materials: z
    .array(prepMaterialSchema, shapeError('Must be a list.'))
    .max(2000, { error: 'At most 2000 materials.' }),
});

/** The school settings of PREP-RULES.md with their defaults (one list: shared/definitions). */
export const DEFAULT_PREP_SETTINGS = DEFAULT_PREP;

const d = DEFAULT_PREP_SETTINGS;
// Upper bounds are generous; they only stop a typing error from producing a day-long task.
export const prepSettingsSchema = z
  .object({
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
  })
  .prefault({});

export const prepBaseSchema = z.object({
  timezone: z
    .string({ error: 'Must be an IANA time zone name like Australia/Adelaide.' })
    .refine(isIanaTimeZone, { error: 'Must be an IANA time zone name like Australia/Adelaide.' }),
  lesson: z.object(
    { startsAt: localDateTime, endsAt: localDateTime, groupSize: whole(1, 8) },
    shapeError('Must be an object.'),
  ),
  class: z.object(
    { studentCount: whole(1, 60), devices: whole(0, 200) },
    shapeError('Must be an object.'),
  ),
  parts: z
    .array(prepPartSchema, shapeError('Must be a list.'))
    .max(5000, { error: 'At most 5000 parts.' }),
  tubs: z
    .array(prepTubSchema, shapeError('Must be a list.'))
    .max(200, { error: 'At most 200 tubs.' }),
  activities: z
    .array(prepActivitySchema, shapeError('Must be a list.'))
    .max(100, { error: 'At most 100 activities.' }),
  settings: prepSettingsSchema,
  earlierSameDay: z
    .array(
      z.object({
        endsAt: localDateTime,
        tubIds: z.array(key(100)).max(200, { error: 'At most 200 tubs.' }),
      }),
    )
    .max(50, { error: 'At most 50 earlier lessons.' })
    .default([]),
});

/**
 * The prep engine's input schema: shapes and ranges, then every rule between fields. Parse
 * with `validatePrepInput`, which also lists the cross-field problems when a shape is wrong.
 */
export const prepInputSchema = prepBaseSchema.superRefine((value, ctx) => {
  for (const issue of crossCheck(value)) ctx.addIssue({ code: 'custom', ...issue });
});

/** What a caller passes in (settings and defaults may be left out). */
export type PrepInput = z.input<typeof prepInputSchema>;
/** The input after validation, with every default filled in. */
export type ValidPrepInput = z.output<typeof prepInputSchema>;
export type PrepPart = ValidPrepInput['parts'][number];
export type PrepTub = ValidPrepInput['tubs'][number];
export type PrepActivity = ValidPrepInput['activities'][number];
export type PrepMaterial = PrepActivity['materials'][number];
export type PrepSettings = ValidPrepInput['settings'];
export type { ActivityKind, TubStatus };
