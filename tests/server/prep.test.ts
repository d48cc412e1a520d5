import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import {
  insertClass,
  insertKit,
  insertLesson,
  insertTubs,
  insertUnit,
  schoolIds,
  userByEmail,
} from '../support/planning.js';
import {
  activities,
  lessonTubs,
  lessons,
  materials,
  schoolSettings,
  schools,
  tubMissing,
  tubs,
  units,
} from '../../server/db/schema/index.js';

let t: TestApp;
let lessonId = '';
let otherLessonId = '';

/**
 * Stores the worked example of PREP-RULES.md as a lesson: three parts, three tubs (Tub 3 made to
 * hold 6 pins by recording 14 missing out of 20), 10 students, groups of 3, 11:10–12:00 on
 * 2026-07-28 in Australia/Adelaide.
 */
before(async () => {
  t = await testApp();
  const db = t.database.db;
  const { kestrel, banksia } = await schoolIds(db);
  const teacher = await userByEmail(db, 'teacher@kestrel-ridge.example');
  const kitTypeId = await insertKit(db, kestrel, {
    name: 'Worked example kit',
    firstPosition: 0,
    parts: [
      {
        code: 'RB-001',
        name: 'Controller',
        colour: 'Grey',
        category: 'controller',
        qty: 1,
        compartment: 'A',
        chargeMinutes: 180,
      },
      { code: 'RB-010', name: 'Motor', category: 'motor', qty: 2 },
      {
        code: 'RB-020',
        name: 'Pin',
        colour: 'Blue',
        category: 'connector',
        qty: 20,
        compartment: 'C',
        small: true,
      },
    ],
  });
  const byLabel = await insertTubs(db, kestrel, kitTypeId, ['Tub 1', 'Tub 2', 'Tub 3']);
  // Tub 2 {1, 1, 20}: one motor missing; Tub 3 {1, 2, 6}: fourteen pins missing.
  await db.insert(tubMissing).values([
    { tubId: byLabel['Tub 2']!, partCode: 'RB-010', count: 1 },
    { tubId: byLabel['Tub 3']!, partCode: 'RB-020', count: 14 },
  ]);
  const classId = await insertClass(db, kestrel, {
    name: 'WX',
    yearLevel: 4,
    studentCount: 10,
    devices: 2,
  });
  const unitId = await insertUnit(db, {
    schoolId: kestrel,
    ownerId: teacher.id,
    title: 'Worked example',
    yearLevel: 4,
  });
  lessonId = await insertLesson(
    db,
    {
      schoolId: kestrel,
      unitId,
      title: 'Example',
      classId,
      kitTypeId,
      startsAt: '2026-07-28 11:10:00',
      endsAt: '2026-07-28 12:00:00',
      groupSize: 3,
    },
    Object.values(byLabel),
  );
  const [build, code] = await db
    .insert(activities)
    .values([
      { lessonId, position: 0, title: 'Build', kind: 'build', minutes: 25 },
      { lessonId, position: 1, title: 'Code', kind: 'code', minutes: 15 },
    ])
    .returning();
  await db.insert(materials).values([
    {
      activityId: build!.id,
      position: 0,
      partCode: 'RB-001',
      qty: 1,
      per: 'group',
      returnable: true,
    },
    {
      activityId: build!.id,
      position: 1,
      partCode: 'RB-010',
      qty: 2,
      per: 'group',
      returnable: true,
    },
    {
      activityId: build!.id,
      position: 2,
      partCode: 'RB-020',
      qty: 4,
      per: 'student',
      returnable: true,
    },
    {
      activityId: code!.id,
      position: 0,
      partCode: 'RB-001',
      qty: 1,
      per: 'group',
      returnable: true,
    },
    {
      activityId: code!.id,
      position: 1,
      partCode: 'RB-020',
      qty: 2,
      per: 'group',
      returnable: true,
    },
  ]);
  // A lesson of the other school, to prove isolation.
  const bAdmin = await userByEmail(db, 'admin@banksia-flat.example');
  const bKit = await insertKit(db, banksia, { name: 'B kit' });
  const bClass = await insertClass(db, banksia, {
    name: 'B1',
    yearLevel: 3,
    studentCount: 12,
    devices: 4,
  });
  const bUnit = await insertUnit(db, {
    schoolId: banksia,
    ownerId: bAdmin.id,
    title: 'B unit',
    yearLevel: 3,
    visibility: 'school',
  });
  otherLessonId = await insertLesson(db, {
    schoolId: banksia,
    unitId: bUnit,
    title: 'B',
    classId: bClass,
    kitTypeId: bKit,
    startsAt: '2026-07-28 09:00:00',
    endsAt: '2026-07-28 09:50:00',
    groupSize: 4,
  });
});
after(async () => {
  await t.close();
});

describe('GET /api/lessons/:id/prep', () => {
  it('serves the worked example of PREP-RULES.md from the stored lesson', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const res = await b.get(`/api/lessons/${lessonId}/prep`);
    assert.equal(res.status, 200, res.text);
    const plan = res.body;
    // Figures from the worked example in PREP-RULES.md.
    assert.deepEqual(
      plan.groups.map((g: { size: number }) => g.size),
      [3, 3, 2, 2],
    );
    assert.deepEqual(
      plan.groups.map((g: { homeTub: string }) => g.homeTub),
      ['Tub 1', 'Tub 2', 'Tub 3', 'Tub 1'],
    );
    assert.deepEqual(
      plan.groups.map((g: { pieces: number }) => g.pieces),
      [15, 14, 11, 8],
    );
    assert.deepEqual(
      plan.shortfalls.map(
        (s: { group: number; partCode: string; needed: number; allocated: number }) => [
          s.group,
          s.partCode,
          s.needed - s.allocated,
        ],
      ),
      [
        [2, 'RB-010', 1],
        [4, 'RB-001', 1],
        [4, 'RB-010', 2],
      ],
    );
    assert.deepEqual(
      plan.borrows.map(({ group, partCode, qty, fromTub, homeTub }: Record<string, unknown>) => ({
        group,
        partCode,
        qty,
        fromTub,
        homeTub,
      })),
      [{ group: 3, partCode: 'RB-020', qty: 2, fromTub: 'Tub 2', homeTub: 'Tub 3' }],
    );
    // Group 4 gets no controller (one short, above); the others take their home tub's, which
    // has no label recorded here: nothing is claimed (null), and group 4 says it is short.
    assert.deepEqual(plan.controllers, { 1: null, 2: null, 3: null, 4: 'none (short)' });
    assert.equal(plan.timeline.packAwayMinutes, 6);
    assert.equal(plan.timeline.slackMinutes, -1);
    assert.equal(plan.timeline.packAwayStartsAt, '2026-07-28T11:54:00+09:30');
    const charge = plan.tasks.find((x: { kind: string }) => x.kind === 'charge');
    assert.equal(charge.startBy, '2026-07-28T07:55:00+09:30');
    const pull = plan.tasks.find((x: { kind: string }) => x.kind === 'pull');
    assert.equal(pull.minutes, 10);
    assert.ok(
      plan.suggestions.some(
        (s: { kind: string; groups?: number }) => s.kind === 'groups' && s.groups === 2,
      ),
    );
  });

  it('names every part of the plan with its colour and compartment (issue 8)', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const res = await b.get(`/api/lessons/${lessonId}/prep`);
    assert.equal(res.status, 200, res.text);
    // Exactly the codes the plan mentions, as the kit type's parts list records them; the motor
    // has no colour or compartment recorded, so both are null (not '' or the code).
    assert.deepEqual(res.body.parts, {
      'RB-001': { name: 'Controller', colour: 'Grey', compartment: 'A' },
      'RB-010': { name: 'Motor', colour: null, compartment: null },
      'RB-020': { name: 'Pin', colour: 'Blue', compartment: 'C' },
    });
    assert.deepEqual(res.body.partNames, {
      'RB-001': 'Controller',
      'RB-010': 'Motor',
      'RB-020': 'Pin',
    });
  });

  it('follows the stock as stored now: recording the motor found changes the plan', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const [lesson] = await t.database.db.select().from(lessons).where(eq(lessons.id, lessonId));
    const [tub2] = await t.database.db
      .select()
      .from(tubs)
      .where(and(eq(tubs.label, 'Tub 2'), eq(tubs.kitTypeId, lesson!.kitTypeId)));
    await t.database.db.delete(tubMissing).where(eq(tubMissing.tubId, tub2!.id));
    const plan = (await b.get(`/api/lessons/${lessonId}/prep`)).body;
    assert.ok(
      !plan.shortfalls.some((s: { group: number }) => s.group === 2),
      'group 2 has its second motor',
    );
    await t.database.db
      .insert(tubMissing)
      .values({ tubId: tub2!.id, partCode: 'RB-010', count: 1 });
  });

  it('follows the school settings as stored now, falling back to the default for a bad value', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const [school] = await t.database.db
      .select()
      .from(schools)
      .where(eq(schools.name, 'Kestrel Ridge Primary School'));
    const pinSpares = async () =>
      (await b.get(`/api/lessons/${lessonId}/prep`)).body.sparesTray.lines.find(
        (l: { partCode: string }) => l.partCode === 'RB-020',
      )?.needed;
    // R3: spares = ceil(40 × p / 100); 10 % → 4, 20 % → 8 (PREP-RULES.md worked example demand 40).
    await t.database.db
      .insert(schoolSettings)
      .values({ schoolId: school!.id, prep: { sparesPercent: 20 } })
      .onConflictDoUpdate({
        target: schoolSettings.schoolId,
        set: { prep: { sparesPercent: 20 } },
      });
    assert.equal(await pinSpares(), 8);
    await t.database.db
      .update(schoolSettings)
      .set({ prep: { sparesPercent: 'ten' } })
      .where(eq(schoolSettings.schoolId, school!.id));
    assert.equal(await pinSpares(), 4);
    await t.database.db
      .update(schoolSettings)
      .set({ prep: {} })
      .where(eq(schoolSettings.schoolId, school!.id));
  });

  it('answers 401 anonymous, 404 to another school and to roles that cannot read the lesson', async () => {
    assert.equal((await new Browser(t.app).get(`/api/lessons/${lessonId}/prep`)).status, 401);
    const other = await signedIn(t.app, 'admin@banksia-flat.example');
    assert.equal((await other.get(`/api/lessons/${lessonId}/prep`)).status, 404);
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    assert.equal(
      (await relief.get(`/api/lessons/${lessonId}/prep`)).status,
      404,
      'not assigned to this relief teacher',
    );
    const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    assert.equal((await teacher.get(`/api/lessons/${otherLessonId}/prep`)).status, 404);
    assert.equal((await teacher.get('/api/lessons/not-a-uuid/prep')).status, 404);
  });

  it('lets a lead read it, and a partner only once the unit is shared with the school', async () => {
    const lead = await signedIn(t.app, 'lead@kestrel-ridge.example');
    assert.equal((await lead.get(`/api/lessons/${lessonId}/prep`)).status, 200);
    const partner = await signedIn(t.app, 'partner@kestrel-ridge.example');
    assert.equal((await partner.get(`/api/lessons/${lessonId}/prep`)).status, 404);
    const [lesson] = await t.database.db.select().from(lessons).where(eq(lessons.id, lessonId));
    await t.database.db
      .update(units)
      .set({ visibility: 'school' })
      .where(eq(units.id, lesson!.unitId));
    assert.equal((await partner.get(`/api/lessons/${lessonId}/prep`)).status, 200);
  });
});

describe('across lessons', () => {
  it('finds a booking conflict when two lessons overlap on a common tub, and the recharge gap', async () => {
    const db = t.database.db;
    const [lesson] = await db.select().from(lessons).where(eq(lessons.id, lessonId));
    const [tub1] = await db
      .select()
      .from(tubs)
      .where(and(eq(tubs.label, 'Tub 1'), eq(tubs.kitTypeId, lesson!.kitTypeId)));
    // 11:30–12:20 overlaps 11:10–12:00 ([startsAt, endsAt) intervals, PREP-RULES.md).
    const [second] = await db
      .insert(lessons)
      .values({
        ...lesson!,
        id: undefined,
        position: 1,
        title: 'Overlapping',
        startsAt: '2026-07-28 11:30:00',
        endsAt: '2026-07-28 12:20:00',
        version: 1,
        createdAt: undefined,
        updatedAt: undefined,
      })
      .returning();
    await db.insert(lessonTubs).values({ lessonId: second!.id, tubId: tub1!.id });
    // 12:00–12:50 touches but does not overlap; its gap after the first lesson is 0 minutes.
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const res = await b.get('/api/conflicts?from=2026-07-27&to=2026-08-03');
    assert.equal(res.status, 200, res.text);
    assert.equal(res.body.conflicts.length, 1);
    assert.deepEqual(res.body.conflicts[0].tubs, ['Tub 1']);
    assert.match(res.body.conflicts[0].message, /Overlapping/);
    // The teacher's week lists the conflict among the things that need action.
    const week = await b.get('/api/agenda?week=2026-07-27&mine=true');
    const flagged = week.body.attention.filter(
      (a: { kind: string }) => a.kind === 'booking-conflict',
    );
    assert.equal(flagged.length, 1);
    assert.match(flagged[0].message, /Tub 1/);
    await db.delete(lessons).where(eq(lessons.id, second!.id));
  });

  it('lists the week’s prep tasks in time order with the lesson they belong to', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const res = await b.get('/api/agenda?week=2026-07-29&mine=true');
    assert.equal(res.status, 200, res.text);
    assert.equal(res.body.week, '2026-07-27', 'weeks start on Monday (ISO 8601)');
    const starts = res.body.tasks.map((x: { startBy: string }) => Date.parse(x.startBy));
    assert.deepEqual(
      starts,
      [...starts].sort((x: number, y: number) => x - y),
    );
    assert.ok(res.body.tasks.some((x: { lesson: { id: string } }) => x.lesson.id === lessonId));
    assert.ok(res.body.attention.some((x: { kind: string }) => x.kind === 'shortfall'));
    assert.equal((await b.get('/api/agenda?week=nope')).status, 400);
    const other = await signedIn(t.app, 'admin@banksia-flat.example');
    const theirs = await other.get('/api/agenda?week=2026-07-27');
    assert.ok(!theirs.body.lessons.some((l: { id: string }) => l.id === lessonId));
  });

  it('sums missing parts per kit type over its tubs (JSON and CSV)', async () => {
    const b = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const [lesson] = await t.database.db.select().from(lessons).where(eq(lessons.id, lessonId));
    const res = await b.get(`/api/kit-types/${lesson!.kitTypeId}/replacements`);
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(
      res.body.lines.map((l: { partCode: string; missing: number }) => [l.partCode, l.missing]),
      [
        ['RB-010', 1],
        ['RB-020', 14],
      ],
    );
    const csv = await b.get(`/api/kit-types/${lesson!.kitTypeId}/replacements.csv`);
    assert.match(String(csv.headers['content-type']), /text\/csv/);
    assert.equal(csv.text.split('\r\n')[0], 'code,name,missing,tubs');
    assert.match(csv.text, /RB-020,Pin,14,Tub 3 \(14\)/);
    const other = await signedIn(t.app, 'admin@banksia-flat.example');
    assert.equal((await other.get(`/api/kit-types/${lesson!.kitTypeId}/replacements`)).status, 404);
  });
});
