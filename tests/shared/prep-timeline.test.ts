/**
 * R7 devices, R8 timeline and R9 prep tasks of PREP-RULES.md, each on its own with invented
 * lessons. Expected values are worked out by hand from the rule text.
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import { computePrepPlan, DEFAULT_PREP_SETTINGS } from '../../shared/prep/index.js';
import { activity, lesson, part, tub } from './prep-fixtures.js';

const beam = part('X-1', 'Beam');
const controller = part('X-7', 'Controller', { category: 'controller', fullChargeMinutes: 180 });
const hhmm = (iso: string) => iso.slice(11, 16);

describe('R7 devices', () => {
  const withKinds = (kinds: ('build' | 'code' | 'test' | 'reflect')[], devices: number) =>
    computePrepPlan(
      lesson({
        class: { studentCount: 12, devices },
        activities: kinds.map((kind) => activity(kind, [], { kind })),
      }),
    );

  it('warns when a code or test activity needs more devices than the class has', () => {
    assert.deepEqual(
      withKinds(['build', 'test'], 2).warnings.filter((w) => w.code === 'devices-short'),
      [{ code: 'devices-short', message: '3 groups need 3 devices; the class has 2.' }],
    );
    assert.equal(withKinds(['code'], 2).warnings.length, 1);
  });

  it('does not warn with enough devices or without code and test activities', () => {
    assert.deepEqual(withKinds(['code'], 3).warnings, []);
    assert.deepEqual(withKinds(['build', 'reflect'], 0).warnings, []);
    assert.equal(withKinds(['build'], 0).tasks.filter((t) => t.kind === 'devices').length, 0);
  });
});

describe('R8 timeline', () => {
  /** One group of 1 taking `pieces` beams; activities of the given minutes, 11:00–11:50. */
  const timed = (minutes: number[], pieces = 1, extra: Parameters<typeof lesson>[0] = {}) =>
    computePrepPlan(
      lesson({
        lesson: { startsAt: '2026-07-28T11:00', endsAt: '2026-07-28T11:50', groupSize: 1 },
        class: { studentCount: 1, devices: 1 },
        parts: [beam],
        tubs: [tub('Tub 1', { 'X-1': 1000 })],
        activities: minutes.map((m, i) =>
          activity(`Step ${i + 1}`, [{ partCode: 'X-1', qty: pieces, per: 'group' }], {
            minutes: m,
          }),
        ),
        ...extra,
      }),
    );

  it('adds a buffer segment of the slack before pack-away', () => {
    // 1 piece: pack-away 5 + ceil(2 / 60) = 6; planned 5 + 20 + 6 = 31 of 50 → slack 19.
    const t = timed([20]).timeline;
    assert.deepEqual([t.packAwayMinutes, t.plannedMinutes, t.slackMinutes], [6, 31, 19]);
    assert.deepEqual(
      t.segments.map((s) => [s.kind, hhmm(s.startsAt), hhmm(s.endsAt), s.minutes]),
      [
        ['set-out', '11:00', '11:05', 5],
        ['activity', '11:05', '11:25', 20],
        ['buffer', '11:25', '11:44', 19],
        ['pack-away', '11:44', '11:50', 6],
      ],
    );
  });

  it('has no buffer and no overrun when the plan fills the window exactly', () => {
    // 30 pieces: pack-away 5 + ceil(60 / 60) = 6; 5 + 39 + 6 = 50.
    const plan = timed([39], 30);
    assert.equal(plan.timeline.slackMinutes, 0);
    assert.deepEqual(
      plan.timeline.segments.map((s) => s.kind),
      ['set-out', 'activity', 'pack-away'],
    );
    assert.ok(plan.timeline.segments.every((s) => !s.overrun));
    assert.deepEqual(plan.warnings, []);
  });

  it('rounds pack-away up per started minute of the largest group: 31 pieces → 2 minutes', () => {
    // 31 × 2 s = 62 s → ceil(62 / 60) = 2 → 5 + 2 = 7.
    assert.equal(timed([10], 31).timeline.packAwayMinutes, 7);
    assert.equal(
      timed([10], 31, { settings: { packAwayBaseMinutes: 0, packAwaySecondsPerPiece: 60 } })
        .timeline.packAwayMinutes,
      31,
    );
  });

  it('flags each activity that runs past the start of pack-away and warns of the overrun', () => {
    // 5 + 20 + 15 + 10 + 6 = 56 of 50: overrun 6; pack-away starts 11:44. Step 2 ends 11:40,
    // step 3 runs 11:40–11:50: only step 3 is flagged.
    const plan = timed([20, 15, 10]);
    assert.deepEqual(
      plan.timeline.segments.map((s) => [s.label, s.overrun]),
      [
        ['Set out', false],
        ['Step 1', false],
        ['Step 2', false],
        ['Step 3', true],
        ['Pack away', false],
      ],
    );
    assert.equal(plan.timeline.packAwayStartsAt, '2026-07-28T11:44:00+09:30');
    const w = plan.warnings.find((x) => x.code === 'overrun');
    assert.match(w?.message ?? '', /^Activities overrun by 6 minutes: /);
  });
});

describe('R9 prep tasks', () => {
  it('orders tasks by start time, ties in the order charge, sort, pull, devices', () => {
    const plan = computePrepPlan(
      lesson({
        class: { studentCount: 2, devices: 2 },
        lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 1 },
        parts: [part('X-7', 'Controller', { category: 'controller', fullChargeMinutes: 30 })],
        tubs: [tub('Tub 1', { 'X-7': 5 }), tub('Tub 4', {}, { status: 'needs-sorting' })],
        // Every task takes 30 minutes and is due at 11:10, so all start at 10:40.
        settings: {
          chargeBufferMinutes: 0,
          sortMinutesPerTub: 30,
          pullBaseMinutes: 30,
          pullSecondsPerLine: 0,
          pullSecondsPerPiece: 0,
          deviceCheckMinutesPerDevice: 15,
        },
        activities: [
          activity('Code', [{ partCode: 'X-7', qty: 1, per: 'group' }], { kind: 'code' }),
        ],
      }),
    );
    assert.deepEqual(
      plan.tasks.map((t) => [t.kind, t.label, t.minutes, hhmm(t.startBy), hhmm(t.doneBy)]),
      [
        ['charge', 'Charge 2 × Controller', 30, '10:40', '11:10'],
        ['sort', 'Sort and count Tub 4', 30, '10:40', '11:10'],
        ['pull', plan.tasks[2]!.label, 30, '10:40', '11:10'],
        ['devices', plan.tasks[3]!.label, 30, '10:40', '11:10'],
      ],
    );
  });

  it('is due charge-buffer minutes before the lesson: three hours for 11:10 → 07:55', () => {
    // Common practice, no published source: a small controller takes about three hours to
    // charge from empty. Buffer 15 (PREP-RULES.md default; about fifteen minutes to cool down
    // is also common practice, no published source).
    assert.equal(DEFAULT_PREP_SETTINGS.chargeBufferMinutes, 15);
    const plan = computePrepPlan(
      lesson({
        parts: [controller],
        tubs: [tub('Tub 1', { 'X-7': 1 }), tub('Tub 2', { 'X-7': 1 })],
        activities: [activity('Build', [{ partCode: 'X-7', qty: 1, per: 'group' }])],
      }),
    );
    const charge = plan.tasks.find((t) => t.kind === 'charge');
    assert.deepEqual(charge, {
      kind: 'charge',
      key: 'charge:X-7',
      label: 'Charge 2 × Controller',
      minutes: 180,
      startBy: '2026-07-28T07:55:00+09:30',
      doneBy: '2026-07-28T10:55:00+09:30',
    });
  });

  it('keys each task by what it is about, not by its counts (our rule for prep-task ticks)', () => {
    const plan = (groupSize: number) =>
      computePrepPlan(
        lesson({
          lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize },
          parts: [controller],
          tubs: [tub('Tub 1', { 'X-7': 2 }), tub('Tub 2', { 'X-7': 2 })],
          activities: [activity('Build', [{ partCode: 'X-7', qty: 1, per: 'group' }])],
        }),
      ).tasks;
    const [a, b] = [plan(4), plan(8)];
    assert.notDeepEqual(
      a.map((t) => t.label),
      b.map((t) => t.label),
    );
    assert.deepEqual(
      a.map((t) => t.key),
      b.map((t) => t.key),
    );
    assert.deepEqual(
      a.map((t) => t.key),
      ['charge:X-7', 'pull'],
    );
  });

  it('computes pull minutes from lines and pieces in integer arithmetic', () => {
    // 2 groups × 1 line + 0: L = 2, P = 2 × 45 = 90; 5 + ceil((40 + 90) / 60) = 5 + 3 = 8.
    const plan = computePrepPlan(
      lesson({ activities: [activity('Build', [{ partCode: 'X-1', qty: 45, per: 'group' }])] }),
    );
    const pull = plan.tasks.find((t) => t.kind === 'pull');
    assert.equal(pull?.minutes, 8);
    assert.equal(pull?.startBy, '2026-07-28T11:02:00+09:30');
  });

  it('warns of a recharge gap after an earlier lesson on a shared tub that day', () => {
    const base = {
      parts: [controller],
      tubs: [
        tub('Tub 1', { 'X-7': 1 }, { id: 'tub-a' }),
        tub('Tub 2', { 'X-7': 1 }, { id: 'tub-b' }),
      ],
      activities: [activity('Build', [{ partCode: 'X-7', qty: 1, per: 'group' }])],
    };
    const plan = computePrepPlan(
      lesson({
        ...base,
        earlierSameDay: [
          { endsAt: '2026-07-28T10:00', tubIds: ['tub-b', 'elsewhere'] },
          { endsAt: '2026-07-28T07:00', tubIds: ['tub-a'] },
        ],
      }),
    );
    // 10:00 → 11:10 leaves 70 minutes, under the 180 a full charge takes; 07:00 leaves 250.
    assert.deepEqual(
      plan.warnings.filter((w) => w.code === 'recharge-gap').map((w) => w.message),
      [
        'Tub 2 is used in a lesson that ends at 10:00 am, leaving 70 minutes to recharge the ' +
          'Controller before this lesson; a full charge takes about 180 minutes.',
      ],
    );
    const unshared = computePrepPlan(
      lesson({ ...base, earlierSameDay: [{ endsAt: '2026-07-28T10:00', tubIds: ['other'] }] }),
    );
    assert.equal(unshared.warnings.length, 0);
  });

  it('lists nothing to pull or charge when nothing is allocated', () => {
    const plan = computePrepPlan(lesson({ activities: [activity('Talk', [], { kind: 'intro' })] }));
    assert.deepEqual(plan.tasks, []);
    assert.deepEqual(plan.totals, { groups: 2, pieces: 0, lines: 0, tubsUsed: 0 });
  });
});
