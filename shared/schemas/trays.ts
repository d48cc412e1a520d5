/**
 * A group's tray during a lesson (API.md, "The group's tray and pack-away"): what the tray page
 * shows and saves, the teacher's board of every group, and the pack-away audit of the lesson.
 */
import * as z from 'zod';
import { uuidSchema } from './common.js';
import { tubAuditCreateSchema, tubAuditSchema } from './kits.js';

/** Tray tokens are base64url, at least 22 characters (API.md). */
export const TRAY_TOKEN_PATTERN = /^[A-Za-z0-9_-]{22,128}$/;
export const trayTokenSchema = z.string().regex(TRAY_TOKEN_PATTERN);

/**
 * Short codes are 8 characters of Crockford's base32 (digits and letters without I, L, O, U),
 * printed as `XXXX-XXXX`; typed in any case, with or without the dash or spaces, and with the
 * look-alikes I, L (as 1) and O (as 0) forgiven, as Crockford's encoding allows.
 */
export const TRAY_CODE_LENGTH = 8;
export function normaliseTrayCode(typed: string): string {
  return typed.toUpperCase().replace(/[\s-]/g, '').replace(/[IL]/g, '1').replace(/O/g, '0');
}
export const trayCodeSchema = z
  .string()
  .max(40)
  .transform(normaliseTrayCode)
  .pipe(
    z.string().regex(/^[0-9A-HJKMNP-TV-Z]{8}$/, { error: 'A tray code has 8 letters and digits.' }),
  );

export const traySourceSchema = z.object({ tub: z.string(), qty: z.int().min(0) });

export const trayLineSchema = z.object({
  partCode: z.string(),
  name: z.string(),
  colour: z.string().nullable(),
  compartment: z.string().nullable(),
  /** The group's allocated quantity in the plan as stored now. */
  qty: z.int().min(0),
  /** What the activities ask for; more than `qty` when the tubs fall short. */
  needed: z.int().min(0),
  /** Where the pieces come from, home tub first; another tub is a borrow. */
  sources: z.array(traySourceSchema),
  /** Whether the part is small enough to be a choking hazard. */
  small: z.boolean(),
  /** Whether the part holds a rechargeable battery. */
  rechargeable: z.boolean(),
  out: z.boolean(),
  back: z.boolean(),
  missing: z.int().min(0),
});
export type TrayLine = z.infer<typeof trayLineSchema>;

/** GET /api/trays/:token. */
export const trayViewSchema = z.object({
  lesson: z.object({
    title: z.string(),
    startsAt: z.string(),
    endsAt: z.string(),
    className: z.string(),
  }),
  group: z.object({
    number: z.int().min(1),
    size: z.int().min(1),
    homeTub: z.string().nullable(),
    controllerLabel: z.string().nullable(),
    lines: z.array(trayLineSchema),
  }),
  /** ISO 8601: the end of the lesson's school day, when the code stops working. */
  expiresAt: z.string(),
});
export type TrayView = z.infer<typeof trayViewSchema>;

/** GET /api/trays/by-code/:code. */
export const trayCodeAnswerSchema = z.object({ token: z.string() });

/** PUT /api/trays/:token/lines/:partCode; `missing` is checked against the line's qty too. */
export const trayLineUpdateSchema = z
  .strictObject({
    out: z.boolean({ error: 'out is true or false.' }).optional(),
    back: z.boolean({ error: 'back is true or false.' }).optional(),
    missing: z
      .int({ error: 'Use a whole number.' })
      .min(0, { error: 'Missing cannot be below 0.' })
      .optional(),
  })
  .refine((v) => v.out !== undefined || v.back !== undefined || v.missing !== undefined, {
    error: 'Send out, back or missing.',
  });
export type TrayLineUpdate = z.infer<typeof trayLineUpdateSchema>;

export const trayLineParamsSchema = z.object({
  token: trayTokenSchema,
  partCode: z.string().min(1).max(64),
});

/** One group on the teacher's board. */
export const boardGroupSchema = z.object({
  number: z.int().min(1),
  /** Lines in the group's pull list. */
  lines: z.int().min(0),
  linesOut: z.int().min(0),
  linesBack: z.int().min(0),
  missing: z.array(z.object({ partCode: z.string(), count: z.int().min(1) })),
});
export type BoardGroup = z.infer<typeof boardGroupSchema>;

/** GET /api/lessons/:id/trays, and every event of its stream. */
export const trayBoardSchema = z.object({ groups: z.array(boardGroupSchema) });
export type TrayBoard = z.infer<typeof trayBoardSchema>;

/** Whether a group has ticked every line of its tray back. */
export function groupDone(g: BoardGroup): boolean {
  return g.lines > 0 && g.linesBack === g.lines;
}

/** POST /api/lessons/:id/pack-away. */
export const packAwayCreateSchema = z.object({
  tubs: z
    .array(tubAuditCreateSchema.pick({ missing: true, found: true }).extend({ tubId: uuidSchema }))
    .min(1, { error: 'Record at least one tub.' })
    .max(200),
  note: tubAuditCreateSchema.shape.note,
});
export type PackAwayCreate = z.input<typeof packAwayCreateSchema>;
export const packAwayResultSchema = z.object({ audits: z.array(tubAuditSchema) });

/** POST /api/lessons/:id/trays/revoke. */
export const trayRevokeResultSchema = z.object({ revoked: z.int().min(0) });
