/**
 * Copying a unit (API.md, "Reuse", POST /api/units/:id/copy) against a real PostgreSQL: deep and
 * independent, atomic, in order with quantities, dates moved by whole days in the school's
 * timezone across a daylight-saving change, plans recomputed as from scratch, and who may copy.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { count, eq, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  BANKSIA_FLAT,
  LEAD,
  OTHER_TEACHER,
  PARTNER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  download,
  insertClass,
  insertKit,
  insertTubs,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  activities,
  attachments,
  lessons,
  materials,
  nonTeachingDays,
  outcomeFrameworks,
  outcomes,
  unitCopies,
  unitEvents,
  units,
} from '../../server/db/schema/index.js';
import { summaryText } from '../../server/reuse/plan-counts.js';
import type { Activity } from '../../shared/schemas/lessons.js';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { Response } from 'supertest';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let kestrel = '';
let bigClass = '';
let smallClass = '';
let otherSchoolClass = '';
let kitTypeId = '';
let tubIds: Record<string, string> = {};
let sourceId = '';
const sourceLessonIds: string[] = [];
let outcomeIds: string[] = [];

/** ISO 32000-1 §7.5.2: a PDF file begins with the header `%PDF-1.n`. */
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n',
);
const ZONE = 'Australia/Adelaide';

/** The answer's JSON once its status is as expected (supertest types a body as `any`). */
function ok(res: Response, status = 200) {
  assert.equal(res.status, status, res.text);
  return res.body;
}

async function upload(email: string, activityId: string, bytes: Buffer, filename: string) {
  const b = await as(email);
  await b.ensureCsrf();
  return b.agent
    .post(`/api/activities/${activityId}/attachments`)
    .set('X-XSRF-TOKEN', b.csrf)
    .attach('file', bytes, { filename, contentType: 'application/pdf' });
}

/** Rows of the planning tables, to prove a refused or failed copy wrote nothing. */
async function counts() {
  const db = t.database.db;
  const n = async (table: PgTable) => Number((await db.select({ n: count() }).from(table))[0]!.n);
  return {
    units: await n(units),
    lessons: await n(lessons),
    activities: await n(activities),
    materials: await n(materials),
    attachments: await n(attachments),
    copies: await n(unitCopies),
    events: await n(unitEvents),
  };
}

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const schools = await schoolIds(db);
  kestrel = schools.kestrel;
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  ids = await userIds(db);
  bigClass = await insertClass(db, kestrel, {
    name: '4Q',
    yearLevel: 4,
    studentCount: 27,
    devices: 8,
  });
  smallClass = await insertClass(db, kestrel, {
    name: '4R',
    yearLevel: 4,
    studentCount: 21,
    devices: 8,
  });
  otherSchoolClass = await insertClass(db, schools.banksia, {
    name: 'Elsewhere',
    yearLevel: 4,
    studentCount: 20,
    devices: 5,
  });
  kitTypeId = await insertKit(db, kestrel, {
    name: 'Copy Trial Tub',
    parts: [
      { code: 'CT-CTL', name: 'Hub', category: 'controller', qty: 1, chargeMinutes: 180 },
      { code: 'CT-MOT', name: 'Drive motor', category: 'motor', qty: 2 },
      { code: 'CT-WHL', name: 'Wheel', category: 'wheel', qty: 4 },
    ],
  });
  tubIds = await insertTubs(db, kestrel, kitTypeId, [
    'Tub 1',
    'Tub 2',
    'Tub 3',
    'Tub 4',
    'Tub 5',
    'Tub 6',
    'Tub 7',
    { label: 'Tub 8', status: 'retired' },
  ]);
  const [fw] = await db
    .insert(outcomeFrameworks)
    .values({ schoolId: kestrel, name: 'Copy framework' })
    .returning();
  outcomeIds = (
    await db
      .insert(outcomes)
      .values([
        { frameworkId: fw!.id, code: 'CF-1', description: 'Builds a rover.', yearBand: '3-4' },
        { frameworkId: fw!.id, code: 'CF-2', description: 'Tests a rover.', yearBand: '3-4' },
      ])
      .returning()
  ).map((o) => o.id);

  // The teacher's unit, shared with the school: two lessons in September (before daylight time
  // begins on 2026-10-04 in Australia/Adelaide), three activities in the first, a file in the second.
  const teacher = await as(TEACHER);
  const unit = await ok(
    await teacher.post('/api/units', { title: 'Flood rovers', yearLevel: 4, term: 3 }),
    201,
  );
  sourceId = unit.id;
  await ok(
    await teacher.patch(`/api/units/${sourceId}`, {
      version: unit.version,
      visibility: 'school',
      outcomeIds,
    }),
  );
  const lessonBodies = [
    { title: 'Chassis', day: '2026-09-22', start: '11:10', end: '12:00' },
    { title: 'Drive', day: '2026-09-29', start: '13:40', end: '14:30' },
  ];
  for (const l of lessonBodies) {
    const lesson = await ok(
      await teacher.post(`/api/units/${sourceId}/lessons`, {
        title: l.title,
        classId: bigClass,
        kitTypeId,
        startsAt: `${l.day}T${l.start}`,
        endsAt: `${l.day}T${l.end}`,
        groupSize: 3,
        // The original books only some tubs and has a relief teacher; the copy does neither.
        tubIds: [tubIds['Tub 1']!, tubIds['Tub 2']!, tubIds['Tub 3']!],
        reliefTeacherId: ids[RELIEF],
        reliefNotes: `Notes for ${l.title}`,
        room: 'Room 9',
      }),
      201,
    );
    sourceLessonIds.push(lesson.id);
  }
  const acts = [
    {
      title: 'Unpack',
      kind: 'intro',
      minutes: 5,
      materials: [{ consumable: 'Name labels', qty: 1, per: 'group' }],
    },
    {
      title: 'Build base',
      kind: 'build',
      minutes: 25,
      materials: [
        { partCode: 'CT-WHL', qty: 4, per: 'group' },
        { partCode: 'CT-MOT', qty: 2, per: 'group' },
        { partCode: 'CT-CTL', qty: 1, per: 'group' },
      ],
    },
    { title: 'Test run', kind: 'test', minutes: 10, materials: [] },
  ];
  for (const a of acts)
    await ok(await teacher.post(`/api/lessons/${sourceLessonIds[0]}/activities`, a), 201);
  const withFile = await ok(
    await teacher.post(`/api/lessons/${sourceLessonIds[1]}/activities`, {
      title: 'Drive straight',
      kind: 'code',
      minutes: 30,
      materials: [{ partCode: 'CT-MOT', qty: 2, per: 'group', returnable: true }],
    }),
    201,
  );
  await ok(await upload(TEACHER, withFile.id, PDF, 'Drive steps.pdf'), 201);
});
after(async () => {
  await t.close();
});

async function copy(email: string, body?: unknown, id = sourceId) {
  return (await as(email)).post(`/api/units/${id}/copy`, body);
}
async function lesson(email: string, id: string) {
  return ok(await (await as(email)).get(`/api/lessons/${id}`));
}

describe('POST /api/units/:id/copy', () => {
  it('copies everything into a private draft of the partner’s, with its provenance (201)', async () => {
    const res = await copy(PARTNER, {
      title: 'Flood rovers (4R)',
      classId: smallClass,
      startDate: '2026-10-13',
    });
    const unit = await ok(res, 201);
    const [src] = await t.database.db.select().from(units).where(eq(units.id, sourceId));
    assert.equal(unit.title, 'Flood rovers (4R)');
    assert.equal(unit.owner.id, ids[PARTNER]);
    assert.equal(unit.visibility, 'private');
    assert.equal(unit.status, 'draft');
    assert.equal(unit.canEdit, true);
    assert.equal(unit.copiedFromId, sourceId);
    assert.deepEqual(
      { ...unit.basedOn, copiedAt: undefined },
      {
        unitId: sourceId,
        title: 'Flood rovers',
        version: src!.version,
        ownerName: 'Sam Kowhai',
        copiedAt: undefined,
        readable: true,
      },
      'ownerName is the demo teacher’s name as seeded',
    );
    assert.ok(Date.parse(unit.basedOn.copiedAt) > Date.now() - 60_000);
    assert.deepEqual(unit.outcomes.map((o: { id: string }) => o.id).sort(), [...outcomeIds].sort());
    assert.equal(unit.lessons.length, 2);
    for (const l of unit.lessons) assert.equal(l.classId, smallClass);

    // The same unit answers GET with basedOn (API.md: "as before, plus basedOn").
    const again = await ok(await (await as(PARTNER)).get(`/api/units/${unit.id}`));
    assert.deepEqual(again.basedOn, unit.basedOn);

    // Lessons: same order, fields, activities in order with their materials and quantities.
    for (const [i, copiedRef] of unit.lessons.entries()) {
      const original = await lesson(TEACHER, sourceLessonIds[i]!);
      const copied = await lesson(PARTNER, copiedRef.id);
      assert.notEqual(copied.id, original.id);
      assert.equal(copied.title, original.title);
      assert.equal(copied.groupSize, original.groupSize);
      assert.equal(copied.room, original.room);
      assert.equal(copied.reliefNotes, original.reliefNotes);
      assert.equal(copied.periodId, original.periodId);
      assert.equal(copied.reliefTeacherId, null, 'no relief teacher on a copy');
      assert.deepEqual(
        copied.tubs.map((x: { label: string }) => x.label),
        ['Tub 1', 'Tub 2', 'Tub 3', 'Tub 4', 'Tub 5', 'Tub 6', 'Tub 7'],
        'every tub of the kit type but the retired one',
      );
      const strip = (list: Activity[]) =>
        list.map((a) => ({
          title: a.title,
          kind: a.kind,
          minutes: a.minutes,
          materials: a.materials.map(({ id: _id, ...m }) => m),
          files: a.attachments.map((f) => [f.filename, f.size]),
        }));
      assert.deepEqual(strip(copied.activities), strip(original.activities));
      assert.ok(
        copied.activities.every((a: { id: string }) =>
          original.activities.every((o: { id: string }) => o.id !== a.id),
        ),
      );
    }
    // The file's bytes came along.
    const second = await lesson(PARTNER, unit.lessons[1].id);
    const file = second.activities[0].attachments[0];
    const bytes = await download(await as(PARTNER), `/api/activities/attachments/${file.id}`);
    assert.equal(bytes.status, 200);
    assert.ok(Buffer.compare(bytes.body as Buffer, PDF) === 0);

    // It is listed among the partner's own units.
    const mine = await ok(await (await as(PARTNER)).get('/api/units?scope=mine'));
    assert.ok(mine.units.some((u: { id: string }) => u.id === unit.id));
  });

  it('moves lessons by whole days in the school’s timezone across the daylight-saving change', async () => {
    const unit = await ok(await copy(PARTNER, { startDate: '2026-10-13' }), 201);
    // The first lesson (22 September) lands on 13 October: 21 days later, same wall-clock times.
    assert.deepEqual(
      unit.lessons.map((l: { startsAt: string; endsAt: string }) => [l.startsAt, l.endsAt]),
      [
        ['2026-10-13T11:10', '2026-10-13T12:00'],
        ['2026-10-20T13:40', '2026-10-20T14:30'],
      ],
    );
    // IANA time zone database through Luxon: Australia/Adelaide is UTC+09:30 until daylight time
    // begins on the first Sunday of October (2026-10-04), UTC+10:30 after it.
    const was = DateTime.fromISO('2026-09-22T11:10', { zone: ZONE });
    const now = DateTime.fromISO(unit.lessons[0].startsAt, { zone: ZONE });
    assert.equal(was.offset, 9 * 60 + 30);
    assert.equal(now.offset, 10 * 60 + 30);
    // 21 calendar days, but one hour less of elapsed time: the clocks went forward once.
    assert.equal(now.diff(was, 'hours').hours, 21 * 24 - 1);
    // And back again: a start date before the original moves every lesson earlier.
    const back = await ok(await copy(PARTNER, { startDate: '2026-09-08' }), 201);
    assert.deepEqual(
      back.lessons.map((l: { startsAt: string }) => l.startsAt),
      ['2026-09-08T11:10', '2026-09-15T13:40'],
    );
  });

  it('keeps dates without startDate, and flags a lesson landing on a day without teaching', async () => {
    const same = await ok(await copy(PARTNER, {}), 201);
    assert.deepEqual(
      same.lessons.map((l: { startsAt: string }) => l.startsAt),
      ['2026-09-22T11:10', '2026-09-29T13:40'],
    );
    assert.equal(same.title, 'Flood rovers');
    await t.database.db
      .insert(nonTeachingDays)
      .values({ schoolId: kestrel, date: '2026-11-10', reason: 'Staff development day' });
    // 2026-11-03 is a Tuesday: the second lesson lands a week later on the listed day.
    const flagged = await ok(await copy(PARTNER, { startDate: '2026-11-03' }), 201);
    assert.deepEqual(
      flagged.lessons.map((l: { startsAt: string }) => l.startsAt),
      ['2026-11-03T11:10', '2026-11-10T13:40'],
      'flagged, not moved',
    );
    const flags = flagged.copySummary.lessons.map(
      (l: { notTeaching: string | null }) => l.notTeaching,
    );
    assert.equal(flags[0], null);
    assert.match(flags[1], /Staff development day/);
    // Luxon (IANA data): 2026-11-07 is a Saturday.
    assert.equal(DateTime.fromISO('2026-11-07', { zone: ZONE }).weekday, 6);
    const weekend = await ok(await copy(PARTNER, { startDate: '2026-11-07' }), 201);
    assert.equal(weekend.copySummary.lessons[0].notTeaching, 'a Saturday');
    assert.match(weekend.copySummary.text, /on a day without teaching/);
  });

  it('recomputes the plans for the new class and sums them up', async () => {
    const unit = await ok(await copy(PARTNER, { classId: smallClass }), 201);
    const partner = await as(PARTNER);
    const teacher = await as(TEACHER);
    let before = 0;
    let afterGroups = 0;
    for (const [i, l] of unit.copySummary.lessons.entries()) {
      const original = await ok(await teacher.get(`/api/lessons/${sourceLessonIds[i]}/prep`));
      const copied = await ok(await partner.get(`/api/lessons/${l.lessonId}/prep`));
      assert.equal(l.sourceLessonId, sourceLessonIds[i]);
      assert.deepEqual(l.before, {
        groups: original.totals.groups,
        shortfalls: original.shortfalls.length,
      });
      assert.deepEqual(l.after, {
        groups: copied.totals.groups,
        shortfalls: copied.shortfalls.length,
      });
      before += original.totals.groups;
      afterGroups += copied.totals.groups;
    }
    // PREP-RULES.md R2: groups = ceil(students / group size): 27 / 3 → 9, 21 / 3 → 7, per lesson.
    assert.equal(before, 18);
    assert.equal(afterGroups, 14);
    assert.match(unit.copySummary.text, /^14 groups instead of 18; /);
  });

  it('gives a copied lesson the same prep plan as the same lesson written from scratch', async () => {
    const unit = await ok(
      await copy(PARTNER, { classId: smallClass, startDate: '2026-10-13' }),
      201,
    );
    const partner = await as(PARTNER);
    const copied = await lesson(PARTNER, unit.lessons[0].id);
    const fresh = await ok(
      await partner.post('/api/units', { title: 'From scratch', yearLevel: 4 }),
      201,
    );
    const scratch = await ok(
      await partner.post(`/api/units/${fresh.id}/lessons`, {
        title: copied.title,
        classId: smallClass,
        kitTypeId,
        startsAt: copied.startsAt,
        endsAt: copied.endsAt,
        groupSize: copied.groupSize,
      }),
      201,
    );
    for (const a of copied.activities)
      await ok(
        await partner.post(`/api/lessons/${scratch.id}/activities`, {
          title: a.title,
          kind: a.kind,
          minutes: a.minutes,
          materials: (a as Activity).materials.map((m) => ({
            ...(m.partCode ? { partCode: m.partCode } : { consumable: m.consumable }),
            qty: m.qty,
            per: m.per,
            returnable: m.returnable,
          })),
        }),
        201,
      );
    const a = await ok(await partner.get(`/api/lessons/${copied.id}/prep`));
    const b = await ok(await partner.get(`/api/lessons/${scratch.id}/prep`));
    assert.deepEqual(a, b);
    assert.equal(a.totals.groups, 7);
  });

  it('is independent of the original, both ways', async () => {
    const unit = await ok(await copy(PARTNER, {}), 201);
    const partner = await as(PARTNER);
    const teacher = await as(TEACHER);
    const copiedLesson = await lesson(PARTNER, unit.lessons[0].id);
    const originalBefore = await lesson(TEACHER, sourceLessonIds[0]!);
    await ok(
      await partner.patch(`/api/lessons/${copiedLesson.id}`, {
        version: copiedLesson.version,
        groupSize: 4,
        title: 'Chassis (ours)',
      }),
    );
    const build = copiedLesson.activities[1];
    await ok(
      await partner.patch(`/api/activities/${build.id}`, {
        version: build.version,
        materials: [{ partCode: 'CT-WHL', qty: 6, per: 'group' }],
      }),
    );
    const originalAfter = await lesson(TEACHER, sourceLessonIds[0]!);
    // The copy keeps the original's day and tubs, so each answer names the other as a booking
    // conflict (PREP-RULES.md, "Across lessons"): read live from the other lesson, so its new
    // title shows there; the original's own fields stay as they were.
    const { bookingConflicts: conflictsAfter, ...storedAfter } = originalAfter;
    const { bookingConflicts: conflictsBefore, ...storedBefore } = originalBefore;
    assert.deepEqual(storedAfter, storedBefore, 'the original did not change');
    // The same lessons; their order may change, as it follows the titles shown.
    const ids = (list: { lessonId: string }[]) => list.map((c) => c.lessonId).sort();
    assert.deepEqual(ids(conflictsAfter), ids(conflictsBefore));
    assert.ok(ids(conflictsAfter).includes(copiedLesson.id));
    assert.equal(
      conflictsAfter.find((c: { lessonId: string }) => c.lessonId === copiedLesson.id).title,
      'Chassis (ours)',
    );

    const snapshotBefore = await lesson(PARTNER, copiedLesson.id);
    const orig = await lesson(TEACHER, sourceLessonIds[0]!);
    await ok(
      await teacher.patch(`/api/activities/${orig.activities[2].id}`, {
        version: orig.activities[2].version,
        minutes: 15,
      }),
    );
    assert.deepEqual(await lesson(PARTNER, copiedLesson.id), snapshotBefore, 'nor did the copy');
    // Put the original back for the other tests.
    const restored = await lesson(TEACHER, sourceLessonIds[0]!);
    await ok(
      await teacher.patch(`/api/activities/${restored.activities[2].id}`, {
        version: restored.activities[2].version,
        minutes: 10,
      }),
    );
  });

  it('leaves nothing behind when it fails half-way (a forced database error)', async () => {
    const db = t.database.db;
    // A trigger refuses every new file: the copy fails after the unit, the first lesson and its
    // activities were written, while copying the second lesson's attachment.
    await db.execute(sql`
      CREATE FUNCTION refuse_files() RETURNS trigger LANGUAGE plpgsql AS
        $$ BEGIN RAISE EXCEPTION 'forced failure for the test'; END $$`);
    await db.execute(sql`
      CREATE TRIGGER refuse_files BEFORE INSERT ON attachments
      FOR EACH ROW EXECUTE FUNCTION refuse_files()`);
    try {
      const before = await counts();
      const res = await copy(PARTNER, { classId: smallClass });
      assert.equal(res.status, 500, res.text);
      assert.deepEqual(await counts(), before);
    } finally {
      await db.execute(sql`DROP TRIGGER refuse_files ON attachments`);
      await db.execute(sql`DROP FUNCTION refuse_files()`);
    }
    await ok(await copy(PARTNER, {}), 201);
  });

  it('refuses bad input with 400 and every issue, copying nothing', async () => {
    const before = await counts();
    const bad = await copy(PARTNER, { title: ' ', classId: 'nope', startDate: '2026-02-30' });
    assert.equal(bad.status, 400, bad.text);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'classId',
      'startDate',
      'title',
    ]);
    const control = await copy(PARTNER, { title: 'Rovers\u0007' });
    assert.equal(control.status, 400);
    assert.equal(control.body.error.details[0].path, 'title');
    const elsewhere = await copy(PARTNER, { classId: otherSchoolClass });
    assert.equal(elsewhere.status, 400, elsewhere.text);
    assert.deepEqual(elsewhere.body.error.details, [
      { path: 'classId', message: 'Choose a class of your school.' },
    ]);
    assert.deepEqual(await counts(), before);
  });

  it('refuses a unit holding a record of another school with 400, copying nothing', async () => {
    const db = t.database.db;
    const teacher = await as(TEACHER);
    const unit = await ok(await teacher.post('/api/units', { title: 'Mixed', yearLevel: 4 }), 201);
    const l = await ok(
      await teacher.post(`/api/units/${unit.id}/lessons`, {
        title: 'Only lesson',
        classId: bigClass,
        kitTypeId,
        startsAt: '2026-09-22T11:10',
        endsAt: '2026-09-22T12:00',
        groupSize: 3,
      }),
      201,
    );
    // Written straight to the database: no route lets this happen.
    await db.update(lessons).set({ classId: otherSchoolClass }).where(eq(lessons.id, l.id));
    const before = await counts();
    const res = await copy(TEACHER, {}, unit.id);
    assert.equal(res.status, 400, res.text);
    assert.match(res.body.error.details[0].message, /another school/);
    assert.deepEqual(await counts(), before);
    // With a class of the school chosen for every lesson, the copy goes through.
    await ok(await copy(TEACHER, { classId: bigClass }, unit.id), 201);
  });

  it('lets every teacher and lead who can read the unit copy it; relief 403; others 404; 401', async () => {
    assert.equal((await copy(TEACHER)).status, 201, 'the owner');
    const lead = await ok(await copy(LEAD), 201);
    assert.equal(lead.owner.id, ids[LEAD]);
    // Admins do not read units (server/auth/policy.ts): to them the unit is not there.
    assert.equal((await copy(ADMIN)).status, 404);
    assert.equal((await copy(RELIEF)).status, 403);
    assert.equal((await copy(OTHER_TEACHER)).status, 404, 'another school');
    assert.equal((await new Browser(t.app).post(`/api/units/${sourceId}/copy`, {})).status, 401);
    // A private unit is copied only by those who read it.
    const teacher = await as(TEACHER);
    const priv = await ok(await teacher.post('/api/units', { title: 'Mine', yearLevel: 4 }), 201);
    assert.equal((await copy(PARTNER, {}, priv.id)).status, 404);
    assert.equal((await copy(LEAD, {}, priv.id)).status, 201);
    assert.equal((await copy(PARTNER, {}, '00000000-0000-4000-8000-000000000000')).status, 404);
    // A malformed id is no address at all (server/http.ts parseParams).
    assert.equal((await copy(PARTNER, {}, 'not-an-id')).status, 404);
  });
});

describe('the copy summary', () => {
  const lesson = (before: [number, number], after: [number, number]) => ({
    lessonId: 'x',
    sourceLessonId: 'y',
    title: 'L',
    startsAt: '2026-10-13T11:10',
    notTeaching: null,
    before: { groups: before[0], shortfalls: before[1] },
    after: { groups: after[0], shortfalls: after[1] },
  });
  it('reads as issue 10’s example', () => {
    // Issue 10's own example sentence: "7 groups instead of 9; 2 shortfalls fewer".
    assert.equal(
      summaryText([lesson([9, 3], [7, 1])]),
      '7 groups instead of 9; 2 shortfalls fewer',
    );
    assert.equal(summaryText([lesson([7, 0], [7, 0])]), '7 groups as before; no shortfalls');
    assert.equal(summaryText([lesson([7, 1], [9, 2])]), '9 groups instead of 7; 1 shortfall more');
    assert.equal(summaryText([]), 'The unit has no lessons to plan.');
  });
});
