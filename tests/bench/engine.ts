/**
 * Engine benchmark: the prep engine on seeded generated lessons. Validation and computation are
 * timed apart; a baseline measured in the same run gives ratios that mean something on a noisy
 * machine; a growth series shows the cost per group × part line staying flat.
 */
import {
  computePrepPlan,
  computeValidated,
  validatePrepInput,
  type PrepInput,
  type ValidPrepInput,
} from '../../shared/prep/index.js';
import { generateLesson } from './generate.js';
import { measure } from './measure.js';
import type { BenchRow } from './types.js';

/** The literal baseline: one pass that reads every material line of the input once. */
export function readMaterialsOnce(input: ValidPrepInput): number {
  let sum = 0;
  for (const a of input.activities) {
    for (const m of a.materials) {
      sum += m.qty + (m.per === 'student' ? 1 : 0) + (m.partCode ?? m.consumable ?? '').length;
    }
  }
  return sum;
}

/**
 * Baseline A once per group: reads every material line for each group and adds up its quantity
 * for that group (k, or k × size per student). The same groups × lines shape as the engine's
 * work, with nothing else: no lookups, no output.
 */
export function readMaterialsPerGroup(input: ValidPrepInput, sizes: readonly number[]): number {
  let sum = 0;
  for (const size of sizes) {
    for (const a of input.activities) {
      for (const m of a.materials) {
        if (m.per === 'class') continue;
        sum += m.per === 'student' ? m.qty * size : m.qty;
        sum += (m.partCode ?? m.consumable ?? '').length;
      }
    }
  }
  return sum;
}

const round = (x: number, digits = 2) => Number(x.toFixed(digits));

function shapeName(groups: number, lines: number, tubs: number): string {
  return `${groups} groups × ${lines} lines × ${tubs} tubs`;
}

async function mainLesson(): Promise<BenchRow[]> {
  const raw: PrepInput = generateLesson({ groups: 8, lines: 250, tubs: 8, seed: 1 });
  const input = validatePrepInput(raw);
  const plan = computeValidated(input);
  const sizes = plan.groups.map((g) => g.size);
  const shape = shapeName(8, 250, 8);
  const opts = { budgetMs: 3000 };
  const validate = measure(() => validatePrepInput(raw), opts);
  const compute = measure(() => computeValidated(input), opts);
  const total = measure(() => computePrepPlan(raw), opts);
  const once = measure(() => readMaterialsOnce(input), opts);
  const perGroup = measure(() => readMaterialsPerGroup(input, sizes), opts);
  const facts =
    `${plan.totals.lines} allocated lines, ${plan.shortfalls.length} shortfalls, ` +
    `${plan.borrows.length} borrows, ${plan.suggestions.length} suggestions`;
  const within = (us: number, target: number) => (us <= target ? 'met' : 'MISSED');
  return [
    {
      name: `engine: validate ${shape}`,
      median: round(validate.medianUs),
      unit: 'µs',
      samples: validate.samples,
    },
    {
      name: `engine: compute ${shape}`,
      median: round(compute.medianUs),
      unit: 'µs',
      samples: compute.samples,
      note: facts,
    },
    {
      name: `engine: validate + compute ${shape}`,
      median: round(total.medianUs),
      unit: 'µs',
      samples: total.samples,
      note: `target < 1000 µs median: ${within(total.medianUs, 1000)}`,
    },
    {
      name: 'baseline A: read every material line once',
      median: round(once.medianUs, 3),
      unit: 'µs',
      samples: once.samples,
      note: `${input.activities.reduce((n, a) => n + a.materials.length, 0)} material lines`,
    },
    {
      name: 'baseline B: read every material line once per group',
      median: round(perGroup.medianUs, 3),
      unit: 'µs',
      samples: perGroup.samples,
      note: 'groups × lines reads, nothing else',
    },
    {
      name: 'ratio: compute / baseline A',
      median: round(compute.medianUs),
      unit: 'µs',
      ratio: round(compute.medianUs / once.medianUs, 1),
      note: `target ≤ 30×: ${compute.medianUs / once.medianUs <= 30 ? 'met' : 'MISSED'}`,
    },
    {
      name: 'ratio: compute / baseline B',
      median: round(compute.medianUs),
      unit: 'µs',
      ratio: round(compute.medianUs / perGroup.medianUs, 1),
      note: `target ≤ 30×: ${compute.medianUs / perGroup.medianUs <= 30 ? 'met' : 'MISSED'}`,
    },
    {
      name: 'ratio: validate + compute / baseline B',
      median: round(total.medianUs),
      unit: 'µs',
      ratio: round(total.medianUs / perGroup.medianUs, 1),
    },
  ];
}

/** Groups 4 → 60 (a class has at most 60 students, so 64 groups is not valid input). */
const GROUP_SERIES = [4, 8, 16, 32, 60];
const LINE_SERIES = [50, 250, 500, 1000, 2000];

/**
 * The growth series. Each shape's compute time is divided by baseline B timed on the same
 * input right after it: baseline B grows exactly with groups × lines, so a flat ratio means
 * linear growth, and the ratio is less at the mercy of a busy machine than absolute times.
 */
async function growth(): Promise<BenchRow[]> {
  const shapes: [number, number][] = [
    ...GROUP_SERIES.map((g): [number, number] => [g, 250]),
    ...LINE_SERIES.filter((l) => l !== 250).map((l): [number, number] => [8, l]),
    [60, 2000],
  ];
  const rows: BenchRow[] = [];
  for (const [groups, lines] of shapes) {
    const raw = generateLesson({ groups, lines, tubs: 8, seed: 7 });
    const input = validatePrepInput(raw);
    const sizes = computeValidated(input).groups.map((g) => g.size);
    const big = groups * lines > 20_000;
    const opts = { budgetMs: big ? 2500 : 1000, warmupMs: big ? 500 : 200, minSamples: 11 };
    const compute = measure(() => computeValidated(input), opts);
    const base = measure(() => readMaterialsPerGroup(input, sizes), opts);
    const validate = measure(() => validatePrepInput(raw), opts);
    const perCell = (compute.medianUs * 1000) / (groups * lines);
    rows.push({
      name: `growth: compute ${shapeName(groups, lines, 8)}`,
      median: round(compute.medianUs),
      unit: 'µs',
      ratio: round(compute.medianUs / base.medianUs, 1),
      samples: compute.samples,
      note: `${round(perCell, 1)} ns per group × line; validate ${round(validate.medianUs)} µs`,
    });
  }
  return rows;
}

export async function benchEngine(): Promise<BenchRow[]> {
  return [...(await mainLesson()), ...(await growth())];
}
