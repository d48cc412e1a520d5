/**
 * The week that matters (issue 9): each agenda answer names the nearest weeks either side that
 * hold a lesson the agenda would list, so Home opens on this person's current or next week with
 * lessons, never on a week after one that has a lesson. Checked against the demo school's seeded
 * dates (server/seed): Rescue Rovers on Tuesdays 21 and 28 July, 4 and 18 August … 15 September
 * 2026, Smart Gates on Thursdays 23 July … 13 August, the relief teacher on 4 August only.
 * Weeks start on Monday (ISO 8601); 2026-07-21 is a Tuesday (checked in seed.test.ts with
 * Luxon over the IANA time zone database), so its week is that of Monday 2026-07-20.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { signedIn, testApp, type TestApp } from '../support/app.js';

let t: TestApp;

before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

async function weeks(email: string, week: string, mine = true) {
  const b = await signedIn(t.app, email);
  const res = await b.get(`/api/agenda?week=${week}${mine ? '&mine=true' : ''}`);
  assert.equal(res.status, 200, res.text);
  return { lessons: res.body.lessons.length as number, ...res.body.otherWeeks };
}

const TEACHER = 'teacher@kestrel-ridge.example';
const RELIEF = 'relief@kestrel-ridge.example';

describe('GET /api/agenda: the nearest weeks with lessons', () => {
  it('points an empty week before the term at the week of the first lesson, not the one after', async () => {
    assert.deepEqual(await weeks(TEACHER, '2026-07-06'), {
      lessons: 0,
      previous: null,
      next: '2026-07-20',
    });
  });

  it('names the weeks either side of a week with lessons, skipping none', async () => {
    // Week of 10 August: Smart Gates on the 13th (no Rover lesson that week).
    assert.deepEqual(await weeks(TEACHER, '2026-08-12'), {
      lessons: 1,
      previous: '2026-08-03',
      next: '2026-08-17',
    });
  });

  it('after the last lesson there is no next week, and the last week with lessons is named', async () => {
    assert.deepEqual(await weeks(TEACHER, '2026-12-02'), {
      lessons: 0,
      previous: '2026-09-14',
      next: null,
    });
  });

  it('counts only the relief teacher’s assigned lesson for them', async () => {
    assert.deepEqual(await weeks(RELIEF, '2026-07-20'), {
      lessons: 0,
      previous: null,
      next: '2026-08-03',
    });
    assert.deepEqual(await weeks(RELIEF, '2026-08-03'), {
      lessons: 1,
      previous: null,
      next: null,
    });
  });

  it('never names a week of another school’s lessons', async () => {
    assert.deepEqual(await weeks('admin@banksia-flat.example', '2026-07-20', false), {
      lessons: 0,
      previous: null,
      next: null,
    });
  });
});
