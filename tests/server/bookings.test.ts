/**
 * GET /api/bookings: the school's tub bookings day by day with double bookings marked. Lessons
 * are [startsAt, endsAt) intervals (PREP-RULES.md, "Across lessons"): two lessons conflict when
 * they overlap and book a common tub; a lesson that starts when another ends does not overlap.
 * Every expected flag below is worked out by hand from the times and tubs written here.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  BANKSIA_FLAT,
  KESTREL_RIDGE,
  LEAD,
  OTHER_ADMIN,
  OTHER_TEACHER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  insertClass,
  insertKit,
  insertLesson,
  insertTubs,
  insertUnit,
  schoolIds,
  userByEmail,
  type SignIn,
} from '../support/planning.js';

let t: TestApp;
let as: SignIn;
const id: Record<string, string> = {};

interface Booking {
  lessonId: string;
  lessonTitle: string;
  unitTitle: string;
  readable: boolean;
  startsAt: string;
  tubs: { label: string; kitTypeName: string }[];
  conflict: boolean;
  conflicts: { lessonId: string; tubs: string[] }[];
}
type Days = { date: string; bookings: Booking[] }[];

const WEEK = '/api/bookings?from=2027-03-01&to=2027-03-08';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel, banksia } = await schoolIds(db);
  const teacher = await userByEmail(db, TEACHER);
  const relief = await userByEmail(db, RELIEF);
  const kit = await insertKit(db, kestrel, { name: 'Bookings kit' });
  const tub = await insertTubs(db, kestrel, kit, ['B-Tub 1', 'B-Tub 2', 'B-Tub 3']);
  const classId = await insertClass(db, kestrel, {
    name: 'BK',
    yearLevel: 5,
    studentCount: 12,
    devices: 2,
  });
  const unitId = await insertUnit(db, {
    schoolId: kestrel,
    ownerId: teacher.id,
    title: 'Bookings unit',
    yearLevel: 5,
  });
  const lesson = async (title: string, day: string, from: string, to: string, tubs: string[]) =>
    insertLesson(
      db,
      {
        schoolId: kestrel,
        unitId,
        title,
        classId,
        kitTypeId: kit,
        startsAt: `${day} ${from}:00`,
        endsAt: `${day} ${to}:00`,
        groupSize: 3,
        reliefTeacherId: title === 'Overlaps A' ? relief.id : null,
      },
      tubs.map((label) => tub[label]!),
    );
  // A and "Overlaps A" share B-Tub 2 from 09:30 to 10:00: a double booking.
  id['a'] = await lesson('Lesson A', '2027-03-02', '09:00', '10:00', ['B-Tub 1', 'B-Tub 2']);
  id['b'] = await lesson('Overlaps A', '2027-03-02', '09:30', '10:30', ['B-Tub 2']);
  // Starts as "Overlaps A" ends ([start, end) intervals touch, not overlap): not a conflict.
  id['c'] = await lesson('Right after', '2027-03-02', '10:30', '11:20', ['B-Tub 2']);
  // Same time as A, other tub: not a conflict.
  id['d'] = await lesson('Same time other tub', '2027-03-02', '09:00', '10:00', ['B-Tub 3']);
  id['e'] = await lesson('Thursday', '2027-03-04', '13:00', '13:50', ['B-Tub 1']);
  // A colleague's lesson in a unit they keep private: its tub is the school's all the same.
  const colleague = await addTeacher(db, KESTREL_RIDGE, 'colleague@kestrel-ridge.example');
  const privateUnit = await insertUnit(db, {
    schoolId: kestrel,
    ownerId: colleague,
    title: 'Private unit',
    yearLevel: 5,
  });
  id['private'] = await insertLesson(
    db,
    {
      schoolId: kestrel,
      unitId: privateUnit,
      title: 'Colleague lesson',
      classId,
      kitTypeId: kit,
      startsAt: '2027-03-03 09:00:00',
      endsAt: '2027-03-03 09:50:00',
      groupSize: 3,
    },
    [tub['B-Tub 3']!],
  );
  // The other school: same day and time, a tub of its own; it must never show at Kestrel Ridge.
  const otherTeacher = await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  const otherKit = await insertKit(db, banksia, { name: 'Their kit' });
  const otherTub = await insertTubs(db, banksia, otherKit, ['Their tub']);
  const otherClass = await insertClass(db, banksia, {
    name: 'OT',
    yearLevel: 5,
    studentCount: 10,
    devices: 1,
  });
  const otherUnit = await insertUnit(db, {
    schoolId: banksia,
    ownerId: otherTeacher,
    title: 'Their unit',
    yearLevel: 5,
  });
  id['other'] = await insertLesson(
    db,
    {
      schoolId: banksia,
      unitId: otherUnit,
      title: 'Their lesson',
      classId: otherClass,
      kitTypeId: otherKit,
      startsAt: '2027-03-02 09:00:00',
      endsAt: '2027-03-02 10:00:00',
      groupSize: 3,
    },
    [otherTub['Their tub']!],
  );
});

after(async () => {
  await t.close();
});

const all = (days: Days) => days.flatMap((d) => d.bookings);
const byId = (days: Days, lessonId: string) => all(days).find((b) => b.lessonId === lessonId);

describe('GET /api/bookings', () => {
  it('marks a double booking on both lessons, naming the other lesson and the shared tub', async () => {
    const res = await (await as(TEACHER)).get(WEEK);
    assert.equal(res.status, 200, res.text);
    const days: Days = res.body.days;
    const a = byId(days, id['a']!)!;
    const b = byId(days, id['b']!)!;
    assert.equal(a.conflict, true);
    assert.equal(b.conflict, true);
    assert.deepEqual(
      a.conflicts.map((c) => [c.lessonId, c.tubs]),
      [[id['b'], ['B-Tub 2']]],
    );
    assert.deepEqual(
      b.conflicts.map((c) => [c.lessonId, c.tubs]),
      [[id['a'], ['B-Tub 2']]],
    );
    assert.deepEqual(
      a.tubs.map((x) => [x.label, x.kitTypeName]),
      [
        ['B-Tub 1', 'Bookings kit'],
        ['B-Tub 2', 'Bookings kit'],
      ],
    );
  });

  it('does not mark lessons that only touch in time, or overlap on other tubs', async () => {
    const days: Days = (await (await as(TEACHER)).get(WEEK)).body.days;
    assert.equal(byId(days, id['c']!)!.conflict, false, '10:30 start after a 10:30 end');
    assert.deepEqual(byId(days, id['c']!)!.conflicts, []);
    assert.equal(byId(days, id['d']!)!.conflict, false, 'same time, B-Tub 3 only');
    assert.equal(byId(days, id['e']!)!.conflict, false);
  });

  it('answers every day of the range, each day’s bookings in time order', async () => {
    const days: Days = (await (await as(TEACHER)).get(WEEK)).body.days;
    assert.deepEqual(
      days.map((d) => d.date),
      [
        '2027-03-01',
        '2027-03-02',
        '2027-03-03',
        '2027-03-04',
        '2027-03-05',
        '2027-03-06',
        '2027-03-07',
      ],
      'from included, to excluded',
    );
    const tuesday = days[1]!.bookings;
    assert.deepEqual(
      tuesday.map((x) => x.startsAt),
      ['2027-03-02T09:00', '2027-03-02T09:00', '2027-03-02T09:30', '2027-03-02T10:30'],
    );
    assert.deepEqual(
      days[3]!.bookings.map((x) => x.lessonTitle),
      ['Thursday'],
    );
  });

  it('shows only the actor’s school, and nothing to a signed-out visitor', async () => {
    const mine = all((await (await as(LEAD)).get(WEEK)).body.days);
    assert.ok(mine.some((x) => x.lessonId === id['a']));
    assert.ok(!mine.some((x) => x.lessonId === id['other']));
    const theirs = await (await as(OTHER_TEACHER)).get(WEEK);
    assert.equal(theirs.status, 200, theirs.text);
    assert.deepEqual(
      all(theirs.body.days).map((x) => x.lessonTitle),
      ['Their lesson'],
    );
    const anonymous = new Browser(t.app);
    assert.equal((await anonymous.get(WEEK)).status, 401);
  });

  it('shows an admin every booking of the school, none of another school, linking none', async () => {
    const days: Days = (await (await as(ADMIN)).get(WEEK)).body.days;
    // 'a' and 'd' both start at 09:00: the route breaks the tie by lesson id (random uuids).
    const nine = [id['a']!, id['d']!].sort();
    const ids = [...nine, ...['b', 'c', 'private', 'e'].map((k) => id[k])];
    assert.deepEqual(
      all(days).map((x) => x.lessonId),
      ids,
      'every Kestrel Ridge lesson of the week, in time order',
    );
    // Admins do not read units (policy.ts): the lesson is named, its unit is not.
    assert.ok(all(days).every((x) => !x.readable && x.unitTitle === ''));
    assert.equal(byId(days, id['a']!)!.conflict, true);
    const theirs: Days = (await (await as(OTHER_ADMIN)).get(WEEK)).body.days;
    assert.deepEqual(
      all(theirs).map((x) => x.lessonTitle),
      ['Their lesson'],
    );
  });

  it('shows a teacher a colleague’s private lesson as a booking they cannot open', async () => {
    const days: Days = (await (await as(TEACHER)).get(WEEK)).body.days;
    const theirs = byId(days, id['private']!)!;
    assert.deepEqual(
      [theirs.lessonTitle, theirs.unitTitle, theirs.readable],
      ['Colleague lesson', '', false],
    );
    const own = byId(days, id['a']!)!;
    assert.deepEqual([own.unitTitle, own.readable], ['Bookings unit', true]);
    // A lead reads every unit of the school, so it opens for them.
    const lead: Days = (await (await as(LEAD)).get(WEEK)).body.days;
    assert.deepEqual(
      [byId(lead, id['private']!)!.unitTitle, byId(lead, id['private']!)!.readable],
      ['Private unit', true],
    );
  });

  it('shows a relief teacher only the lessons the policy lets them read (their assigned ones)', async () => {
    const days: Days = (await (await as(RELIEF)).get(WEEK)).body.days;
    assert.deepEqual(
      all(days).map((x) => x.lessonId),
      [id['b']],
    );
    assert.equal(all(days)[0]!.conflict, true);
  });

  it('refuses impossible dates and ranges with 400', async () => {
    const b = await as(TEACHER);
    for (const query of [
      'from=2027-02-29&to=2027-03-08', // 2027 is not a leap year
      'from=2027-03-01&to=2027-04-31',
      'from=2027-03-01',
      'from=nope&to=2027-03-08',
      'from=2027-03-08&to=2027-03-08', // empty range: to is exclusive
      'from=2027-03-08&to=2027-03-01',
      'from=2027-03-01&to=2027-06-10', // 101 days
      'from=2027-03-01&to=2027-03-08%00',
    ]) {
      const res = await b.get(`/api/bookings?${query}`);
      assert.equal(res.status, 400, `${query}: ${res.text}`);
    }
    // 100 days is the most one request may ask for.
    assert.equal((await b.get('/api/bookings?from=2027-03-01&to=2027-06-09')).status, 200);
  });
});
