/**
 * Definitions the prep engine (shared/prep), the API's schemas (shared/schemas) and the database
 * columns (server/db/schema) share: each exists here once, so they cannot drift apart.
 */

/** A tub's state (PREP-RULES.md, "Input"): only `ready` tubs are pulled from. */
export const TUB_STATUSES = ['ready', 'needs-sorting', 'on-loan', 'retired'] as const;
export type TubStatus = (typeof TUB_STATUSES)[number];

export const ACTIVITY_KINDS = ['intro', 'build', 'code', 'test', 'reflect', 'other'] as const;
export type ActivityKind = (typeof ACTIVITY_KINDS)[number];

/** What a material's quantity counts per. */
export const MATERIAL_PER = ['group', 'student', 'class'] as const;
export type MaterialPer = (typeof MATERIAL_PER)[number];

/** The largest group the engine plans (R6). */
export const MAX_GROUP_SIZE = 8;

/** The prep allowances of PREP-RULES.md ("settings") and their defaults. */
export const DEFAULT_PREP = Object.freeze({
  setOutMinutes: 5,
  packAwayBaseMinutes: 5,
  packAwaySecondsPerPiece: 2,
  pullBaseMinutes: 5,
  pullSecondsPerLine: 20,
  pullSecondsPerPiece: 1,
  sparesPercent: 10,
  chargeBufferMinutes: 15,
  sortMinutesPerTub: 30,
  deviceCheckMinutesPerDevice: 1,
});
