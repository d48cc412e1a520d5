/**
 * Trayplan's prep engine (PREP-RULES.md): pure, deterministic, no I/O and no clock.
 *
 * - `computePrepPlan(raw)` validates and computes; throws `PrepInputError` on bad input.
 * - `validatePrepInput(raw)` and `computeValidated(input)` do the two halves apart.
 * - `prepInputSchema` / `prepPlanSchema` are the zod schemas of input and output.
 */
export { computePrepPlan, computeValidated, type PlanOptions } from './plan.js';
export { PrepInputError, validatePrepInput } from './validate.js';
export {
  ACTIVITY_KINDS,
  DEFAULT_PREP_SETTINGS,
  MATERIAL_PER,
  prepInputSchema,
  TUB_STATUSES,
  type ActivityKind,
  type PrepActivity,
  type PrepInput,
  type PrepMaterial,
  type PrepPart,
  type PrepSettings,
  type PrepTub,
  type TubStatus,
  type ValidPrepInput,
} from './schema.js';
export * from './plan-schema.js';
export { MAX_STOCK, MAX_WINDOW_MINUTES } from './limits.js';
export { balancedSizes, groupCount, groupSizes, fewestGroups, MAX_GROUP_SIZE } from './groups.js';
export { naturalCompare, sortByLabel } from './natural.js';
export { ceilDiv } from './math.js';
export { packAwayMinutes } from './timeline.js';
export { pullMinutes, taskKey } from './tasks.js';
export {
  addMinutes,
  formatInstant,
  intervalsOverlap,
  isIanaTimeZone,
  localToInstant,
  minutesBetween,
  offsetMinutes,
  type TimeSpan,
} from './time.js';
export { groupController, groupControllers } from './controller.js';
