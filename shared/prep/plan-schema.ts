/**
 * The prep plan as the server serves it (PREP-RULES.md, "Output"). The client parses responses
 * with this schema; the engine's tests parse every generated plan with it too, so a count can
 * never be negative, fractional or NaN. Field names are part of the API.
 */
import * as z from 'zod';
import { prepTickSchema } from '../schemas/prep-ticks.js';

const count = z.int().min(0);
/** ISO 8601 with the zone's offset, seconds included: `2026-07-28T11:54:00+09:30`. */
const instant = z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[+-]\d{2}:\d{2}$/);

export const prepSourceSchema = z.object({ tub: z.string(), qty: count });

export const prepLineSchema = z.object({
  partCode: z.string(),
  needed: count,
  allocated: count,
  /** Where the allocated pieces come from, home tub first. */
  sources: z.array(prepSourceSchema),
});

export const prepConsumableSchema = z.object({ name: z.string(), qty: count });

export const prepGroupSchema = z.object({
  number: z.int().min(1),
  size: z.int().min(1),
  /** Label of the group's home tub, null with no usable tub. */
  homeTub: z.string().nullable(),
  controllerLabel: z.string().nullable(),
  lines: z.array(prepLineSchema),
  consumables: z.array(prepConsumableSchema),
  /** Every allocated piece of the group. */
  pieces: count,
  /** Allocated pieces that come back at pack-away (P_g of R8). */
  returnablePieces: count,
});

export const prepShortfallSchema = z.object({
  partCode: z.string(),
  where: z.enum(['group', 'class']),
  group: z.int().min(1).optional(),
  needed: count,
  allocated: count,
  message: z.string(),
});

export const prepBorrowSchema = z.object({
  group: z.int().min(1),
  partCode: z.string(),
  qty: z.int().min(1),
  fromTub: z.string(),
  homeTub: z.string(),
  /** The return map entry: `Group 3: return 2 × Pin to Tub 2.` */
  message: z.string(),
});

export const prepSuggestionSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('groups'),
    groups: z.int().min(1),
    sizes: z.array(z.int().min(1)),
    message: z.string(),
  }),
  z.object({
    kind: z.literal('part'),
    partCode: z.string(),
    usable: count,
    needed: count,
    message: z.string(),
  }),
]);

export const WARNING_CODES = [
  'tub-unusable',
  'devices-short',
  'overrun',
  'spares-short',
  'recharge-gap',
  // Added by the server (PREP-RULES.md, "Across lessons"), never by the engine.
  'booking-conflict',
] as const;

export const prepWarningSchema = z.object({ code: z.enum(WARNING_CODES), message: z.string() });

export const prepSegmentSchema = z.object({
  label: z.string(),
  kind: z.enum(['set-out', 'activity', 'buffer', 'pack-away']),
  startsAt: instant,
  endsAt: instant,
  minutes: count,
  /** Whether this activity runs past the start of pack-away. */
  overrun: z.boolean(),
});

export const prepTimelineSchema = z.object({
  windowMinutes: count,
  plannedMinutes: count,
  /** Window minus planned; negative when the activities overrun. */
  slackMinutes: z.int(),
  packAwayMinutes: count,
  packAwayStartsAt: instant,
  segments: z.array(prepSegmentSchema),
});

export const TASK_KINDS = ['charge', 'sort', 'pull', 'devices'] as const;

export const prepTaskSchema = z.object({
  kind: z.enum(TASK_KINDS),
  /**
   * Names the task within its lesson's plan and stays the same while counts and times change:
   * `charge:<part code>`, `sort:<tub id>`, `pull`, `devices`. Prep-task ticks are kept by it.
   */
  key: z.string(),
  label: z.string(),
  minutes: count,
  startBy: instant,
  doneBy: instant,
});

export const prepPlanSchema = z.object({
  groups: z.array(prepGroupSchema),
  classTray: z.object({
    lines: z.array(prepLineSchema),
    consumables: z.array(prepConsumableSchema),
  }),
  sparesTray: z.object({ lines: z.array(prepLineSchema) }),
  shortfalls: z.array(prepShortfallSchema),
  borrows: z.array(prepBorrowSchema),
  suggestions: z.array(prepSuggestionSchema),
  warnings: z.array(prepWarningSchema),
  timeline: prepTimelineSchema,
  tasks: z.array(prepTaskSchema),
  totals: z.object({ groups: count, pieces: count, lines: count, tubsUsed: count }),
});

export type PrepSource = z.infer<typeof prepSourceSchema>;
export type PrepLine = z.infer<typeof prepLineSchema>;
export type PrepConsumable = z.infer<typeof prepConsumableSchema>;
export type PrepGroup = z.infer<typeof prepGroupSchema>;
export type PrepShortfall = z.infer<typeof prepShortfallSchema>;
export type PrepBorrow = z.infer<typeof prepBorrowSchema>;
export type PrepSuggestion = z.infer<typeof prepSuggestionSchema>;
export type PrepWarning = z.infer<typeof prepWarningSchema>;
export type PrepWarningCode = (typeof WARNING_CODES)[number];
export type PrepSegment = z.infer<typeof prepSegmentSchema>;
export type PrepTimeline = z.infer<typeof prepTimelineSchema>;
export type PrepTask = z.infer<typeof prepTaskSchema>;
export type PrepTaskKind = (typeof TASK_KINDS)[number];
export type PrepPlan = z.infer<typeof prepPlanSchema>;

/** What a pull list shows of a part: its name, and where to find it (null when not recorded). */
export const lessonPartSchema = z.object({
  name: z.string(),
  colour: z.string().nullable(),
  compartment: z.string().nullable(),
});
export type LessonPart = z.infer<typeof lessonPartSchema>;

/**
 * `GET /api/lessons/:id/prep`: the plan of PREP-RULES.md plus, for every part code that appears
 * in it, its name (`partNames`) and its name, colour and compartment (`parts`), so a screen can
 * show a pull list without loading the kit type's whole parts list; and the tasks' ticks. A code
 * the parts list no longer has is named by itself, with no colour or compartment.
 */
export const lessonPrepSchema = prepPlanSchema.extend({
  partNames: z.record(z.string(), z.string()),
  parts: z.record(z.string(), lessonPartSchema),
  /**
   * Each group's controller in words (by group number; shared/prep/controller.ts), null when
   * there is none to name: the page never claims a controller the plan does not give.
   */
  controllers: z.record(z.string(), z.string().nullable()),
  /** The prep tasks ticked done by the lesson's teachers (by task key). */
  ticks: z.array(prepTickSchema),
});
export type LessonPrep = z.infer<typeof lessonPrepSchema>;

/** Every part code a plan mentions (trays, shortfalls, borrows, suggestions). */
export function planPartCodes(plan: PrepPlan): Set<string> {
  const codes = new Set<string>();
  for (const g of plan.groups) for (const l of g.lines) codes.add(l.partCode);
  for (const l of [...plan.classTray.lines, ...plan.sparesTray.lines]) codes.add(l.partCode);
  for (const s of plan.shortfalls) codes.add(s.partCode);
  for (const b of plan.borrows) codes.add(b.partCode);
  for (const s of plan.suggestions) if (s.kind === 'part') codes.add(s.partCode);
  return codes;
}
