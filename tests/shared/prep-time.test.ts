/**
 * Wall-clock arithmetic checked against the IANA time zone database through reference
 * libraries: Luxon (DateTime in a zone) and the runtime's Intl (ICU's copy of the database).
 * Australia/Adelaide is UTC+09:30 in standard time and UTC+10:30 in daylight time, which begins
 * on the first Sunday of October (2026-10-04, 02:00 → 03:00) and ends on the first Sunday of
 * April (2026-04-05, 03:00 → 02:00).
 */
import assert from 'node:assert/strict';
import { describe, it } from 'node:test';
import fc from 'fast-check';
import { DateTime } from 'luxon';
import {
  computePrepPlan,
  formatInstant,
  intervalsOverlap,
  localToInstant,
  naturalCompare,
  offsetMinutes,
  sortByLabel,
} from '../../shared/prep/index.js';
import { activity, lesson, part, tub } from './prep-fixtures.js';

const ADL = 'Australia/Adelaide';

/** What Luxon says the local time is, as the engine formats it (`+00:00`, never `Z`). */
function luxonIso(local: string, zone: string): string {
  return DateTime.fromISO(local, { zone }).toFormat("yyyy-MM-dd'T'HH:mm:ssZZ");
}

/** One controller charged for `minutes` before a lesson starting at `startsAt`. */
function chargeTask(startsAt: string, endsAt: string, minutes: number) {
  const plan = computePrepPlan(
    lesson({
      lesson: { startsAt, endsAt, groupSize: 4 },
      class: { studentCount: 4, devices: 4 },
      parts: [part('X-7', 'Controller', { category: 'controller', fullChargeMinutes: minutes })],
      tubs: [tub('Tub 1', { 'X-7': 1 })],
      activities: [activity('Build', [{ partCode: 'X-7', qty: 1, per: 'group' }])],
    }),
  );
  return plan.tasks.find((t) => t.kind === 'charge')!;
}

describe('time zones (IANA database via Luxon and Intl)', () => {
  it('formats Adelaide at +09:30 in July and +10:30 after daylight time begins', () => {
    // Reference: Luxon and Intl offsets for Australia/Adelaide.
    assert.equal(
      formatInstant(localToInstant('2026-07-28T11:10', ADL)!, ADL),
      '2026-07-28T11:10:00+09:30',
    );
    assert.equal(luxonIso('2026-07-28T11:10', ADL), '2026-07-28T11:10:00+09:30');
    assert.equal(
      formatInstant(localToInstant('2026-10-05T09:00', ADL)!, ADL),
      '2026-10-05T09:00:00+10:30',
    );
    assert.equal(luxonIso('2026-10-05T09:00', ADL), '2026-10-05T09:00:00+10:30');
    const intl = new Intl.DateTimeFormat('en-US', { timeZone: ADL, timeZoneName: 'longOffset' });
    assert.match(intl.format(Date.UTC(2026, 6, 28)), /GMT\+09:30/);
    assert.match(intl.format(Date.UTC(2026, 9, 5)), /GMT\+10:30/);
    assert.equal(offsetMinutes(ADL, Date.UTC(2026, 0, 15)), 630);
  });

  it('agrees with Luxon on local times and offsets across zones and a year', () => {
    const zones = [
      ADL,
      'Europe/London',
      'America/New_York',
      'Asia/Kathmandu',
      'Pacific/Chatham',
      'UTC',
    ];
    for (const zone of zones) {
      for (let day = 0; day < 365; day += 3) {
        const d = DateTime.fromObject(
          { year: 2026, month: 1, day: 1, hour: 9, minute: 40 },
          { zone: 'UTC' },
        ).plus({ days: day });
        const local = d.toFormat("yyyy-MM-dd'T'HH:mm");
        const ms = localToInstant(local, zone);
        const ref = DateTime.fromISO(local, { zone });
        assert.equal(ms, ref.toMillis(), `${zone} ${local}`);
        assert.equal(formatInstant(ms!, zone), luxonIso(local, zone), `${zone} ${local}`);
      }
    }
  });

  it('knows the skipped and the repeated hour of Adelaide in 2026', () => {
    // 2026-10-04 02:30 does not exist; Luxon moves it forward an hour.
    assert.equal(localToInstant('2026-10-04T02:30', ADL), null);
    assert.equal(luxonIso('2026-10-04T02:30', ADL), '2026-10-04T03:30:00+10:30');
    // 2026-04-05 02:30 happens twice: the engine takes the earlier (+10:30) instant.
    const twice = localToInstant('2026-04-05T02:30', ADL)!;
    assert.equal(formatInstant(twice, ADL), '2026-04-05T02:30:00+10:30');
    assert.equal(formatInstant(twice + 3_600_000, ADL), '2026-04-05T02:30:00+09:30');
  });

  it('measures a lesson window across the change in elapsed minutes', () => {
    // 01:30 (+09:30) to 03:30 (+10:30) on 2026-10-04 is one real hour, not two.
    const plan = computePrepPlan(
      lesson({
        lesson: { startsAt: '2026-10-04T01:30', endsAt: '2026-10-04T03:30', groupSize: 4 },
      }),
    );
    assert.equal(plan.timeline.windowMinutes, 60);
    assert.equal(plan.timeline.segments[0]!.startsAt, '2026-10-04T01:30:00+09:30');
    assert.equal(plan.timeline.segments.at(-1)!.endsAt, '2026-10-04T03:30:00+10:30');
  });

  it('starts a charge by elapsed time: three hours before a 09:00 lesson on 2026-10-04', () => {
    // Common practice, no published source: a controller takes about three hours from empty.
    // Done by 08:45 (+10:30); three real hours earlier is 05:45 (+10:30). Daylight time began
    // at 02:00, before the charge starts, so here naive wall-clock subtraction agrees.
    const t = chargeTask('2026-10-04T09:00', '2026-10-04T09:50', 180);
    assert.equal(t.doneBy, '2026-10-04T08:45:00+10:30');
    assert.equal(t.startBy, '2026-10-04T05:45:00+10:30');
  });

  it('starts a charge that spans the change three real hours before, not naive wall time', () => {
    // Lesson 05:00 → done by 04:45 (+10:30) = 18:15 UTC; minus 3 h = 15:15 UTC = 00:45 (+09:30).
    // Naive subtraction of wall-clock times would say 01:45.
    const t = chargeTask('2026-10-04T05:00', '2026-10-04T05:50', 180);
    assert.equal(t.doneBy, '2026-10-04T04:45:00+10:30');
    assert.equal(t.startBy, '2026-10-04T00:45:00+09:30');
    const ref = DateTime.fromISO('2026-10-04T04:45', { zone: ADL }).minus({ minutes: 180 });
    assert.equal(t.startBy, ref.toISO({ suppressMilliseconds: true }));
    // An overnight charge before a 09:00 lesson: 10 real hours before 08:45 (+10:30) is
    // 21:45 (+09:30) the evening before, where naive subtraction says 22:45.
    const night = chargeTask('2026-10-04T09:00', '2026-10-04T09:50', 600);
    assert.equal(night.startBy, '2026-10-03T21:45:00+09:30');
  });

  it('starts a charge across the end of daylight time (2026-04-05) an hour later on the clock', () => {
    // Done by 08:45 (+09:30) = 23:15 UTC on 4 April; minus 8 h = 15:15 UTC = 01:45 (+10:30).
    const t = chargeTask('2026-04-05T09:00', '2026-04-05T09:50', 480);
    assert.equal(t.startBy, '2026-04-05T01:45:00+10:30');
    const ref = DateTime.fromISO('2026-04-05T08:45', { zone: ADL }).minus({ minutes: 480 });
    assert.equal(t.startBy, ref.toISO({ suppressMilliseconds: true }));
  });

  it('writes every time with the offset Luxon gives for that instant, around both changes', () => {
    // Reference: Luxon's offset for each instant; durations are elapsed time.
    const days = [
      '2026-04-04',
      '2026-04-05',
      '2026-04-06',
      '2026-10-03',
      '2026-10-04',
      '2026-10-05',
    ];
    fc.assert(
      fc.property(
        fc.constantFrom(...days),
        fc.integer({ min: 0, max: 23 }),
        fc.integer({ min: 1, max: 1440 }),
        fc.integer({ min: 0, max: 1440 }),
        (date, hour, charge, buffer) => {
          const startsAt = `${date}T${String(hour).padStart(2, '0')}:00`;
          const start = localToInstant(startsAt, ADL);
          if (start === null) return; // 02:00 on 2026-10-04 does not exist
          const end = DateTime.fromMillis(start + 50 * 60_000, { zone: ADL });
          const plan = computePrepPlan(
            lesson({
              lesson: { startsAt, endsAt: end.toFormat("yyyy-MM-dd'T'HH:mm"), groupSize: 4 },
              parts: [
                part('X-7', 'Controller', { category: 'controller', fullChargeMinutes: charge }),
              ],
              tubs: [tub('Tub 1', { 'X-7': 2 }), tub('Tub 2', {}, { status: 'needs-sorting' })],
              activities: [
                activity('Code', [{ partCode: 'X-7', qty: 1, per: 'group' }], { kind: 'code' }),
              ],
              settings: { chargeBufferMinutes: buffer },
            }),
          );
          const times = [
            plan.timeline.packAwayStartsAt,
            ...plan.timeline.segments.flatMap((x) => [x.startsAt, x.endsAt]),
            ...plan.tasks.flatMap((t) => [t.startBy, t.doneBy]),
          ];
          for (const iso of times) {
            const ref = DateTime.fromMillis(Date.parse(iso), { zone: ADL });
            assert.equal(iso, ref.toFormat("yyyy-MM-dd'T'HH:mm:ssZZ"));
          }
          assert.equal(plan.timeline.windowMinutes, 50);
          const c = plan.tasks.find((t) => t.kind === 'charge')!;
          assert.equal(Date.parse(c.doneBy), start - buffer * 60_000);
          assert.equal(Date.parse(c.doneBy) - Date.parse(c.startBy), charge * 60_000);
        },
      ),
      { numRuns: 400, seed: 20261004 },
    );
  });

  it('relies on no zone changing offset twice within two days (all zones, 2026)', () => {
    // Checked against the runtime's IANA database (Intl): sample every 3 hours through 2026.
    const start = Date.UTC(2026, 0, 1);
    const end = Date.UTC(2027, 0, 1);
    const step = 3 * 3_600_000;
    let zonesWithChanges = 0;
    for (const zone of Intl.supportedValuesOf('timeZone')) {
      let prev = offsetMinutes(zone, start);
      let lastChange = -Infinity;
      let changed = false;
      for (let t = start + step; t < end; t += step) {
        const off = offsetMinutes(zone, t);
        if (off === prev) continue;
        assert.ok(
          t - lastChange > 2 * 86_400_000,
          `${zone} changes twice near ${new Date(t).toISOString()}`,
        );
        lastChange = t;
        prev = off;
        changed = true;
      }
      if (changed) zonesWithChanges++;
    }
    assert.ok(zonesWithChanges > 50, 'many zones observe daylight time');
  });
});

describe('intervals and labels', () => {
  it('treats lessons as half-open spans: back to back is no clash', () => {
    const a = { startsAt: '2026-07-28T10:00:00+09:30', endsAt: '2026-07-28T11:00:00+09:30' };
    const b = { startsAt: '2026-07-28T11:00:00+09:30', endsAt: '2026-07-28T11:50:00+09:30' };
    const c = { startsAt: '2026-07-28T01:20:00Z', endsAt: '2026-07-28T02:00:00Z' }; // 10:50–11:30 +09:30
    assert.equal(intervalsOverlap(a, b), false);
    assert.equal(intervalsOverlap(a, c), true);
    assert.equal(intervalsOverlap(b, c), true);
    assert.equal(intervalsOverlap({ startsAt: 5, endsAt: 5 }, { startsAt: 0, endsAt: 10 }), false);
    assert.throws(
      () => intervalsOverlap({ startsAt: '2026-07-28T10:00', endsAt: 1 }, a),
      RangeError,
    );
  });

  it('sorts labels like Intl.Collator with numeric collation, independent of the runtime', () => {
    // Reference: Intl.Collator('en', { numeric: true }) (ICU).
    const labels = [
      'Tub 10',
      'Tub 2',
      'Tub 1',
      'tub 3',
      'Tub 21',
      'Tub 2b',
      'Crate 4',
      'Tub 100',
      'Tub 9',
    ];
    const collator = new Intl.Collator('en', { numeric: true });
    assert.deepEqual([...labels].sort(naturalCompare), [...labels].sort(collator.compare));
    assert.deepEqual(
      sortByLabel(labels.map((label) => ({ label })))
        .map((t) => t.label)
        .slice(0, 4),
      ['Crate 4', 'Tub 1', 'Tub 2', 'Tub 2b'],
    );
    // Ties that a collator may call equal still get one fixed order.
    assert.equal(naturalCompare('Tub 02', 'Tub 2'), -naturalCompare('Tub 2', 'Tub 02'));
    assert.notEqual(naturalCompare('Tub 02', 'Tub 2'), 0);
    assert.notEqual(naturalCompare('Tub 2', 'tub 2'), 0);
    assert.ok(naturalCompare('Tub 99999999999999999999', 'Tub 100000000000000000000') < 0);
  });

  it('is a total order: antisymmetric, transitive, and 0 only for equal labels', () => {
    const label = fc.stringMatching(/^[A-Za-z ]{0,3}[0-9]{0,3}[a-c ]{0,2}[0-9]{0,2}$/);
    fc.assert(
      fc.property(label, label, label, (a, b, c) => {
        assert.equal(Math.sign(naturalCompare(a, b)), -Math.sign(naturalCompare(b, a)));
        assert.equal(naturalCompare(a, b) === 0, a === b);
        const [x, y, z] = [a, b, c].sort(naturalCompare);
        assert.ok(naturalCompare(x!, z!) <= 0);
        assert.ok(naturalCompare(x!, y!) <= 0 && naturalCompare(y!, z!) <= 0);
      }),
      { numRuns: 2000, seed: 4 },
    );
  });
});
