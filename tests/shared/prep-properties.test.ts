/**
 * Property tests (fast-check) of the R5 invariants stated in PREP-RULES.md, determinism, and
 * R6, on generated lessons. Demand is recomputed here from the rule text of R2, independently
 * of the engine's code.
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import fc from 'fast-check';
import {
  computeValidated,
  fewestGroups,
  prepPlanSchema,
  validatePrepInput,
  type PrepInput,
  type PrepPlan,
  type ValidPrepInput,
} from '../../shared/prep/index.js';

const STATUSES = ['ready', 'ready', 'ready', 'needs-sorting', 'on-loan', 'retired'] as const;

/** A random but valid lesson: up to 6 parts, 6 tubs, 4 activities of up to 6 materials. */
const lessonArb: fc.Arbitrary<PrepInput> = fc
  .record({
    partCount: fc.integer({ min: 1, max: 6 }),
    students: fc.integer({ min: 1, max: 60 }),
    groupSize: fc.integer({ min: 1, max: 8 }),
    devices: fc.integer({ min: 0, max: 20 }),
    sparesPercent: fc.integer({ min: 0, max: 50 }),
    tubLabels: fc.uniqueArray(fc.integer({ min: 1, max: 30 }), { maxLength: 6 }),
    seedParts: fc.array(
      fc.record({ small: fc.boolean(), charge: fc.option(fc.integer({ min: 1, max: 600 })) }),
      { minLength: 6, maxLength: 6 },
    ),
    stocks: fc.array(
      fc.array(fc.option(fc.integer({ min: 0, max: 40 })), { minLength: 6, maxLength: 6 }),
      {
        minLength: 6,
        maxLength: 6,
      },
    ),
    statuses: fc.array(fc.constantFrom(...STATUSES), { minLength: 6, maxLength: 6 }),
    activities: fc.array(
      fc.record({
        kind: fc.constantFrom('intro', 'build', 'code', 'test', 'reflect', 'other' as const),
        minutes: fc.integer({ min: 0, max: 30 }),
        materials: fc.array(
          fc.record({
            part: fc.integer({ min: 0, max: 5 }),
            consumable: fc.boolean(),
            qty: fc.integer({ min: 0, max: 6 }),
            per: fc.constantFrom('group', 'student', 'class' as const),
            returnable: fc.option(fc.boolean(), { nil: undefined }),
          }),
          { maxLength: 6 },
        ),
      }),
      { minLength: 1, maxLength: 4 },
    ),
  })
  .map((r): PrepInput => {
    const parts = r.seedParts.slice(0, r.partCount).map((p, i) => ({
      code: `P-${i}`,
      name: `Part ${i}`,
      category: i === 0 ? 'controller' : 'beam',
      small: p.small,
      fullChargeMinutes: p.charge,
    }));
    return {
      timezone: 'Australia/Adelaide',
      lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: r.groupSize },
      class: { studentCount: r.students, devices: r.devices },
      parts,
      tubs: r.tubLabels.map((n, t) => {
        const stock: Record<string, number> = {};
        parts.forEach((p, i) => {
          const v = r.stocks[t]![i];
          if (v !== null && v !== undefined) stock[p.code] = v;
        });
        return { id: `tub-${n}`, label: `Tub ${n}`, status: r.statuses[t]!, stock };
      }),
      activities: r.activities.map((a, k) => ({
        title: `Activity ${k + 1}`,
        kind: a.kind,
        minutes: a.minutes,
        materials: a.materials.map((m) =>
          m.consumable
            ? {
                consumable: m.part % 2 ? 'Tape' : ' tape ',
                qty: m.qty,
                per: m.per,
                returnable: m.returnable,
              }
            : {
                partCode: `P-${m.part % r.partCount}`,
                qty: m.qty,
                per: m.per,
                returnable: m.returnable,
              },
        ),
      })),
      settings: { sparesPercent: r.sparesPercent },
      earlierSameDay: [
        { endsAt: '2026-07-28T10:00', tubIds: r.tubLabels.slice(0, 2).map((n) => `tub-${n}`) },
      ],
    };
  });

/** R2 recomputed from the rule text: a group's demand of a part for a group of `size`. */
function groupDemand(input: ValidPrepInput, code: string, size: number): number {
  let maxReturnable = 0;
  let usedUp = 0;
  for (const a of input.activities) {
    let back = 0;
    for (const m of a.materials) {
      if (m.partCode !== code || m.per === 'class') continue;
      const k = m.per === 'group' ? m.qty : m.qty * size;
      if (m.returnable ?? true) back += k;
      else usedUp += k;
    }
    maxReturnable = Math.max(maxReturnable, back);
  }
  return maxReturnable + usedUp;
}

function allLines(plan: PrepPlan) {
  return [
    ...plan.groups.flatMap((g) => g.lines),
    ...plan.classTray.lines,
    ...plan.sparesTray.lines,
  ];
}

/** Pieces taken per "tub label / part code" over every line of the plan. */
function taken(plan: PrepPlan): Map<string, number> {
  const out = new Map<string, number>();
  for (const line of allLines(plan)) {
    for (const s of line.sources) {
      const key = `${s.tub}\u0000${line.partCode}`;
      out.set(key, (out.get(key) ?? 0) + s.qty);
    }
  }
  return out;
}

const runs = { numRuns: 300, seed: 20260728 };

describe('prep engine properties (fast-check)', () => {
  it('produces a well-formed plan: whole, non-negative counts and ISO times', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        prepPlanSchema.parse(computeValidated(validatePrepInput(raw)));
      }),
      runs,
    );
  });

  it('never takes more from a tub than its stock, and nothing from unusable tubs', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const input = validatePrepInput(raw);
        const plan = computeValidated(input);
        const byLabel = new Map(input.tubs.map((t) => [t.label, t]));
        for (const [key, qty] of taken(plan)) {
          const [label, code] = key.split('\u0000') as [string, string];
          const t = byLabel.get(label);
          assert.ok(t && t.status === 'ready', `${label} is usable`);
          assert.ok(qty <= (t.stock[code] ?? 0), `${label} ${code}: ${qty} ≤ stock`);
        }
      }),
      runs,
    );
  });

  it('has allocated + missing = demand for every group and part, missing as a shortfall', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const input = validatePrepInput(raw);
        const plan = computeValidated(input);
        for (const g of plan.groups) {
          for (const p of input.parts) {
            const demand = groupDemand(input, p.code, g.size);
            const line = g.lines.find((l) => l.partCode === p.code);
            const short = plan.shortfalls.find(
              (s) => s.group === g.number && s.partCode === p.code,
            );
            if (demand === 0) {
              assert.equal(line, undefined);
              continue;
            }
            assert.ok(line, `group ${g.number} has a line for ${p.code}`);
            assert.equal(line.needed, demand);
            assert.equal(
              line.allocated,
              line.sources.reduce((a, s) => a + s.qty, 0),
            );
            const missing = short ? short.needed - short.allocated : 0;
            assert.equal(line.allocated + missing, demand);
          }
        }
      }),
      runs,
    );
  });

  it('reports a shortfall only when no usable tub has any of that part left', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const input = validatePrepInput(raw);
        const plan = computeValidated(input);
        const took = taken(plan);
        for (const s of plan.shortfalls) {
          for (const t of input.tubs.filter((x) => x.status === 'ready')) {
            const left =
              (t.stock[s.partCode] ?? 0) - (took.get(`${t.label}\u0000${s.partCode}`) ?? 0);
            assert.equal(left, 0, `${t.label} still holds ${s.partCode}`);
          }
        }
      }),
      runs,
    );
  });

  it('lists every piece from a tub other than the home tub as a borrow', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const plan = computeValidated(validatePrepInput(raw));
        const expected = plan.groups.flatMap((g) =>
          g.lines.flatMap((l) =>
            l.sources
              .filter((s) => s.tub !== g.homeTub)
              .map((s) => ({ group: g.number, partCode: l.partCode, qty: s.qty, fromTub: s.tub })),
          ),
        );
        assert.deepEqual(
          plan.borrows.map(({ group, partCode, qty, fromTub }) => ({
            group,
            partCode,
            qty,
            fromTub,
          })),
          expected,
        );
      }),
      runs,
    );
  });

  it('is deterministic: the same input (in any tub order) gives identical JSON', () => {
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const first = JSON.stringify(computeValidated(validatePrepInput(raw)));
        const copy = structuredClone(raw);
        copy.tubs.reverse();
        assert.equal(JSON.stringify(computeValidated(validatePrepInput(raw))), first);
        assert.equal(JSON.stringify(computeValidated(validatePrepInput(copy))), first);
      }),
      runs,
    );
  });

  it('R6: the suggested group count has no group shortfall and no larger count below n does', () => {
    const shortOfGroups = (p: PrepPlan) => p.shortfalls.some((s) => s.where === 'group');
    let suggested = 0;
    fc.assert(
      fc.property(lessonArb, (raw) => {
        const input = validatePrepInput(raw);
        const plan = computeValidated(input);
        const n = plan.groups.length;
        const s = plan.suggestions.find((x) => x.kind === 'groups');
        if (!shortOfGroups(plan)) {
          assert.equal(s, undefined);
          return;
        }
        const students = input.class.studentCount;
        const lowest = s && s.kind === 'groups' ? s.groups : fewestGroups(students) - 1;
        if (s && s.kind === 'groups') {
          suggested++;
          const again = computeValidated(input, { groupCount: s.groups });
          assert.equal(shortOfGroups(again), false);
          assert.deepEqual(
            again.groups.map((g) => g.size),
            s.sizes,
          );
          assert.ok(Math.max(...s.sizes) <= 8);
        }
        for (let m = lowest + 1; m < n; m++) {
          assert.equal(
            shortOfGroups(computeValidated(input, { groupCount: m })),
            true,
            `${m} groups`,
          );
        }
      }),
      { ...runs, numRuns: 1500 },
    );
    // The generator must reach the interesting case, or this test checks little.
    assert.ok(suggested >= 30, `only ${suggested} lessons had a groups suggestion`);
  });
});
