/**
 * Lessons over HTTP against a real PostgreSQL: add to a unit (booking tubs), read with activities
 * in order, edit with versions, delete, reorder activities, and who may do each.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
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
  insertClass,
  insertKit,
  insertTubs,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  activities,
  bellPeriods,
  lessons,
  lessonTubs,
  materials,
} from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
/** Invented test records: kit types, tubs by label, classes, periods. */
const f = {
  kit: '',
  gateKit: '',
  mk2Kit: '',
  cls: '',
  period: '',
  farClass: '',
  farKit: '',
  farPeriod: '',
  tub: {} as Record<string, string>,
};

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel, banksia } = await schoolIds(db);
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  ids = await userIds(db);
  const kit = (schoolId: string, name: string, codes: string[]) =>
    insertKit(db, schoolId, {
      name,
      parts: codes.map((code) => ({ code, name: `Part ${code}`, qty: 4 })),
    });
  f.kit = await kit(kestrel, 'Trial Rover Tub', ['TR-001', 'TR-010', 'TR-020']);
  f.gateKit = await kit(kestrel, 'Trial Gate Tub', ['TG-001']);
  f.mk2Kit = await kit(kestrel, 'Trial Rover Mk2', ['TR-001', 'TR-010', 'TR-020', 'TR-030']);
  f.farKit = await kit(banksia, 'Far Tub', ['FR-001']);
  f.tub = {
    ...(await insertTubs(db, kestrel, f.kit, [
      { label: 'Tub 2', status: 'ready' },
      { label: 'Tub 1', status: 'ready' },
      { label: 'Tub 10', status: 'needs-sorting' },
      { label: 'Tub 4', status: 'retired' },
    ])),
    ...(await insertTubs(db, kestrel, f.gateKit, ['Gate 1'])),
    ...(await insertTubs(db, kestrel, f.mk2Kit, ['Mk2 A'])),
    ...(await insertTubs(db, banksia, f.farKit, ['Far 1'])),
  };
  f.cls = await insertClass(db, kestrel, {
    name: '4Q',
    yearLevel: 4,
    studentCount: 24,
    devices: 6,
  });
  f.farClass = await insertClass(db, banksia, { name: 'B4', yearLevel: 4, studentCount: 20 });
  f.period = (
    await db
      .insert(bellPeriods)
      .values({
        schoolId: kestrel,
        position: 3,
        name: 'Period 3',
        startsAt: '11:10',
        endsAt: '12:00',
      })
      .returning()
  )[0]!.id;
  f.farPeriod = (
    await db
      .insert(bellPeriods)
      .values({
        schoolId: banksia,
        position: 1,
        name: 'Period 1',
        startsAt: '09:00',
        endsAt: '09:50',
      })
      .returning()
  )[0]!.id;
});
after(async () => {
  await t.close();
});

async function newUnit(visibility: 'private' | 'school' = 'private') {
  const owner = await as(TEACHER);
  const res = await owner.post('/api/units', { title: 'Lesson host unit', yearLevel: 4 });
  assert.equal(res.status, 201);
  if (visibility === 'school')
    assert.equal(
      (await owner.patch(`/api/units/${res.body.id}`, { version: 1, visibility })).status,
      200,
    );
  return res.body.id as string;
}
const lessonBody = (extra: Record<string, unknown> = {}) => ({
  title: 'Build the chassis',
  classId: f.cls,
  kitTypeId: f.kit,
  startsAt: '2026-07-28T11:10',
  endsAt: '2026-07-28T12:00',
  groupSize: 4,
  ...extra,
});
async function newLesson(unitId: string, extra: Record<string, unknown> = {}) {
  const res = await (await as(TEACHER)).post(`/api/units/${unitId}/lessons`, lessonBody(extra));
  assert.equal(res.status, 201, res.text);
  return res.body;
}
const lessonCount = async () => (await t.database.db.select().from(lessons)).length;
const paths = (res: { body: { error: { details: { path: string }[] } } }) =>
  res.body.error.details.map((d) => d.path).sort();

describe('POST /api/units/:id/lessons', () => {
  it('appends a lesson that books every tub of the kit type that is not retired (201)', async () => {
    const unitId = await newUnit();
    const first = await newLesson(unitId, {
      periodId: f.period,
      room: 'Library',
      learningIntention: 'We are learning to *gear down*.',
    });
    assert.equal(first.version, 1);
    assert.equal(first.position, 1);
    assert.deepEqual(first.unit, { id: unitId, title: 'Lesson host unit', status: 'draft' });
    assert.equal(first.class.name, '4Q');
    assert.equal(first.kitType.name, 'Trial Rover Tub');
    assert.equal(first.startsAt, '2026-07-28T11:10');
    assert.equal(first.endsAt, '2026-07-28T12:00');
    assert.equal(first.periodId, f.period);
    assert.equal(first.learningIntention, 'We are learning to *gear down*.');
    // Labels in natural order: Tub 10 comes after Tub 2.
    assert.deepEqual(
      first.tubs.map((x: { label: string }) => x.label),
      ['Tub 1', 'Tub 2', 'Tub 10'],
    );
    assert.deepEqual(first.tubIds, [f.tub['Tub 1'], f.tub['Tub 2'], f.tub['Tub 10']]);
    assert.deepEqual(first.activities, []);
    const second = await newLesson(unitId, { title: 'Second', tubIds: [f.tub['Tub 2']!] });
    assert.equal(second.position, 2);
    assert.deepEqual(second.tubIds, [f.tub['Tub 2']]);
    const unit = await (await as(TEACHER)).get(`/api/units/${unitId}`);
    assert.deepEqual(
      unit.body.lessons.map((l: { title: string }) => l.title),
      ['Build the chassis', 'Second'],
    );
  });

  it('lists every problem (400), records of another school and wrong tubs included, and stores nothing', async () => {
    const unitId = await newUnit();
    const before = await lessonCount();
    const res = await (
      await as(TEACHER)
    ).post(
      `/api/units/${unitId}/lessons`,
      lessonBody({
        title: '',
        classId: f.farClass,
        startsAt: '2026-07-28T12:00',
        endsAt: '2026-07-28T11:00',
        groupSize: 9,
        tubIds: [f.tub['Gate 1'], f.tub['Tub 4'], f.tub['Far 1']],
        periodId: f.farPeriod,
      }),
    );
    assert.equal(res.status, 400);
    assert.deepEqual(paths(res), [
      'classId',
      'endsAt',
      'groupSize',
      'periodId',
      'title',
      'tubIds.0',
      'tubIds.1',
      'tubIds.2',
    ]);
    const messages = res.body.error.details.map((d: { message: string }) => d.message).join(' ');
    assert.match(messages, /Gate 1 is a tub of another kit type/);
    assert.match(messages, /Tub 4 is retired/);
    assert.equal(await lessonCount(), before);
  });

  it('refuses malformed times, a fractional group size and a kit type of another school', async () => {
    const unitId = await newUnit();
    const res = await (
      await as(TEACHER)
    ).post(
      `/api/units/${unitId}/lessons`,
      lessonBody({
        startsAt: '2026-07-28 11:10',
        endsAt: '2026-02-30T12:00',
        groupSize: 2.5,
        kitTypeId: f.farKit,
      }),
    );
    assert.equal(res.status, 400);
    assert.deepEqual(paths(res), ['endsAt', 'groupSize', 'kitTypeId', 'startsAt']);
    const offset = await (
      await as(TEACHER)
    ).post(`/api/units/${unitId}/lessons`, lessonBody({ startsAt: '2026-07-28T11:10+09:30' }));
    assert.deepEqual(paths(offset), ['startsAt'], 'local times carry no offset');
  });

  it('refuses a window over 480 minutes (PREP-RULES.md), also one made longer by a daylight-saving change', async () => {
    const unitId = await newUnit();
    const long = await (
      await as(TEACHER)
    ).post(
      `/api/units/${unitId}/lessons`,
      lessonBody({ startsAt: '2026-07-28T08:00', endsAt: '2026-07-28T16:01' }),
    );
    assert.equal(long.status, 400);
    assert.deepEqual(paths(long), ['endsAt']);
    // IANA tz database (rule AS): Australia/Adelaide's daylight time ends on the first Sunday in
    // April, 2026-04-05, at 03:00 local, when clocks go back to 02:00. Luxon reads the same database.
    const elapsed = DateTime.fromISO('2026-04-05T08:00', { zone: 'Australia/Adelaide' }).diff(
      DateTime.fromISO('2026-04-05T00:00', { zone: 'Australia/Adelaide' }),
      'minutes',
    ).minutes;
    assert.equal(elapsed, 540);
    const across = await (
      await as(TEACHER)
    ).post(
      `/api/units/${unitId}/lessons`,
      lessonBody({ startsAt: '2026-04-05T00:00', endsAt: '2026-04-05T08:00' }),
    );
    assert.equal(across.status, 400);
    assert.match(across.body.error.details[0].message, /this one is 540/);
  });

  it('refuses a time the clocks skip in the school’s timezone (daylight time begins 2026-10-04 02:00)', async () => {
    // IANA tz database: Australia/Adelaide goes from 02:00 standard to 03:00 daylight time on the
    // first Sunday in October; Luxon moves the non-existent 02:30 forward, proving it is skipped.
    assert.equal(
      DateTime.fromISO('2026-10-04T02:30', { zone: 'Australia/Adelaide' }).toFormat('HH:mm'),
      '03:30',
    );
    const unitId = await newUnit();
    const res = await (
      await as(TEACHER)
    ).post(
      `/api/units/${unitId}/lessons`,
      lessonBody({ startsAt: '2026-10-04T02:30', endsAt: '2026-10-04T04:00' }),
    );
    assert.equal(res.status, 400);
    assert.deepEqual(paths(res), ['startsAt']);
  });

  it('who may add a lesson: authors only (lead and shared readers 403; others 404; anonymous 401)', async () => {
    const shared = await newUnit('school');
    const privateUnit = await newUnit();
    const before = await lessonCount();
    assert.equal(
      (await (await as(LEAD)).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      403,
    );
    assert.equal(
      (await (await as(PARTNER)).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      403,
    );
    assert.equal(
      (await (await as(PARTNER)).post(`/api/units/${privateUnit}/lessons`, lessonBody())).status,
      404,
    );
    assert.equal(
      (await (await as(ADMIN)).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      404,
    );
    assert.equal(
      (await (await as(RELIEF)).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      404,
    );
    assert.equal(
      (await (await as(OTHER_TEACHER)).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      404,
    );
    assert.equal(
      (await new Browser(t.app).post(`/api/units/${shared}/lessons`, lessonBody())).status,
      401,
    );
    assert.equal(await lessonCount(), before);
  });
});

describe('GET /api/lessons/:id', () => {
  it('answers the lesson with its activities and materials in order', async () => {
    const lesson = await newLesson(await newUnit());
    const owner = await as(TEACHER);
    for (const [title, kind] of [
      ['Hook', 'intro'],
      ['Build', 'build'],
      ['Code it', 'code'],
    ] as const) {
      const res = await owner.post(`/api/lessons/${lesson.id}/activities`, {
        title,
        kind,
        minutes: 10,
        materials: [
          { partCode: 'TR-010', qty: 2, per: 'group' },
          { consumable: 'Masking tape', qty: 1, per: 'class' },
        ],
      });
      assert.equal(res.status, 201);
    }
    const res = await owner.get(`/api/lessons/${lesson.id}`);
    assert.equal(res.status, 200);
    assert.equal(res.body.version, 1);
    assert.deepEqual(
      res.body.activities.map((a: { title: string }) => a.title),
      ['Hook', 'Build', 'Code it'],
    );
    assert.deepEqual(
      res.body.activities[1].materials.map(
        (m: {
          partCode: string | null;
          consumable: string | null;
          returnable: boolean;
          partName: string | null;
        }) => [m.partCode, m.partName, m.consumable, m.returnable],
      ),
      [
        ['TR-010', 'Part TR-010', null, true],
        [null, null, 'Masking tape', false],
      ],
    );
    assert.deepEqual(res.body.activities[0].attachments, []);
  });

  it('who may read: authors, readers of a shared unit, leads, the assigned relief teacher; nobody else', async () => {
    const unitId = await newUnit('school');
    const lesson = await newLesson(unitId);
    const url = `/api/lessons/${lesson.id}`;
    assert.equal((await (await as(PARTNER)).get(url)).body.canEdit, false);
    assert.equal((await (await as(LEAD)).get(url)).status, 200);
    assert.equal((await (await as(ADMIN)).get(url)).status, 404);
    assert.equal((await (await as(RELIEF)).get(url)).status, 404, 'not assigned yet');
    assert.equal((await (await as(OTHER_TEACHER)).get(url)).status, 404);
    assert.equal((await new Browser(t.app).get(url)).status, 401);
    const assign = await (
      await as(TEACHER)
    ).patch(url, { version: 1, reliefTeacherId: ids[RELIEF] });
    assert.equal(assign.status, 200);
    const relief = await (await as(RELIEF)).get(url);
    assert.equal(relief.status, 200);
    assert.equal(relief.body.canEdit, false);
    assert.equal(
      (await (await as(RELIEF)).patch(url, { version: 2, reliefNotes: 'I was here' })).status,
      403,
    );
    const privateLesson = await newLesson(await newUnit());
    assert.equal((await (await as(PARTNER)).get(`/api/lessons/${privateLesson.id}`)).status, 404);
    assert.equal(
      (await (await as(TEACHER)).get('/api/lessons/00000000-0000-4000-8000-000000000000')).status,
      404,
    );
  });
});

describe('PATCH /api/lessons/:id', () => {
  it('changes fields and answers the new version; a stale version is 409 with the current lesson', async () => {
    const lesson = await newLesson(await newUnit());
    const owner = await as(TEACHER);
    const url = `/api/lessons/${lesson.id}`;
    const res = await owner.patch(url, {
      version: 1,
      title: 'Gear trains',
      groupSize: 3,
      room: 'Makerspace',
      endsAt: '2026-07-28T12:10',
    });
    assert.equal(res.status, 200);
    assert.equal(res.body.version, 2);
    assert.equal(res.body.title, 'Gear trains');
    assert.equal(res.body.groupSize, 3);
    assert.equal(res.body.endsAt, '2026-07-28T12:10');
    // RFC 9110 §15.5.10 (409 Conflict): the request conflicts with the resource's current state.
    const stale = await owner.patch(url, { version: 1, title: 'Overwrite' });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.version, 2);
    assert.equal(stale.body.error.current.title, 'Gear trains');
    const [row] = await t.database.db.select().from(lessons).where(eq(lessons.id, lesson.id));
    assert.equal(row!.title, 'Gear trains');
  });

  it('lists every problem (400) and changes nothing, one end of the window checked against the other', async () => {
    const lesson = await newLesson(await newUnit());
    const owner = await as(TEACHER);
    const url = `/api/lessons/${lesson.id}`;
    const bad = await owner.patch(url, {
      version: 1,
      title: ' ',
      groupSize: 0,
      classId: 'nope',
      tubIds: [f.tub['Mk2 A']],
      reliefTeacherId: ids[PARTNER],
      endsAt: '2026-07-28T11:00',
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(paths(bad), [
      'classId',
      'endsAt',
      'groupSize',
      'reliefTeacherId',
      'title',
      'tubIds.0',
    ]);
    const [row] = await t.database.db.select().from(lessons).where(eq(lessons.id, lesson.id));
    assert.equal(row!.version, 1);
    assert.equal(row!.title, 'Build the chassis');
    assert.equal((await owner.patch(url, { version: 1 })).status, 400, 'nothing to change');
  });

  it('a new kit type must hold every part the activities use, and rebooks its tubs', async () => {
    const lesson = await newLesson(await newUnit());
    const owner = await as(TEACHER);
    const url = `/api/lessons/${lesson.id}`;
    await owner.post(`${url}/activities`, {
      title: 'Build',
      kind: 'build',
      minutes: 20,
      materials: [{ partCode: 'TR-010', qty: 2, per: 'group' }],
    });
    const refused = await owner.patch(url, { version: 1, kitTypeId: f.gateKit });
    assert.equal(refused.status, 400);
    assert.match(refused.body.error.details[0].message, /Trial Gate Tub does not have: TR-010/);
    const moved = await owner.patch(url, { version: 1, kitTypeId: f.mk2Kit });
    assert.equal(moved.status, 200);
    assert.equal(moved.body.kitType.name, 'Trial Rover Mk2');
    assert.deepEqual(moved.body.tubIds, [f.tub['Mk2 A']]);
    const booked = await t.database.db
      .select()
      .from(lessonTubs)
      .where(eq(lessonTubs.lessonId, lesson.id));
    assert.deepEqual(
      booked.map((b) => b.tubId),
      [f.tub['Mk2 A']],
    );
  });

  it('switches kit type in one save, mapping or leaving out the parts the new one lacks', async () => {
    const owner = await as(TEACHER);
    const setUp = async () => {
      const lesson = await newLesson(await newUnit());
      const url = `/api/lessons/${lesson.id}`;
      const made = await owner.post(`${url}/activities`, {
        title: 'Build',
        kind: 'build',
        minutes: 20,
        materials: [
          { partCode: 'TR-010', qty: 2, per: 'group' },
          { partCode: 'TR-020', qty: 1, per: 'group' },
          { consumable: 'Masking tape', qty: 1, per: 'group' },
        ],
      });
      assert.equal(made.status, 201, made.text);
      return { lesson, url };
    };
    const linesOf = async (lessonId: string) =>
      (
        await t.database.db
          .select({
            code: materials.partCode,
            consumable: materials.consumable,
            v: activities.version,
          })
          .from(materials)
          .innerJoin(activities, eq(activities.id, materials.activityId))
          .where(eq(activities.lessonId, lessonId))
          .orderBy(materials.position)
      ).map((l) => [l.code ?? l.consumable, l.v]);

    // Mapped: TR-010 becomes TG-001; TR-020 left out; the consumable stays.
    const a = await setUp();
    const refusedTwice = await owner.patch(a.url, {
      version: 1,
      kitTypeId: f.gateKit,
      partMap: { 'TR-010': 'TG-001', 'TR-020': 'TG-001' },
    });
    assert.equal(refusedTwice.status, 400, 'one part listed twice in an activity');
    assert.match(refusedTwice.body.error.details[0].message, /would list TG-001 twice/);
    const unknown = await owner.patch(a.url, {
      version: 1,
      kitTypeId: f.gateKit,
      partMap: { 'TR-010': 'TG-999' },
      dropMissingParts: true,
    });
    assert.equal(unknown.status, 400);
    assert.deepEqual(paths(unknown), ['partMap.TR-010']);
    assert.deepEqual(
      await linesOf(a.lesson.id),
      [
        ['TR-010', 1],
        ['TR-020', 1],
        ['Masking tape', 1],
      ],
      'refused saves change nothing',
    );
    const half = await owner.patch(a.url, {
      version: 1,
      kitTypeId: f.gateKit,
      partMap: { 'TR-010': 'TG-001' },
    });
    assert.equal(half.status, 400, 'TR-020 is neither mapped nor left out');
    assert.match(half.body.error.details[0].message, /does not have: TR-020\./);
    const moved = await owner.patch(a.url, {
      version: 1,
      kitTypeId: f.gateKit,
      partMap: { 'TR-010': 'TG-001' },
      dropMissingParts: true,
    });
    assert.equal(moved.status, 200, moved.text);
    assert.equal(moved.body.kitType.name, 'Trial Gate Tub');
    assert.deepEqual(moved.body.tubIds, [f.tub['Gate 1']]);
    assert.deepEqual(await linesOf(a.lesson.id), [
      ['TG-001', 2],
      ['Masking tape', 2],
    ]);
    // The lesson plans with the new kit (no part it lacks is left behind).
    assert.equal((await owner.get(`${a.url}/prep`)).status, 200);
  });

  it('who may edit: authors (lead and shared readers 403, other schools 404, anonymous 401)', async () => {
    const lesson = await newLesson(await newUnit('school'));
    const url = `/api/lessons/${lesson.id}`;
    assert.equal((await (await as(LEAD)).patch(url, { version: 1, title: 'x' })).status, 403);
    assert.equal((await (await as(PARTNER)).patch(url, { version: 1, title: 'x' })).status, 403);
    assert.equal((await (await as(ADMIN)).patch(url, { version: 1, title: 'x' })).status, 404);
    assert.equal(
      (await (await as(OTHER_TEACHER)).patch(url, { version: 1, title: 'x' })).status,
      404,
    );
    assert.equal((await new Browser(t.app).patch(url, { version: 1, title: 'x' })).status, 401);
    const [row] = await t.database.db.select().from(lessons).where(eq(lessons.id, lesson.id));
    assert.equal(row!.version, 1);
  });
});

describe('DELETE /api/lessons/:id', () => {
  it('an author deletes a lesson with its activities; others are refused', async () => {
    const lesson = await newLesson(await newUnit('school'));
    const url = `/api/lessons/${lesson.id}`;
    const act = await (
      await as(TEACHER)
    ).post(`${url}/activities`, { title: 'Reflect', kind: 'reflect', minutes: 5, materials: [] });
    assert.equal((await (await as(PARTNER)).delete(url)).status, 403);
    assert.equal((await (await as(OTHER_TEACHER)).delete(url)).status, 404);
    assert.equal((await new Browser(t.app).delete(url)).status, 401);
    assert.equal((await (await as(TEACHER)).delete(`${url}?version=5`)).status, 409);
    assert.equal((await (await as(TEACHER)).delete(url)).status, 204);
    assert.equal(
      (await t.database.db.select().from(lessons).where(eq(lessons.id, lesson.id))).length,
      0,
    );
    assert.equal(
      (await t.database.db.select().from(activities).where(eq(activities.id, act.body.id))).length,
      0,
    );
    assert.equal((await (await as(TEACHER)).get(url)).status, 404);
  });
});

describe('PUT /api/lessons/:id/activity-order', () => {
  it('reorders in one go; stale versions and out-of-date lists are 409, malformed lists 400', async () => {
    const lesson = await newLesson(await newUnit('school'));
    const url = `/api/lessons/${lesson.id}`;
    const owner = await as(TEACHER);
    const made: string[] = [];
    for (const title of ['One', 'Two', 'Three']) {
      made.push(
        (await owner.post(`${url}/activities`, { title, kind: 'other', minutes: 5 })).body.id,
      );
    }
    const [a, b, c] = made as [string, string, string];
    const res = await owner.send('put', `${url}/activity-order`, {
      version: 1,
      activityIds: [b, c, a],
    });
    assert.equal(res.status, 200);
    assert.equal(res.body.version, 2);
    assert.deepEqual(
      res.body.activities.map((x: { title: string }) => x.title),
      ['Two', 'Three', 'One'],
    );
    const stale = await owner.send('put', `${url}/activity-order`, {
      version: 1,
      activityIds: [a, b, c],
    });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.version, 2);
    const partial = await owner.send('put', `${url}/activity-order`, {
      version: 2,
      activityIds: [a, b],
    });
    assert.equal(partial.status, 409);
    assert.equal(partial.body.error.code, 'order-changed');
    const bad = await owner.send('put', `${url}/activity-order`, { activityIds: [a, a] });
    assert.equal(bad.status, 400);
    assert.deepEqual(paths(bad), ['activityIds.1', 'version']);
    assert.equal(
      (
        await (
          await as(PARTNER)
        ).send('put', `${url}/activity-order`, { version: 2, activityIds: [a, b, c] })
      ).status,
      403,
    );
    assert.equal(
      (
        await (
          await as(OTHER_TEACHER)
        ).send('put', `${url}/activity-order`, { version: 2, activityIds: [a, b, c] })
      ).status,
      404,
    );
    const rows = await t.database.db
      .select()
      .from(activities)
      .where(eq(activities.lessonId, lesson.id));
    assert.deepEqual(
      rows.sort((x, y) => x.position - y.position).map((x) => x.title),
      ['Two', 'Three', 'One'],
    );
  });
});

describe('booking conflicts where the teacher plans (PREP-RULES.md, "Across lessons")', () => {
  it('saving a lesson that double-books tubs answers the conflict beside it; the prep plan warns', async () => {
    const unitId = await newUnit();
    const day = { startsAt: '2026-11-03T11:10', endsAt: '2026-11-03T12:00' };
    const first = await newLesson(unitId, {
      ...day,
      title: 'Gears first',
      tubIds: [f.tub['Tub 1'], f.tub['Tub 2']],
    });
    assert.deepEqual(first.bookingConflicts, [], 'nothing else books those tubs then');
    // Overlaps by 20 minutes and shares Tub 2.
    const second = await newLesson(unitId, {
      title: 'Gears second',
      startsAt: '2026-11-03T11:40',
      endsAt: '2026-11-03T12:30',
      tubIds: [f.tub['Tub 2']],
    });
    assert.equal(second.bookingConflicts.length, 1);
    const c = second.bookingConflicts[0];
    assert.equal(c.lessonId, first.id);
    assert.deepEqual(c.tubs, ['Tub 2']);
    assert.equal(
      c.message,
      'Double-booked: Tub 2 is also booked for “Gears first” (4Q, Tue 3 Nov, 11:10 am–12:00 pm). ' +
        'Move one lesson or book other tubs.',
    );
    const owner = await as(TEACHER);
    const plan = (await owner.get(`/api/lessons/${first.id}/prep`)).body;
    const warning = plan.warnings.find((w: { code: string }) => w.code === 'booking-conflict');
    assert.ok(warning, 'the first lesson is warned too');
    assert.match(
      warning.message,
      /Tub 2 is also booked for “Gears second” \(4Q, Tue 3 Nov, 11:40 am–12:30 pm\)/,
    );

    // Back to back is no conflict: [start, end) intervals.
    const after = await newLesson(unitId, {
      title: 'Gears after',
      startsAt: '2026-11-03T12:30',
      endsAt: '2026-11-03T13:20',
      tubIds: [f.tub['Tub 2']],
    });
    assert.deepEqual(after.bookingConflicts, []);
    const moved = await owner.patch(`/api/lessons/${second.id}`, {
      version: second.version,
      startsAt: '2026-11-03T13:00',
      endsAt: '2026-11-03T13:50',
    });
    assert.equal(moved.status, 200, moved.text);
    assert.deepEqual(
      moved.body.bookingConflicts.map((x: { title: string }) => x.title),
      ['Gears after'],
    );
  });

  it('lists conflicts earliest first, then by end, then by lesson id, the same on every read', async () => {
    const unitId = await newUnit();
    const at = (from: string, to: string) => ({
      startsAt: `2026-11-10T${from}`,
      endsAt: `2026-11-10T${to}`,
    });
    // Created out of order: a longer lesson (whose title sorts first), three alike, then an
    // earlier one.
    const long = await newLesson(unitId, {
      ...at('11:10', '12:50'),
      title: 'Order across lunch',
      tubIds: [f.tub['Tub 2']],
    });
    const alike: string[] = [];
    for (let i = 0; i < 3; i++)
      alike.push(
        (
          await newLesson(unitId, {
            ...at('11:10', '12:00'),
            title: 'Order alike',
            tubIds: [f.tub['Tub 1']],
          })
        ).id,
      );
    const early = await newLesson(unitId, {
      ...at('10:30', '11:40'),
      title: 'Order early',
      tubIds: [f.tub['Tub 1']],
    });
    const target = await newLesson(unitId, {
      ...at('11:10', '12:00'),
      title: 'Order target',
      tubIds: [f.tub['Tub 1'], f.tub['Tub 2']],
    });
    const expected = [early.id, ...[...alike].sort(), long.id];
    assert.deepEqual(
      target.bookingConflicts.map((c: { lessonId: string }) => c.lessonId),
      expected,
    );
    const owner = await as(TEACHER);
    const again = (await owner.get(`/api/lessons/${target.id}`)).body;
    assert.deepEqual(again.bookingConflicts, target.bookingConflicts);
    const plan = (await owner.get(`/api/lessons/${target.id}/prep`)).body;
    assert.deepEqual(
      plan.warnings
        .filter((w: { code: string }) => w.code === 'booking-conflict')
        .map((w: { message: string }) => w.message),
      target.bookingConflicts.map((c: { message: string }) => c.message),
    );
  });
});
