/**
 * Bad input is rejected with every problem listed (PREP-RULES.md, "Input"): never NaN, a
 * negative count or a partial plan. Defaults come from PREP-RULES.md's settings list.
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import {
  computePrepPlan,
  DEFAULT_PREP_SETTINGS,
  prepInputSchema,
  PrepInputError,
  validatePrepInput,
  type PrepInput,
} from '../../shared/prep/index.js';
import { activity, lesson, part, tub, workedExample } from './prep-fixtures.js';

/** The issues of a rejected input, as "path: message" strings. */
function problems(input: unknown): string[] {
  try {
    computePrepPlan(input as PrepInput);
  } catch (e) {
    assert.ok(e instanceof PrepInputError, `threw ${String(e)}`);
    assert.equal(e.name, 'PrepInputError');
    return e.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  }
  assert.fail('the input was accepted');
}

function hasProblem(list: string[], path: string, message?: RegExp): void {
  const hit = list.find((p) => p.startsWith(`${path}: `) && (!message || message.test(p)));
  assert.ok(hit, `expected a problem at ${path}; got ${JSON.stringify(list)}`);
}

const base = lesson;

describe('bad prep input', () => {
  it('rejects a part code that is not in the parts list', () => {
    const list = problems(
      base({ activities: [activity('A', [{ partCode: 'Z-9', qty: 1, per: 'group' }])] }),
    );
    assert.deepEqual(list, [
      'activities.0.materials.0.partCode: Part code Z-9 is not in the parts list.',
    ]);
  });

  it('rejects an end that is not after the start, and a window over 480 minutes', () => {
    const same = problems(
      base({ lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T11:10', groupSize: 4 } }),
    );
    assert.deepEqual(same, ['lesson.endsAt: The lesson must end after it starts.']);
    const before = problems(
      base({ lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T09:00', groupSize: 4 } }),
    );
    hasProblem(before, 'lesson.endsAt', /must end after it starts/);
    const long = problems(
      base({ lesson: { startsAt: '2026-07-28T08:00', endsAt: '2026-07-28T16:01', groupSize: 4 } }),
    );
    assert.deepEqual(long, [
      'lesson.endsAt: The lesson is 481 minutes long; at most 480 minutes are allowed.',
    ]);
    // Exactly 480 minutes is allowed.
    assert.equal(
      computePrepPlan(
        base({
          lesson: { startsAt: '2026-07-28T08:00', endsAt: '2026-07-28T16:00', groupSize: 4 },
        }),
      ).timeline.windowMinutes,
      480,
    );
  });

  it('rejects fractions where whole numbers belong', () => {
    const input = workedExample();
    input.lesson.groupSize = 2.5;
    input.class.studentCount = 20.5;
    input.activities[0]!.minutes = 10.5;
    input.activities[0]!.materials[0]!.qty = 1.5;
    input.tubs[0]!.stock!['RB-010'] = 3.5;
    input.settings = { sparesPercent: 12.5 };
    const list = problems(input);
    for (const path of [
      'lesson.groupSize',
      'class.studentCount',
      'activities.0.minutes',
      'activities.0.materials.0.qty',
      'tubs.0.stock.RB-010',
      'settings.sparesPercent',
    ]) {
      hasProblem(list, path, /whole number/);
    }
    assert.equal(list.length, 6);
  });

  it('rejects an unknown time zone and an offset given as a zone', () => {
    hasProblem(problems(base({ timezone: 'Mars/Olympus_Mons' })), 'timezone', /IANA/);
    hasProblem(problems(base({ timezone: '+09:30' })), 'timezone', /IANA/);
  });

  it('rejects duplicate part codes, tub labels and tub ids', () => {
    const list = problems(
      base({
        parts: [part('X-1', 'Beam'), part('X-1', 'Other beam')],
        tubs: [tub('Tub 1', {}), tub(' Tub 1 ', {}, { id: 'id-Tub 1' })],
      }),
    );
    assert.deepEqual(list, [
      'parts.1.code: Part code X-1 appears more than once in the parts list.',
      'tubs.1.label: Tub 1 is booked more than once.',
      'tubs.1.id: Tub id id-Tub 1 appears more than once.',
    ]);
  });

  it('rejects stock of a part that is not in the parts list, and bad counts', () => {
    const list = problems(base({ tubs: [tub('Tub 1', { 'X-1': -1, 'Q-5': 2 })] }));
    assert.deepEqual(list, [
      'tubs.0.stock.X-1: Must be at least 0.',
      'tubs.0.stock.Q-5: Tub 1 holds part code Q-5, which is not in the parts list.',
    ]);
  });

  it('rejects NaN, infinities, negative counts and out-of-range settings', () => {
    const list = problems(
      base({
        class: { studentCount: Number.NaN, devices: -1 },
        activities: [
          activity('A', [{ partCode: 'X-1', qty: Number.POSITIVE_INFINITY, per: 'group' }]),
        ],
        settings: { sparesPercent: 51, setOutMinutes: -5 },
      }),
    );
    for (const path of [
      'class.studentCount',
      'class.devices',
      'activities.0.materials.0.qty',
      'settings.sparesPercent',
      'settings.setOutMinutes',
    ]) {
      hasProblem(list, path);
    }
  });

  it('rejects a material that is both or neither a part and a consumable', () => {
    const list = problems(
      base({
        activities: [
          activity('A', [
            { partCode: 'X-1', consumable: 'Tape', qty: 1, per: 'group' },
            { qty: 1, per: 'group' },
          ]),
        ],
      }),
    );
    assert.deepEqual(list, [
      'activities.0.materials.0: A material is either a part (partCode) or a consumable.',
      'activities.0.materials.1: A material is either a part (partCode) or a consumable.',
    ]);
  });

  it('rejects dates that do not exist and local times in a daylight-saving gap', () => {
    const feb = problems(
      base({ lesson: { startsAt: '2026-02-30T11:10', endsAt: '2026-02-30T12:00', groupSize: 4 } }),
    );
    hasProblem(feb, 'lesson.startsAt', /not a real date/);
    // IANA tz database: Australia/Adelaide moves from 02:00 to 03:00 on 2026-10-04.
    const gap = problems(
      base({ lesson: { startsAt: '2026-10-04T02:30', endsAt: '2026-10-04T04:00', groupSize: 4 } }),
    );
    assert.deepEqual(gap, [
      'lesson.startsAt: 2026-10-04T02:30 does not exist in Australia/Adelaide: the clocks skip it when daylight time begins.',
    ]);
    hasProblem(
      problems(base({ lesson: { startsAt: '11:10', endsAt: '2026-07-28T12:00', groupSize: 4 } })),
      'lesson.startsAt',
      /like 2026-07-28T11:10/,
    );
  });

  it('lists every problem at once, shape errors and rule errors together', () => {
    const input = workedExample();
    input.timezone = 'Nowhere/Land';
    input.lesson.groupSize = 9;
    input.parts.push(part('RB-001', 'Second controller'));
    input.activities[1]!.materials.push({ partCode: 'RB-404', qty: 1, per: 'group' });
    input.activities[1]!.kind = 'coding' as never;
    const list = problems(input);
    hasProblem(list, 'timezone');
    hasProblem(list, 'lesson.groupSize', /at most 8/);
    hasProblem(list, 'parts.3.code', /more than once/);
    hasProblem(list, 'activities.1.materials.2.partCode', /RB-404/);
    hasProblem(list, 'activities.1.kind');
    assert.equal(list.length, 5);
    try {
      computePrepPlan(input);
    } catch (e) {
      assert.ok(e instanceof PrepInputError);
      assert.match(e.message, /^The prep input has 5 problems: timezone: /);
      assert.match(
        e.message,
        /activities\.1\.materials\.2\.partCode: Part code RB-404 is not in the parts list\./,
      );
    }
  });

  it('rejects what is not an object at all', () => {
    assert.ok(problems(null).length >= 1);
    const empty = problems({});
    assert.equal(empty.length, 6);
    hasProblem(empty, 'lesson', /^lesson: Required\.$/);
    hasProblem(empty, 'parts', /^parts: Required\.$/);
  });
});

describe('valid prep input', () => {
  it('fills in the default settings of PREP-RULES.md', () => {
    // Source: PREP-RULES.md "settings (school settings; defaults in brackets)".
    assert.deepEqual(DEFAULT_PREP_SETTINGS, {
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
    assert.deepEqual(validatePrepInput(lesson()).settings, DEFAULT_PREP_SETTINGS);
    const partial = validatePrepInput(lesson({ settings: { sparesPercent: 20 } })).settings;
    assert.deepEqual(partial, { ...DEFAULT_PREP_SETTINGS, sparesPercent: 20 });
    assert.deepEqual(validatePrepInput(lesson()).earlierSameDay, []);
  });

  it('parses with the exported schema alone, and rejects cross-field problems there too', () => {
    assert.equal(prepInputSchema.safeParse(workedExample()).success, true);
    const bad = prepInputSchema.safeParse(
      base({ activities: [activity('A', [{ partCode: 'Z', qty: 1, per: 'group' }])] }),
    );
    assert.equal(bad.success, false);
    assert.deepEqual(
      bad.error?.issues.map((i) => i.path.join('.')),
      ['activities.0.materials.0.partCode'],
    );
  });

  it('does not change the caller’s input', () => {
    const input = workedExample();
    const before = JSON.stringify(input);
    computePrepPlan(input);
    assert.equal(JSON.stringify(input), before);
  });
});
