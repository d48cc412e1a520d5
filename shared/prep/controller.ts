import type { PrepGroup, PrepPlan } from './plan-schema.js';
import type { PrepInput } from './schema.js';

/**
 * The controller a group pairs with, in the words the lesson page, the pack and the tray labels
 * all use: the label of the tub its controller comes from (the home tub's, or the lending tub's
 * with "(from Tub N)" when borrowed), `none (short)` when the group needs one and gets none.
 * Null when there is no label to name (the pack prints "not labelled"): a group whose home tub's
 * controller has no label recorded, or whose pull list has no controller and whose home tub has
 * no label. A borrowed controller without a label is "not labelled (from Tub N)".
 */
export function groupController(
  group: PrepGroup,
  categoryOf: (partCode: string) => string | undefined,
  controllerOf: (tubLabel: string) => string | null | undefined,
): string | null {
  const line = group.lines.find((l) => categoryOf(l.partCode) === 'controller');
  if (!line) return group.controllerLabel;
  const from = line.sources[0]?.tub;
  if (!from) return 'none (short)';
  if (from === group.homeTub) return group.controllerLabel;
  return `${controllerOf(from) ?? 'not labelled'} (from ${from})`;
}

/** Each group's controller (by group number) for a plan and the input it was computed from. */
export function groupControllers(
  plan: PrepPlan,
  input: Pick<PrepInput, 'parts' | 'tubs'>,
): Record<string, string | null> {
  const category = new Map(input.parts.map((p) => [p.code, p.category]));
  const controller = new Map(input.tubs.map((t) => [t.label, t.controllerLabel ?? null]));
  return Object.fromEntries(
    plan.groups.map((g) => [
      String(g.number),
      groupController(
        g,
        (code) => category.get(code),
        (tub) => controller.get(tub),
      ),
    ]),
  );
}
