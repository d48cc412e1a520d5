/**
 * The worked example of PREP-RULES.md, checked figure by figure. Every expected value below is
 * stated in the worked example (source: "worked example, PREP-RULES.md") unless a comment says
 * it is derived from the rules there.
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { computePrepPlan, prepPlanSchema, type PrepPlan } from '../../shared/prep/index.js';
import { workedExample } from './prep-fixtures.js';

const plan: PrepPlan = computePrepPlan(workedExample());

function line(p: PrepPlan, group: number, code: string) {
  const l = p.groups[group - 1]!.lines.find((x) => x.partCode === code);
  assert.ok(l, `group ${group} has a line for ${code}`);
  return l;
}

describe('worked example, PREP-RULES.md', () => {
  it('is a valid plan by the output schema', () => {
    assert.doesNotThrow(() => prepPlanSchema.parse(plan));
  });

  it('makes 4 groups of 3, 3, 2, 2 homed on Tub 1, Tub 2, Tub 3, Tub 1', () => {
    assert.equal(plan.totals.groups, 4);
    assert.deepEqual(
      plan.groups.map((g) => g.size),
      [3, 3, 2, 2],
    );
    assert.deepEqual(
      plan.groups.map((g) => g.homeTub),
      ['Tub 1', 'Tub 2', 'Tub 3', 'Tub 1'],
    );
  });

  it('needs 12, 12, 8, 8 pins', () => {
    assert.deepEqual(
      [1, 2, 3, 4].map((g) => line(plan, g, 'RB-020').needed),
      [12, 12, 8, 8],
    );
  });

  it('is short of 1 motor in group 2, a controller and 2 motors in group 4', () => {
    assert.deepEqual(
      plan.shortfalls.map(({ partCode, where, group, needed, allocated }) => ({
        partCode,
        where,
        group,
        missing: needed - allocated,
      })),
      [
        { partCode: 'RB-010', where: 'group', group: 2, missing: 1 },
        { partCode: 'RB-001', where: 'group', group: 4, missing: 1 },
        { partCode: 'RB-010', where: 'group', group: 4, missing: 2 },
      ],
    );
    assert.match(plan.shortfalls[0]!.message, /Group 2 is short of 1 × Motor/);
  });

  it('has group 3 borrow 2 pins from Tub 2, listed in the return map', () => {
    assert.deepEqual(
      plan.borrows.map(({ group, partCode, qty, fromTub, homeTub }) => ({
        group,
        partCode,
        qty,
        fromTub,
        homeTub,
      })),
      [{ group: 3, partCode: 'RB-020', qty: 2, fromTub: 'Tub 2', homeTub: 'Tub 3' }],
    );
    assert.deepEqual(line(plan, 3, 'RB-020').sources, [
      { tub: 'Tub 3', qty: 6 },
      { tub: 'Tub 2', qty: 2 },
    ]);
    assert.equal(plan.borrows[0]!.message, 'Group 3: return 2 × Pin to Tub 2.');
  });

  it('puts ceil(40 × 10 / 100) = 4 spare pins in the spares tray, from Tub 2', () => {
    assert.deepEqual(plan.sparesTray.lines, [
      { partCode: 'RB-020', needed: 4, allocated: 4, sources: [{ tub: 'Tub 2', qty: 4 }] },
    ]);
    assert.deepEqual(plan.classTray, { lines: [], consumables: [] });
  });

  it('suggests 2 groups of 5 and 5, and names the short controller', () => {
    const groups = plan.suggestions.find((s) => s.kind === 'groups');
    assert.ok(groups && groups.kind === 'groups');
    assert.equal(groups.groups, 2);
    assert.deepEqual(groups.sizes, [5, 5]);
    const controller = plan.suggestions.find((s) => s.kind === 'part' && s.partCode === 'RB-001');
    assert.ok(controller && controller.kind === 'part');
    // R6 wording: "n groups need n controllers; N usable tubs hold M".
    assert.equal(controller.message, '4 groups need 4 controllers; 3 usable tubs hold 3.');
    assert.deepEqual([controller.usable, controller.needed], [3, 4]);
  });

  it('warns that 4 groups need 4 devices and the class has 2', () => {
    const w = plan.warnings.find((x) => x.code === 'devices-short');
    assert.equal(w?.message, '4 groups need 4 devices; the class has 2.');
  });

  it('has pieces 15, 14, 11, 8, pack-away 6 min, planned 51 of 50, overrun 1 min', () => {
    assert.deepEqual(
      plan.groups.map((g) => g.pieces),
      [15, 14, 11, 8],
    );
    const t = plan.timeline;
    assert.equal(t.packAwayMinutes, 6);
    assert.equal(t.plannedMinutes, 51);
    assert.equal(t.windowMinutes, 50);
    assert.equal(t.slackMinutes, -1);
    assert.equal(t.packAwayStartsAt, '2026-07-28T11:54:00+09:30');
    const overrun = plan.warnings.find((x) => x.code === 'overrun');
    assert.match(overrun?.message ?? '', /^Activities overrun by 1 minute: /);
  });

  it('lays out the timeline and flags the coding activity that runs into pack-away', () => {
    // Derived from R8: set-out 5 from 11:10, build 25, code 15 (ends 11:55 > 11:54), no buffer.
    assert.deepEqual(
      plan.timeline.segments.map((s) => [
        s.label,
        s.startsAt.slice(11, 16),
        s.endsAt.slice(11, 16),
        s.overrun,
      ]),
      [
        ['Set out', '11:10', '11:15', false],
        ['Build the rover', '11:15', '11:40', false],
        ['Code the rover', '11:40', '11:55', true],
        ['Pack away', '11:54', '12:00', false],
      ],
    );
  });

  it('lists the tasks: charge 3 controllers by 07:55, pull 10 min by 11:00, devices by 11:06', () => {
    assert.deepEqual(
      plan.tasks.map(({ kind, label, minutes, startBy }) => ({ kind, label, minutes, startBy })),
      [
        {
          kind: 'charge',
          label: 'Charge 3 × Controller',
          minutes: 180,
          startBy: '2026-07-28T07:55:00+09:30',
        },
        // L = 11 lines, P = 52 pieces: 5 + ceil((11 × 20 + 52) / 60) = 10.
        {
          kind: 'pull',
          label: plan.tasks[1]!.label,
          minutes: 10,
          startBy: '2026-07-28T11:00:00+09:30',
        },
        {
          kind: 'devices',
          label: plan.tasks[2]!.label,
          minutes: 4,
          startBy: '2026-07-28T11:06:00+09:30',
        },
      ],
    );
    assert.equal(plan.totals.lines, 11);
    assert.equal(plan.totals.pieces, 52);
    assert.equal(plan.tasks[0]!.doneBy, '2026-07-28T10:55:00+09:30');
    assert.match(plan.tasks[1]!.label, /52 pieces \(11 lines\)/);
  });
});
