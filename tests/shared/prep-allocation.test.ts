/**
 * R4 usable tubs, R5 allocation and R6 suggestions of PREP-RULES.md, each on its own with
 * invented lessons. Expected values are worked out by hand from the rule text.
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { computePrepPlan, type PrepPlan } from '../../shared/prep/index.js';
import { activity, lesson, part, tub } from './prep-fixtures.js';

const beam = part('X-1', 'Beam');
const perGroup = (qty: number, code = 'X-1') => [{ partCode: code, qty, per: 'group' as const }];

/** n groups of one student each, every group needing `need` beams. */
function groupsOf1(n: number, need: number, tubs: ReturnType<typeof tub>[]): PrepPlan {
  return computePrepPlan(
    lesson({
      lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
      class: { studentCount: n, devices: n },
      parts: [beam],
      tubs,
      activities: [activity('Build', perGroup(need))],
    }),
  );
}

describe('R4 usable tubs and home tubs', () => {
  it('orders usable tubs by label in natural order and homes groups round them', () => {
    const plan = groupsOf1(4, 1, [
      tub('Tub 10', { 'X-1': 5 }),
      tub('Tub 2', { 'X-1': 5 }),
      tub('Tub 1', { 'X-1': 5 }),
    ]);
    // T = [Tub 1, Tub 2, Tub 10]; group i has T[(i − 1) mod 3].
    assert.deepEqual(
      plan.groups.map((g) => g.homeTub),
      ['Tub 1', 'Tub 2', 'Tub 10', 'Tub 1'],
    );
  });

  it('passes the home tub controller label on to the group', () => {
    const plan = groupsOf1(2, 1, [
      tub('Tub 1', { 'X-1': 5 }, { controllerLabel: 'Hub Kiwi' }),
      tub('Tub 2', { 'X-1': 5 }),
    ]);
    assert.deepEqual(
      plan.groups.map((g) => g.controllerLabel),
      ['Hub Kiwi', null],
    );
  });

  it('never allocates from a tub that is not ready, and warns naming it and its status', () => {
    const plan = groupsOf1(1, 3, [
      tub('Tub 5', { 'X-1': 50 }, { status: 'needs-sorting' }),
      tub('Tub 6', { 'X-1': 50 }, { status: 'on-loan' }),
      tub('Tub 7', { 'X-1': 50 }, { status: 'retired' }),
      tub('Tub 1', { 'X-1': 1 }),
    ]);
    assert.deepEqual(plan.groups[0]!.lines[0]!.sources, [{ tub: 'Tub 1', qty: 1 }]);
    assert.deepEqual(
      plan.warnings.filter((w) => w.code === 'tub-unusable').map((w) => w.message),
      [
        'Tub 5 needs sorting and is not used for this lesson.',
        'Tub 6 is on loan and is not used for this lesson.',
        'Tub 7 is retired and is not used for this lesson.',
      ],
    );
  });

  it('makes every demand a shortfall when no tub is usable', () => {
    const plan = groupsOf1(2, 2, [tub('Tub 5', { 'X-1': 50 }, { status: 'on-loan' })]);
    assert.deepEqual(
      plan.groups.map((g) => [g.homeTub, g.controllerLabel, g.pieces]),
      [
        [null, null, 0],
        [null, null, 0],
      ],
    );
    assert.deepEqual(
      plan.shortfalls.map((s) => [s.group, s.needed, s.allocated]),
      [
        [1, 2, 0],
        [2, 2, 0],
      ],
    );
    assert.equal(plan.totals.tubsUsed, 0);
    assert.equal(plan.tasks.filter((t) => t.kind === 'pull').length, 0);
    // 2 groups of 1 cannot become fewer groups of at most 8 that fit: no groups suggestion.
    assert.deepEqual(
      plan.suggestions.map((s) => s.kind),
      ['part'],
    );
  });
});

describe('R5 allocation', () => {
  it('takes from the home tub first, then the tub with most remaining', () => {
    const plan = groupsOf1(1, 9, [
      tub('Tub 1', { 'X-1': 2 }),
      tub('Tub 2', { 'X-1': 3 }),
      tub('Tub 3', { 'X-1': 5 }),
    ]);
    assert.deepEqual(plan.groups[0]!.lines[0]!.sources, [
      { tub: 'Tub 1', qty: 2 },
      { tub: 'Tub 3', qty: 5 },
      { tub: 'Tub 2', qty: 2 },
    ]);
    assert.deepEqual(
      plan.borrows.map((b) => [b.fromTub, b.qty, b.homeTub]),
      [
        ['Tub 3', 5, 'Tub 1'],
        ['Tub 2', 2, 'Tub 1'],
      ],
    );
  });

  it('breaks ties between equally full tubs by label order', () => {
    const plan = groupsOf1(1, 4, [
      tub('Tub 10', { 'X-1': 3 }),
      tub('Tub 9', { 'X-1': 3 }),
      tub('Tub 1', { 'X-1': 0 }),
    ]);
    assert.deepEqual(plan.groups[0]!.lines[0]!.sources, [
      { tub: 'Tub 9', qty: 3 },
      { tub: 'Tub 10', qty: 1 },
    ]);
  });

  it('serves every group from its home tub before any group borrows', () => {
    // Tub 1: 1, Tub 2: 4; two groups need 3. Step 1: group 1 gets 1, group 2 gets 3;
    // step 2: group 1 borrows the last 1 from Tub 2 and stays 1 short; group 2 is complete.
    const plan = groupsOf1(2, 3, [tub('Tub 1', { 'X-1': 1 }), tub('Tub 2', { 'X-1': 4 })]);
    assert.deepEqual(
      plan.groups.map((g) => g.lines[0]!.allocated),
      [2, 3],
    );
    assert.deepEqual(
      plan.shortfalls.map((s) => [s.where, s.group, s.needed, s.allocated]),
      [['group', 1, 3, 2]],
    );
  });

  it('fills the class tray after the groups, then the spares tray, and reports class shortfalls', () => {
    const pin = part('X-2', 'Peg', { small: true });
    const plan = computePrepPlan(
      lesson({
        class: { studentCount: 2, devices: 2 },
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
        parts: [beam, pin],
        tubs: [tub('Tub 1', { 'X-1': 5, 'X-2': 12 }), tub('Tub 2', { 'X-1': 3, 'X-2': 9 })],
        activities: [
          activity('Build', [
            { partCode: 'X-1', qty: 3, per: 'group' },
            { partCode: 'X-1', qty: 4, per: 'class' },
            { partCode: 'X-2', qty: 10, per: 'group' },
          ]),
        ],
      }),
    );
    // Groups take 3 + 3 beams, leaving 2 + 0; the class tray wants 4 and gets 2.
    assert.deepEqual(plan.classTray.lines, [
      { partCode: 'X-1', needed: 4, allocated: 2, sources: [{ tub: 'Tub 1', qty: 2 }] },
    ]);
    assert.deepEqual(
      plan.shortfalls.map((s) => [s.where, s.group, s.partCode, s.needed - s.allocated]),
      [['class', undefined, 'X-1', 2]],
    );
    assert.equal(
      plan.shortfalls[0]!.message,
      'The class tray is short of 2 × Beam (needs 4, gets 2).',
    );
    // Pegs: groups take 10 from each home tub (Tub 2 short 1, borrowed from Tub 1), leaving
    // 1 + 0; spares want ceil(20 × 10 / 100) = 2 and get 1.
    assert.deepEqual(plan.sparesTray.lines, [
      { partCode: 'X-2', needed: 2, allocated: 1, sources: [{ tub: 'Tub 1', qty: 1 }] },
    ]);
    assert.equal(plan.totals.tubsUsed, 2);
  });
});

describe('R6 suggestions', () => {
  it('suggests the largest smaller group count that has no group shortfall', () => {
    // 12 students, groups of 2 → 6 groups needing 1 controller each; 4 usable tubs hold 4.
    const controller = part('X-7', 'Controller', {
      category: 'controller',
      fullChargeMinutes: 180,
    });
    const plan = computePrepPlan(
      lesson({
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 2 },
        class: { studentCount: 12, devices: 12 },
        parts: [controller],
        tubs: ['Tub 1', 'Tub 2', 'Tub 3', 'Tub 4', 'Tub 5'].map((l, i) =>
          tub(l, { 'X-7': i < 4 ? 1 : 0 }),
        ),
        activities: [activity('Code', perGroup(1, 'X-7'), { kind: 'code' })],
      }),
    );
    assert.deepEqual(plan.suggestions, [
      {
        kind: 'groups',
        groups: 4,
        sizes: [3, 3, 3, 3],
        message: 'With 4 groups (3, 3, 3 and 3 students) no group is short of parts.',
      },
      {
        kind: 'part',
        partCode: 'X-7',
        usable: 4,
        needed: 6,
        message: '6 groups need 6 controllers; 5 usable tubs hold 4.',
      },
    ]);
  });

  it('names a short part that is not a controller by name, with stock and total need', () => {
    const plan = groupsOf1(3, 4, [tub('Tub 1', { 'X-1': 5 })]);
    const partSuggestion = plan.suggestions.find((s) => s.kind === 'part');
    assert.deepEqual(partSuggestion, {
      kind: 'part',
      partCode: 'X-1',
      usable: 5,
      needed: 12,
      message: 'Beam: the lesson needs 12 and the usable tubs hold 5.',
    });
  });

  it('keeps suggested groups at most 8 students: none when only bigger groups would fit', () => {
    // 20 students in groups of 4 → 5 groups; only 2 groups' worth of beams; 2 groups would be
    // 10 students each, over 8, so the smallest allowed count is 3 and it does not fit.
    const plan = computePrepPlan(
      lesson({
        class: { studentCount: 20, devices: 0 },
        parts: [beam],
        tubs: [tub('Tub 1', { 'X-1': 2 })],
        activities: [activity('Build', perGroup(1))],
      }),
    );
    assert.equal(plan.suggestions.filter((s) => s.kind === 'groups').length, 0);
  });

  it('makes no groups suggestion without a group shortfall', () => {
    const plan = groupsOf1(3, 1, [tub('Tub 1', { 'X-1': 10 })]);
    assert.deepEqual(plan.suggestions, []);
  });
});
