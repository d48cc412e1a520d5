/**
 * Kit types (a named parts list), their parts, tubs (the physical kits) and pack-away audits.
 * Used by the server and the client; the CSV importer checks rows with `partInputSchema` too.
 */
import * as z from 'zod';
import { VERSION_MAX, multiLine, singleLine } from './text.js';
import { uuidSchema, whole } from './common.js';
import { TUB_STATUSES } from '../definitions.js';

export { TUB_STATUSES };

export const PART_CATEGORIES = [
  'controller',
  'motor',
  'sensor',
  'display',
  'structure',
  'connector',
  'axle',
  'wheel',
  'gear',
  'plate',
  'figure',
  'cable',
  'other',
] as const;
export const partCategorySchema = z.enum(PART_CATEGORIES, {
  error: `Pick a category: ${PART_CATEGORIES.join(', ')}.`,
});
export type PartCategory = z.infer<typeof partCategorySchema>;

/** Most of one part a tub may hold; a classroom tub holds a few hundred pieces in all. */
export const MAX_PART_QTY = 10_000;
/** Most lines a parts list may have (the CSV limit of API.md). */
export const MAX_PARTS = 5_000;

/** Optional text: blank becomes null. */
function optionalText(max: number, what: string) {
  return singleLine({ error: `The ${what} must be text.` })
    .trim()
    .max(max, { error: `The ${what} is at most ${max} characters.` })
    .nullish()
    .transform((v) => (v ? v : null));
}

/** The version a record was read at, sent back with every edit. */
export const versionSchema = z
  .number({ error: 'Send the version you read.' })
  .refine((v) => Number.isInteger(v) && v >= 1 && v <= VERSION_MAX, {
    error: 'Send the version you read.',
  });

/**
 * Issues for values listed twice, naming the earlier line. Runs even when some lines have other
 * problems (`when`), so every issue is listed at once; lines of a bad shape are skipped.
 */
function noRepeats(key: string, message: (value: string, firstIndex: number) => string) {
  return [
    (lines: unknown[], ctx: z.RefinementCtx) => {
      const first = new Map<string, number>();
      lines.forEach((line, i) => {
        const raw =
          line && typeof line === 'object' ? (line as Record<string, unknown>)[key] : undefined;
        if (typeof raw !== 'string' || !raw.trim()) return;
        const value = raw.trim();
        const at = first.get(value);
        if (at === undefined) first.set(value, i);
        else ctx.addIssue({ code: 'custom', path: [i, key], message: message(value, at) });
      });
    },
    { when: (payload: { value: unknown }) => Array.isArray(payload.value) },
  ] as const;
}

export const kitTypeCreateSchema = z.object({
  name: singleLine({ error: 'Enter a name for the kit type.' })
    .trim()
    .min(1, { error: 'Enter a name for the kit type.' })
    .max(80, { error: 'A kit type name is at most 80 characters.' }),
  description: multiLine({ error: 'The description must be text.' })
    .trim()
    .max(2000, { error: 'A description is at most 2000 characters.' })
    .default(''),
});
export type KitTypeCreate = z.input<typeof kitTypeCreateSchema>;

export const kitTypeUpdateSchema = z
  .object({
    version: versionSchema,
    name: kitTypeCreateSchema.shape.name.optional(),
    description: multiLine({ error: 'The description must be text.' })
      .trim()
      .max(2000, { error: 'A description is at most 2000 characters.' })
      .optional(),
  })
  .refine((v) => v.name !== undefined || v.description !== undefined, {
    error: 'Change the name or the description.',
  });
export type KitTypeUpdate = z.input<typeof kitTypeUpdateSchema>;

const partFields = {
  code: singleLine({ error: 'Enter a part code.' })
    .trim()
    .min(1, { error: 'Enter a part code.' })
    .max(64, { error: 'A part code is at most 64 characters.' }),
  name: singleLine({ error: 'Enter a part name.' })
    .trim()
    .min(1, { error: 'Enter a part name.' })
    .max(200, { error: 'A part name is at most 200 characters.' }),
  colour: optionalText(60, 'colour'),
  category: partCategorySchema,
  /** How many one full tub holds. */
  qty: whole(0, MAX_PART_QTY),
  compartment: optionalText(60, 'compartment'),
  /** Whether the part is small enough to be a choking hazard. */
  small: z.boolean({ error: 'Answer yes or no.' }),
  /** Minutes from empty to full for a rechargeable part; null when it is not rechargeable. */
  chargeMinutes: whole(1, 1440)
    .nullish()
    .transform((v) => v ?? null),
};

/** One line of a parts list as sent (PUT parts, or a CSV row after its cells are read). */
export const partInputSchema = z.object({
  ...partFields,
  category: partFields.category.default('other'),
  small: partFields.small.default(false),
});
export type PartInput = z.input<typeof partInputSchema>;
export type PartValues = z.output<typeof partInputSchema>;

/** PUT /api/kit-types/:id/parts: the whole list in order, codes unique. */
export const partsReplaceSchema = z.object({
  version: versionSchema,
  parts: z
    .array(partInputSchema)
    .max(MAX_PARTS, { error: `A parts list has at most ${MAX_PARTS} lines.` })
    .superRefine(...noRepeats('code', (code, at) => `Code ${code} is already on line ${at + 1}.`)),
});
export type PartsReplace = z.input<typeof partsReplaceSchema>;

/** POST /api/kit-types/:id/parts: one part added by hand at the end of the list. */
export const partCreateSchema = z.object({
  version: versionSchema,
  part: partInputSchema,
});
export type PartCreate = z.input<typeof partCreateSchema>;

/** PATCH /api/kit-types/:id/parts/:partId: any fields of one part, with the kit type's version. */
export const partUpdateSchema = z
  .object(partFields)
  .partial()
  .extend({ version: versionSchema })
  .refine(
    (v) =>
      Object.keys(v).some(
        (k) => k !== 'version' && (v as Record<string, unknown>)[k] !== undefined,
      ),
    {
      error: 'Change at least one field.',
    },
  );

export const partSchema = z.object({
  id: z.string(),
  code: z.string(),
  name: z.string(),
  colour: z.string().nullable(),
  category: partCategorySchema,
  qty: z.int(),
  compartment: z.string().nullable(),
  small: z.boolean(),
  chargeMinutes: z.int().nullable(),
  /** Whether a photo is stored for the part's code. */
  hasPhoto: z.boolean(),
});
export type Part = z.infer<typeof partSchema>;

export const kitTypeSummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  version: z.int(),
  partCount: z.int(),
  /** Pieces in one full tub (sum of the quantities). */
  pieceCount: z.int(),
  tubCount: z.int(),
  lessonCount: z.int(),
});
export type KitTypeSummary = z.infer<typeof kitTypeSummarySchema>;
export const kitTypeSchema = kitTypeSummarySchema.extend({ parts: z.array(partSchema) });
export type KitType = z.infer<typeof kitTypeSchema>;
export const kitTypeResponseSchema = z.object({ kitType: kitTypeSchema });
export const kitTypeListSchema = z.object({ kitTypes: z.array(kitTypeSummarySchema) });
export const partsImportResultSchema = z.object({ imported: z.int() });

/** Photo uploads: the types accepted (sniffed from the bytes) and the size limit. */
export const PHOTO_TYPES = ['image/png', 'image/jpeg', 'image/webp'] as const;
export const MAX_PHOTO_BYTES = 5 * 1024 * 1024;
export const MAX_CSV_BYTES = 2 * 1024 * 1024;

export const tubStatusSchema = z.enum(TUB_STATUSES, {
  error: 'Pick a status: ready, needs-sorting, on-loan or retired.',
});
export type TubStatus = z.infer<typeof tubStatusSchema>;
export const TUB_STATUS_LABELS: Record<TubStatus, string> = {
  ready: 'Ready',
  'needs-sorting': 'Needs sorting',
  'on-loan': 'On loan',
  retired: 'Retired',
};

const tubLabel = singleLine({ error: 'Enter a label for the tub, like Tub 3.' })
  .trim()
  .min(1, { error: 'Enter a label for the tub, like Tub 3.' })
  .max(60, { error: 'A tub label is at most 60 characters.' });

/** POST /api/tubs. A tub arriving from elsewhere should be sent with status `needs-sorting`. */
export const tubCreateSchema = z.object({
  kitTypeId: uuidSchema,
  label: tubLabel,
  controllerLabel: optionalText(60, 'controller label'),
  status: tubStatusSchema.default('ready'),
});
export type TubCreate = z.input<typeof tubCreateSchema>;

export const tubUpdateSchema = z
  .object({
    version: versionSchema,
    label: tubLabel.optional(),
    controllerLabel: optionalText(60, 'controller label').optional(),
    status: tubStatusSchema.optional(),
  })
  .refine(
    (v) => v.label !== undefined || v.controllerLabel !== undefined || v.status !== undefined,
    {
      error: 'Change the label, the controller label or the status.',
    },
  );
export type TubUpdate = z.input<typeof tubUpdateSchema>;

const countLine = z.object({
  partCode: singleLine({ error: 'Pick a part.' }).trim().min(1, { error: 'Pick a part.' }).max(64),
  count: whole(1, MAX_PART_QTY),
});
const countLines = z
  .array(countLine)
  .max(MAX_PARTS, { error: `At most ${MAX_PARTS} lines.` })
  .superRefine(...noRepeats('partCode', (code) => `${code} is listed twice.`))
  .default([]);

/** POST /api/tubs/:id/audits: what was found missing at pack-away and what turned up again. */
export const tubAuditCreateSchema = z.object({
  lessonId: uuidSchema.nullish(),
  missing: countLines,
  found: countLines,
  note: multiLine({ error: 'The note must be text.' })
    .trim()
    .max(2000, { error: 'A note is at most 2000 characters.' })
    .default(''),
});
export type TubAuditCreate = z.input<typeof tubAuditCreateSchema>;

export const missingLineSchema = z.object({
  partCode: z.string(),
  partName: z.string(),
  count: z.int(),
});
export type MissingLine = z.infer<typeof missingLineSchema>;

export const tubSummarySchema = z.object({
  id: z.string(),
  kitTypeId: z.string(),
  kitTypeName: z.string(),
  label: z.string(),
  controllerLabel: z.string().nullable(),
  status: tubStatusSchema,
  /** Whether the tub must be sorted and counted before it is used. */
  needsSorting: z.boolean(),
  version: z.int(),
  /** Known missing parts in parts-list order. */
  missing: z.array(missingLineSchema),
  missingLines: z.int(),
  missingPieces: z.int(),
  /** How many lessons book the tub (a booked tub cannot be deleted). */
  lessonCount: z.int(),
});
export type TubSummary = z.infer<typeof tubSummarySchema>;
/** GET /api/tubs/:id adds `stock`: part code → pieces in the tub (kit qty − missing, ≥ 0). */
export const tubSchema = tubSummarySchema.extend({ stock: z.record(z.string(), z.int()) });
export type Tub = z.infer<typeof tubSchema>;
export const tubResponseSchema = z.object({ tub: tubSchema });
export const tubListSchema = z.object({ tubs: z.array(tubSummarySchema) });

export const tubAuditSchema = z.object({
  id: z.string(),
  tubId: z.string(),
  lessonId: z.string().nullable(),
  userName: z.string().nullable(),
  missing: z.array(z.object({ partCode: z.string(), count: z.int() })),
  found: z.array(z.object({ partCode: z.string(), count: z.int() })),
  note: z.string(),
  /** ISO 8601 with offset. */
  createdAt: z.string(),
});
export type TubAudit = z.infer<typeof tubAuditSchema>;
export const tubAuditListSchema = z.object({ audits: z.array(tubAuditSchema) });
export type PartUpdate = z.output<typeof partUpdateSchema>;
