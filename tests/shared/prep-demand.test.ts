/**
 * R1 groups, R2 demand and R3 spares of PREP-RULES.md, each on its own with invented lessons.
 * Expected values are worked out by hand from the rule text (source: PREP-RULES.md R1–R3).
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import {
  balancedSizes,
  ceilDiv,
  computePrepPlan,
  groupSizes,
  type PrepPlan,
} from '../../shared/prep/index.js';
import { activity, lesson, part, tub } from './prep-fixtures.js';

function needed(plan: PrepPlan, group: number, code: string): number | undefined {
  return plan.groups[group - 1]!.lines.find((l) => l.partCode === code)?.needed;
}

describe('R1 groups', () => {
  it('puts 27 students in groups of 4 into 7 groups of 4,4,4,4,4,4,3', () => {
    // Source: PREP-RULES.md R1, its own example.
    assert.deepEqual(groupSizes(27, 4), [4, 4, 4, 4, 4, 4, 3]);
    const plan = computePrepPlan(lesson({ class: { studentCount: 27, devices: 0 } }));
    assert.deepEqual(
      plan.groups.map((g) => [g.number, g.size]),
      [1, 2, 3, 4, 5, 6, 7].map((n) => [n, n <= 6 ? 4 : 3]),
    );
  });

  it('balances the sizes: the first r groups get one student more', () => {
    // 60 / 8 → n = 8, q = 7, r = 4; 25 / 6 → n = 5, q = 5, r = 0; 1 / 8 → one group of 1.
    assert.deepEqual(groupSizes(60, 8), [8, 8, 8, 8, 7, 7, 7, 7]);
    assert.deepEqual(groupSizes(25, 6), [5, 5, 5, 5, 5]);
    assert.deepEqual(groupSizes(1, 8), [1]);
    assert.deepEqual(balancedSizes(10, 4), [3, 3, 2, 2]);
    for (let s = 1; s <= 60; s++) {
      for (let g = 1; g <= 8; g++) {
        const sizes = groupSizes(s, g);
        assert.equal(sizes.length, Math.ceil(s / g));
        assert.equal(
          sizes.reduce((a, b) => a + b, 0),
          s,
        );
        assert.ok(Math.max(...sizes) - Math.min(...sizes) <= 1 && Math.max(...sizes) <= g);
      }
    }
  });
});

describe('R2 demand', () => {
  const parts = [part('X-1', 'Beam'), part('X-2', 'Axle'), part('X-3', 'Cable tie')];
  const stock = { 'X-1': 500, 'X-2': 500, 'X-3': 500 };

  it('takes the maximum over activities for a returnable part', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [{ partCode: 'X-1', qty: 2, per: 'group' }]),
          activity('B', [{ partCode: 'X-1', qty: 3, per: 'group' }]),
          activity('C', [{ partCode: 'X-1', qty: 1, per: 'group' }]),
        ],
      }),
    );
    assert.equal(needed(plan, 1, 'X-1'), 3);
  });

  it('sums a part that is used up (returnable: false) over activities', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [{ partCode: 'X-3', qty: 2, per: 'group', returnable: false }]),
          activity('B', [{ partCode: 'X-3', qty: 3, per: 'group', returnable: false }]),
        ],
      }),
    );
    assert.equal(needed(plan, 1, 'X-3'), 5);
    // Used-up pieces do not come back, so they do not count towards pack-away.
    assert.equal(plan.groups[0]!.returnablePieces, 0);
    assert.equal(plan.groups[0]!.pieces, 5);
  });

  it('adds up the same part twice in one activity, then takes the maximum', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [
            { partCode: 'X-2', qty: 1, per: 'group' },
            { partCode: 'X-2', qty: 2, per: 'group' },
          ]),
          activity('B', [{ partCode: 'X-2', qty: 2, per: 'group' }]),
        ],
      }),
    );
    assert.equal(needed(plan, 1, 'X-2'), 3);
  });

  it('multiplies per-student quantities by each group size, also mixed with per group', () => {
    const plan = computePrepPlan(
      lesson({
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 3 },
        class: { studentCount: 5, devices: 5 },
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [
            { partCode: 'X-1', qty: 4, per: 'student' },
            { partCode: 'X-2', qty: 1, per: 'group' },
            { partCode: 'X-2', qty: 2, per: 'student' },
          ]),
        ],
      }),
    );
    // Sizes 3 and 2: 4 × 3 = 12, 4 × 2 = 8; axles 1 + 2 × 3 = 7 and 1 + 2 × 2 = 5.
    assert.deepEqual([needed(plan, 1, 'X-1'), needed(plan, 2, 'X-1')], [12, 8]);
    assert.deepEqual([needed(plan, 1, 'X-2'), needed(plan, 2, 'X-2')], [7, 5]);
  });

  it('puts per-class quantities in the class tray only', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [{ partCode: 'X-1', qty: 6, per: 'class' }]),
          activity('B', [{ partCode: 'X-1', qty: 4, per: 'class' }]),
        ],
      }),
    );
    assert.deepEqual(plan.groups[0]!.lines, []);
    assert.deepEqual(plan.classTray.lines, [
      { partCode: 'X-1', needed: 6, allocated: 6, sources: [{ tub: 'Tub 1', qty: 6 }] },
    ]);
  });

  it('lists consumables summed, keyed by trimmed name ignoring case, never from tubs', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [
            { consumable: ' Masking tape (cm) ', qty: 20, per: 'group' },
            { consumable: 'Sticky notes', qty: 1, per: 'student' },
            { consumable: 'Card sheet', qty: 3, per: 'class' },
          ]),
          activity('B', [
            { consumable: 'masking TAPE (cm)', qty: 10, per: 'group' },
            { consumable: 'card sheet', qty: 2, per: 'class' },
          ]),
        ],
      }),
    );
    assert.deepEqual(plan.groups[0]!.consumables, [
      { name: 'Masking tape (cm)', qty: 30 },
      { name: 'Sticky notes', qty: 4 },
    ]);
    assert.deepEqual(plan.classTray.consumables, [{ name: 'Card sheet', qty: 5 }]);
    assert.deepEqual(plan.groups[0]!.lines, []);
    assert.equal(plan.totals.pieces, 0);
    assert.deepEqual(plan.shortfalls, []);
  });

  it('lists lines in parts-list order and only parts with demand', () => {
    const plan = computePrepPlan(
      lesson({
        parts,
        tubs: [tub('Tub 1', stock)],
        activities: [
          activity('A', [
            { partCode: 'X-3', qty: 1, per: 'group' },
            { partCode: 'X-1', qty: 1, per: 'group' },
            { partCode: 'X-2', qty: 0, per: 'group' },
          ]),
        ],
      }),
    );
    assert.deepEqual(
      plan.groups[0]!.lines.map((l) => l.partCode),
      ['X-1', 'X-3'],
    );
  });
});

describe('R3 spares', () => {
  const pin = part('X-9', 'Peg', { small: true });

  function sparesFor(perGroup: number, groups: number, extra: Parameters<typeof lesson>[0] = {}) {
    return computePrepPlan(
      lesson({
        class: { studentCount: groups, devices: 0 },
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
        parts: [pin, part('X-1', 'Beam')],
        tubs: [tub('Tub 1', { 'X-9': 1000, 'X-1': 1000 })],
        activities: [
          activity('A', [
            { partCode: 'X-9', qty: perGroup, per: 'group' },
            { partCode: 'X-1', qty: perGroup, per: 'group' },
          ]),
        ],
        ...extra,
      }),
    );
  }

  it('gives 10% of 30 as 3 spares, not 4', () => {
    // Source: PREP-RULES.md R3 (ceil(30 × 10 / 100) = 3).
    assert.equal(ceilDiv(30 * 10, 100), 3);
    const plan = sparesFor(10, 3);
    assert.deepEqual(plan.sparesTray.lines, [
      { partCode: 'X-9', needed: 3, allocated: 3, sources: [{ tub: 'Tub 1', qty: 3 }] },
    ]);
  });

  it('avoids the floating-point trap: 7% of 100 is 7 spares, not 8', () => {
    // IEEE 754 binary64 as the runtime computes it: 0.1 × 3 × 10 is 3.0000000000000004 and
    // 100 × 0.07 is 7.000000000000001, so a float ceiling gives 4 and 8. (PREP-RULES.md's
    // "0.1 × 30" happens to round to exactly 3 in binary64; the trap is real for other values.)
    assert.equal(Math.ceil(0.1 * 3 * 10), 4);
    assert.equal(Math.ceil(100 * 0.07), 8);
    assert.equal(ceilDiv(100 * 7, 100), 7);
    const plan = sparesFor(50, 2, { settings: { sparesPercent: 7 } });
    assert.equal(plan.sparesTray.lines[0]?.needed, 7);
  });

  it('rounds any remainder up: 10% of 31 is 4; 0% gives no spares line', () => {
    const plan = sparesFor(31, 1);
    assert.equal(plan.sparesTray.lines[0]?.needed, 4);
    const none = sparesFor(10, 3, { settings: { sparesPercent: 0 } });
    assert.deepEqual(none.sparesTray.lines, []);
  });

  it('matches integer ceil(a / b) computed with BigInt for a range of values', () => {
    // Reference: exact integer arithmetic with BigInt.
    for (let a = 0; a <= 3000; a += 7) {
      for (const b of [1, 3, 60, 100]) {
        const exact = (BigInt(a) + BigInt(b) - 1n) / BigInt(b);
        assert.equal(ceilDiv(a, b), Number(exact));
      }
    }
  });

  it('counts the class tray, not used-up pieces, and only small parts', () => {
    const plan = computePrepPlan(
      lesson({
        class: { studentCount: 2, devices: 0 },
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
        parts: [pin, part('X-1', 'Beam')],
        tubs: [tub('Tub 1', { 'X-9': 1000, 'X-1': 1000 })],
        settings: { sparesPercent: 50 },
        activities: [
          activity('A', [
            { partCode: 'X-9', qty: 5, per: 'group' },
            { partCode: 'X-9', qty: 100, per: 'group', returnable: false },
            { partCode: 'X-9', qty: 3, per: 'class' },
            { partCode: 'X-1', qty: 9, per: 'group' },
          ]),
        ],
      }),
    );
    // D = 5 + 5 (groups, returnable only) + 3 (class) = 13; 50% → ceil(6.5) = 7.
    assert.deepEqual(
      plan.sparesTray.lines.map((l) => [l.partCode, l.needed]),
      [['X-9', 7]],
    );
  });

  it('warns (no shortfall) when the tubs cannot fill the spares tray', () => {
    const plan = computePrepPlan(
      lesson({
        class: { studentCount: 2, devices: 0 },
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
        parts: [pin],
        tubs: [tub('Tub 1', { 'X-9': 21 })],
        activities: [activity('A', [{ partCode: 'X-9', qty: 10, per: 'group' }])],
      }),
    );
    assert.deepEqual(plan.shortfalls, []);
    assert.equal(plan.sparesTray.lines[0]?.allocated, 1);
    assert.deepEqual(plan.warnings, [
      { code: 'spares-short', message: 'The spares tray is short of 1 × Peg (wants 2, gets 1).' },
    ]);
  });
});
