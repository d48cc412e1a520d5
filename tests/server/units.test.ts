/**
 * Units over HTTP against a real PostgreSQL: create, list, read, edit with versions, delete with
 * lessons, reorder lessons, and who may do each (owner, co-author, other teacher with a private or
 * shared unit, lead, admin, relief, another school, anonymous).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq, sql } from 'drizzle-orm';
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
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  activities,
  lessons,
  materials,
  outcomeFrameworks,
  outcomes,
  units,
} from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let classId = '';
let kitTypeId = '';
let outcomeIds: string[] = [];
let otherOutcomeId = '';

const anonymous = () => new Browser(t.app);

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel, banksia } = await schoolIds(db);
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  ids = await userIds(db);
  classId = await insertClass(db, kestrel, {
    name: '4Q',
    yearLevel: 4,
    studentCount: 24,
    devices: 6,
  });
  kitTypeId = await insertKit(db, kestrel, {
    name: 'Trial Rover Tub',
    parts: [{ code: 'TR-010', name: 'Motor', category: 'motor', qty: 2 }],
  });
  const [fw] = await db
    .insert(outcomeFrameworks)
    .values({ schoolId: kestrel, name: 'Trial framework' })
    .returning();
  outcomeIds = (
    await db
      .insert(outcomes)
      .values([
        {
          frameworkId: fw!.id,
          code: 'TF-1',
          description: 'Designs a simple algorithm.',
          yearBand: '3-4',
        },
        {
          frameworkId: fw!.id,
          code: 'TF-2',
          description: 'Tests a design against criteria.',
          yearBand: '3-4',
        },
      ])
      .returning()
  ).map((o) => o.id);
  const [ofw] = await db
    .insert(outcomeFrameworks)
    .values({ schoolId: banksia, name: 'Elsewhere' })
    .returning();
  const [oo] = await db
    .insert(outcomes)
    .values({ frameworkId: ofw!.id, code: 'EL-1', description: 'Elsewhere.' })
    .returning();
  otherOutcomeId = oo!.id;
});
after(async () => {
  await t.close();
});

async function newUnit(title = 'Rescue rovers (test)', email = TEACHER) {
  const res = await (
    await as(email)
  ).post('/api/units', { title, yearLevel: 4, learningArea: 'Digital Technologies', term: 3 });
  assert.equal(res.status, 201, res.text);
  return res.body as { id: string; version: number };
}
async function addLesson(unitId: string, title: string, day: number) {
  const res = await (
    await as(TEACHER)
  ).post(`/api/units/${unitId}/lessons`, {
    title,
    classId,
    kitTypeId,
    startsAt: `2026-07-${day}T11:10`,
    endsAt: `2026-07-${day}T12:00`,
    groupSize: 4,
  });
  assert.equal(res.status, 201, res.text);
  return res.body as { id: string };
}
async function unitRow(id: string) {
  const [row] = await t.database.db.select().from(units).where(eq(units.id, id));
  return row;
}

describe('POST /api/units', () => {
  it('creates a draft, private unit owned by the teacher (201)', async () => {
    const res = await (
      await as(TEACHER)
    ).post('/api/units', {
      title: '  Smart gates  ',
      yearLevel: 6,
      overview: '# Week 1\n\nGates.',
    });
    assert.equal(res.status, 201);
    assert.equal(res.body.title, 'Smart gates');
    assert.equal(res.body.status, 'draft');
    assert.equal(res.body.visibility, 'private');
    assert.equal(res.body.owner.id, ids[TEACHER]);
    assert.equal(res.body.version, 1);
    assert.equal(res.body.canEdit, true);
    assert.equal(res.body.isOwner, true);
    assert.deepEqual(res.body.lessons, []);
    assert.equal((await unitRow(res.body.id))!.overview, '# Week 1\n\nGates.');
  });

  it('lists every issue of a bad body (400) and stores nothing', async () => {
    const before = (await t.database.db.select().from(units)).length;
    const res = await (
      await as(TEACHER)
    ).post('/api/units', { title: ' ', yearLevel: 13, term: 5, overview: 'x'.repeat(20_001) });
    assert.equal(res.status, 400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    assert.deepEqual(paths, ['overview', 'term', 'title', 'yearLevel']);
    assert.equal((await t.database.db.select().from(units)).length, before);
    const b = await as(TEACHER);
    const notJson = await b.agent.post('/api/units').set('X-XSRF-TOKEN', b.csrf).send('title=x');
    assert.equal(notJson.status, 400);
    assert.equal(notJson.body.error.details[0].message, 'Send the details as a JSON object.');
  });

  for (const email of [LEAD, ADMIN, RELIEF]) {
    it(`refuses a ${email.split('@')[0]} (403): only teachers author units`, async () => {
      const res = await (await as(email)).post('/api/units', { title: 'Not mine', yearLevel: 4 });
      assert.equal(res.status, 403);
    });
  }
  it('refuses anonymous (401)', async () => {
    assert.equal((await anonymous().post('/api/units', { title: 'X', yearLevel: 4 })).status, 401);
  });
});

describe('who may read and edit a unit', () => {
  let privateUnit = '';
  let sharedUnit = '';
  before(async () => {
    privateUnit = (await newUnit('Private unit')).id;
    sharedUnit = (await newUnit('Shared unit')).id;
    const owner = await as(TEACHER);
    const v = (await owner.get(`/api/units/${sharedUnit}`)).body.version;
    const shared = await owner.patch(`/api/units/${sharedUnit}`, {
      version: v,
      visibility: 'school',
    });
    assert.equal(shared.status, 200);
    const pv = (await owner.get(`/api/units/${privateUnit}`)).body.version;
    const co = await owner.patch(`/api/units/${privateUnit}`, {
      version: pv,
      coauthorIds: [ids[PARTNER]],
    });
    assert.equal(co.status, 200, co.text);
    assert.deepEqual(
      co.body.coauthors.map((c: { id: string }) => c.id),
      [ids[PARTNER]],
    );
  });

  // [who, private unit read, shared unit read, edit of a readable one]
  const matrix: [string, number, number, number][] = [
    [TEACHER, 200, 200, 200], // owner
    [LEAD, 200, 200, 403], // reads all, edits none
    [ADMIN, 404, 404, 404],
    [RELIEF, 404, 404, 404],
    [OTHER_TEACHER, 404, 404, 404], // another school: never told the unit exists
  ];
  for (const [email, privateRead, sharedRead, edit] of matrix) {
    it(`${email}: reads private ${privateRead}, shared ${sharedRead}; edits ${edit}`, async () => {
      const b = await as(email);
      assert.equal((await b.get(`/api/units/${privateUnit}`)).status, privateRead);
      assert.equal((await b.get(`/api/units/${sharedUnit}`)).status, sharedRead);
      const current = (await unitRow(sharedUnit))!;
      const res = await b.patch(`/api/units/${sharedUnit}`, {
        version: current.version,
        learningArea: `Tried by ${email}`,
      });
      assert.equal(res.status, edit);
      if (edit !== 200)
        assert.equal((await unitRow(sharedUnit))!.version, current.version, 'unchanged');
    });
  }

  it('a co-author reads and edits the private unit; only the owner changes co-authors', async () => {
    const partner = await as(PARTNER);
    const read = await partner.get(`/api/units/${privateUnit}`);
    assert.equal(read.status, 200);
    assert.equal(read.body.canEdit, true);
    assert.equal(read.body.isOwner, false);
    const edit = await partner.patch(`/api/units/${privateUnit}`, {
      version: read.body.version,
      title: 'Private unit, co-edited',
    });
    assert.equal(edit.status, 200);
    assert.equal(edit.body.version, read.body.version + 1);
    const coauthors = await partner.patch(`/api/units/${privateUnit}`, {
      version: edit.body.version,
      coauthorIds: [],
    });
    assert.equal(coauthors.status, 403);
  });

  it('another teacher of the school reads a shared unit (not editable, 403) but never a private one (404)', async () => {
    // The partner is no co-author of the shared unit: a reader only.
    const partner = await as(PARTNER);
    const read = await partner.get(`/api/units/${sharedUnit}`);
    assert.equal(read.status, 200);
    assert.equal(read.body.canEdit, false);
    assert.equal(
      (
        await partner.patch(`/api/units/${sharedUnit}`, {
          version: read.body.version,
          title: 'Hijacked',
        })
      ).status,
      403,
    );
    const other = await newUnit('Owner only');
    assert.equal((await partner.get(`/api/units/${other.id}`)).status, 404);
    assert.equal(
      (await partner.patch(`/api/units/${other.id}`, { version: 1, title: 'x' })).status,
      404,
    );
  });

  it('anonymous is 401 on every unit route', async () => {
    const a = anonymous();
    assert.equal((await a.get('/api/units')).status, 401);
    assert.equal((await a.get(`/api/units/${sharedUnit}`)).status, 401);
    assert.equal(
      (await a.patch(`/api/units/${sharedUnit}`, { version: 1, title: 'x' })).status,
      401,
    );
    assert.equal((await a.delete(`/api/units/${sharedUnit}`)).status, 401);
    assert.equal(
      (await a.send('put', `/api/units/${sharedUnit}/lesson-order`, { version: 1, lessonIds: [] }))
        .status,
      401,
    );
  });
});

describe('GET /api/units (My units and the library)', () => {
  let mine = '';
  let shared = '';
  before(async () => {
    mine = (await newUnit('Bridges of card (mine)')).id;
    shared = (await newUnit('Wind-up cars (partner, shared)', PARTNER)).id;
    const partner = await as(PARTNER);
    await partner.patch(`/api/units/${shared}`, { version: 1, visibility: 'school' });
  });

  it('"mine" holds owned and co-authored units; the library holds units shared with the school', async () => {
    const teacher = await as(TEACHER);
    const myList = await teacher.get('/api/units?scope=mine');
    assert.equal(myList.status, 200);
    const myIds = myList.body.units.map((u: { id: string }) => u.id);
    assert.ok(myIds.includes(mine));
    assert.ok(!myIds.includes(shared));
    const byDefault = await teacher.get('/api/units');
    assert.deepEqual(
      byDefault.body.units.map((u: { id: string }) => u.id),
      myIds,
      'the default scope is mine',
    );
    // The partner co-authors one of the teacher's units: it is in the partner's "mine" too.
    const coauthored = await newUnit('Co-authored for the list');
    await teacher.patch(`/api/units/${coauthored.id}`, { version: 1, coauthorIds: [ids[PARTNER]] });
    const partnerMine = await (await as(PARTNER)).get('/api/units?scope=mine');
    const partnerIds = partnerMine.body.units.map((u: { id: string }) => u.id);
    assert.ok(partnerIds.includes(coauthored.id) && partnerIds.includes(shared));
    assert.equal(
      partnerMine.body.units.find((u: { id: string }) => u.id === coauthored.id).canEdit,
      true,
    );
    const library = await teacher.get('/api/units?scope=library');
    const libIds = library.body.units.map((u: { id: string }) => u.id);
    assert.ok(libIds.includes(shared));
    assert.ok(!libIds.includes(mine), 'a private unit is not in the library');
    const row = library.body.units.find((u: { id: string }) => u.id === shared);
    assert.equal(row.canEdit, false);
    assert.equal(row.owner.id, ids[PARTNER]);
  });

  it('filters by year level, term, status, owner and words of the title', async () => {
    const teacher = await as(TEACHER);
    const q = await teacher.get(
      `/api/units?scope=library&q=${encodeURIComponent('wind-up')}&owner=${ids[PARTNER]}&term=3&yearLevel=4&status=draft`,
    );
    assert.deepEqual(
      q.body.units.map((u: { id: string }) => u.id),
      [shared],
    );
    const none = await teacher.get('/api/units?scope=library&yearLevel=5');
    assert.equal(none.body.units.length, 0);
    const literal = await teacher.get(`/api/units?scope=mine&q=${encodeURIComponent('%')}`);
    assert.equal(literal.body.units.length, 0, 'a % is looked for literally, not as a wildcard');
  });

  it('a lead sees every unit of the school in the library, private ones too', async () => {
    const res = await (await as(LEAD)).get('/api/units?scope=library');
    const libIds = res.body.units.map((u: { id: string }) => u.id);
    assert.ok(libIds.includes(mine) && libIds.includes(shared));
  });

  it('refuses bad filters (400 with every issue)', async () => {
    const res = await (
      await as(TEACHER)
    ).get('/api/units?scope=everything&yearLevel=4.5&status=done&owner=me');
    assert.equal(res.status, 400);
    assert.deepEqual(res.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'owner',
      'scope',
      'status',
      'yearLevel',
    ]);
  });

  it('refuses admins and relief teachers (403); another school sees none of these units', async () => {
    assert.equal((await (await as(ADMIN)).get('/api/units')).status, 403);
    assert.equal((await (await as(RELIEF)).get('/api/units')).status, 403);
    const other = await (await as(OTHER_TEACHER)).get('/api/units?scope=library');
    assert.equal(other.status, 200);
    assert.deepEqual(other.body.units, []);
  });
});

describe('PATCH /api/units/:id', () => {
  it('changes fields, outcomes and co-authors and answers the new version', async () => {
    const unit = await newUnit('Patch me');
    const res = await (
      await as(TEACHER)
    ).patch(`/api/units/${unit.id}`, {
      version: 1,
      title: 'Patched',
      term: null,
      overview: 'Plan **bold**',
      outcomeIds,
      coauthorIds: [ids[PARTNER]],
    });
    assert.equal(res.status, 200);
    assert.equal(res.body.version, 2);
    assert.equal(res.body.title, 'Patched');
    assert.equal(res.body.term, null);
    assert.deepEqual(
      res.body.outcomes.map((o: { code: string }) => o.code),
      ['TF-1', 'TF-2'],
    );
    assert.deepEqual(
      res.body.coauthors.map((c: { id: string }) => c.id),
      [ids[PARTNER]],
    );
  });

  it('of two saves of the same version at once, exactly one wins and the other is 409', async () => {
    const unit = await newUnit('Race');
    const owner = await as(TEACHER);
    const partner = await as(PARTNER);
    await owner.patch(`/api/units/${unit.id}`, { version: 1, coauthorIds: [ids[PARTNER]] });
    const [a, b] = await Promise.all([
      owner.patch(`/api/units/${unit.id}`, { version: 2, title: 'Owner wins?' }),
      partner.patch(`/api/units/${unit.id}`, { version: 2, title: 'Partner wins?' }),
    ]);
    assert.deepEqual([a.status, b.status].sort(), [200, 409]);
    const winner = a.status === 200 ? a : b;
    const row = (await unitRow(unit.id))!;
    assert.equal(row.version, 3);
    assert.equal(row.title, winner.body.title);
  });

  it('answers a stale version with 409 and the current unit, and changes nothing (RFC 9110 §15.5.10)', async () => {
    const unit = await newUnit('Two editors');
    const owner = await as(TEACHER);
    const first = await owner.patch(`/api/units/${unit.id}`, { version: 1, title: 'First save' });
    assert.equal(first.status, 200);
    // RFC 9110 §15.5.10: 409 Conflict, "a conflict with the current state of the target resource".
    const second = await owner.patch(`/api/units/${unit.id}`, { version: 1, title: 'Second save' });
    assert.equal(second.status, 409);
    assert.equal(second.body.error.code, 'stale-version');
    assert.equal(second.body.error.current.title, 'First save');
    assert.equal(second.body.error.current.version, 2);
    const row = (await unitRow(unit.id))!;
    assert.equal(row.title, 'First save');
    assert.equal(row.version, 2);
  });

  it('lists every problem (400), outcomes and co-authors of another school included, and changes nothing', async () => {
    const unit = await newUnit('Bad patch');
    const res = await (
      await as(TEACHER)
    ).patch(`/api/units/${unit.id}`, {
      version: 'one',
      title: '',
      visibility: 'public',
      yearLevel: -1,
      outcomeIds: [outcomeIds[0], otherOutcomeId, outcomeIds[0]],
      coauthorIds: [ids[OTHER_TEACHER], ids[LEAD], ids[TEACHER]],
    });
    assert.equal(res.status, 400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    assert.deepEqual(paths, [
      'coauthorIds.0',
      'coauthorIds.1',
      'coauthorIds.2',
      'outcomeIds.1',
      'outcomeIds.2',
      'title',
      'version',
      'visibility',
      'yearLevel',
    ]);
    const row = (await unitRow(unit.id))!;
    assert.equal(row.title, 'Bad patch');
    assert.equal(row.version, 1);
  });

  it('refuses an edit with nothing to change (400) and an id that is no id (404)', async () => {
    const unit = await newUnit('Nothing');
    assert.equal(
      (await (await as(TEACHER)).patch(`/api/units/${unit.id}`, { version: 1 })).status,
      400,
    );
    assert.equal(
      (await (await as(TEACHER)).patch('/api/units/not-an-id', { version: 1, title: 'x' })).status,
      404,
    );
  });
});

describe('lessons dated outside the unit term', () => {
  it('are flagged in the unit (the seed has Term 3 from 2026-07-20 to 2026-09-25)', async () => {
    const unit = await newUnit('Term check'); // term 3
    await addLesson(unit.id, 'In term', 21);
    const res = await (
      await as(TEACHER)
    ).post(`/api/units/${unit.id}/lessons`, {
      title: 'In the holidays',
      classId,
      kitTypeId,
      startsAt: '2026-10-01T11:10',
      endsAt: '2026-10-01T12:00',
      groupSize: 4,
    });
    assert.equal(res.status, 201, res.text);
    const read = await (await as(TEACHER)).get(`/api/units/${unit.id}`);
    const notes = read.body.lessons.map((l: { title: string; termNote: string | null }) => [
      l.title,
      l.termNote,
    ]);
    assert.deepEqual(notes, [
      ['In term', null],
      [
        'In the holidays',
        "Dated outside the unit's term: Term 3 runs 20 July 2026 to 25 Sept 2026.",
      ],
    ]);
  });
});

describe('the units list: Last changed', () => {
  it('moves when a lesson or an activity of the unit changes, and when a lesson goes', async () => {
    const unit = await newUnit('Changing underneath');
    const owner = await as(TEACHER);
    const listed = async () =>
      (await owner.get('/api/units?scope=mine')).body.units.find(
        (u: { id: string }) => u.id === unit.id,
      ).updatedAt as string;
    const created = await listed();
    const lesson = await addLesson(unit.id, 'Lesson to change', 24);
    const afterAdd = await listed();
    assert.ok(afterAdd > created, 'adding a lesson');
    const full = (await owner.get(`/api/lessons/${lesson.id}`)).body;
    const patched = await owner.patch(`/api/lessons/${lesson.id}`, {
      version: full.version,
      title: 'Lesson changed',
    });
    assert.equal(patched.status, 200, patched.text);
    const afterPatch = await listed();
    assert.ok(afterPatch > afterAdd, 'changing a lesson');
    const activity = await owner.post(`/api/lessons/${lesson.id}/activities`, {
      title: 'Warm-up',
      kind: 'intro',
      minutes: 5,
      materials: [],
    });
    assert.equal(activity.status, 201, activity.text);
    const afterActivity = await listed();
    assert.ok(afterActivity > afterPatch, 'adding an activity');
    assert.equal((await owner.delete(`/api/lessons/${lesson.id}`)).status, 204);
    assert.ok((await listed()) > afterActivity, 'deleting a lesson');
  });
});

describe('PUT /api/units/:id/lesson-order', () => {
  it('reorders the lessons in one go and bumps the version', async () => {
    const unit = await newUnit('Ordered');
    const a = await addLesson(unit.id, 'Lesson A', 21);
    const b = await addLesson(unit.id, 'Lesson B', 22);
    const c = await addLesson(unit.id, 'Lesson C', 23);
    const owner = await as(TEACHER);
    const before = await owner.get(`/api/units/${unit.id}`);
    assert.deepEqual(
      before.body.lessons.map((l: { title: string }) => l.title),
      ['Lesson A', 'Lesson B', 'Lesson C'],
    );
    assert.equal(before.body.lessons[0].className, '4Q');
    assert.equal(before.body.lessons[0].date, '2026-07-21');
    const res = await owner.send('put', `/api/units/${unit.id}/lesson-order`, {
      version: before.body.version,
      lessonIds: [c.id, a.id, b.id],
    });
    assert.equal(res.status, 200);
    assert.deepEqual(
      res.body.lessons.map((l: { title: string }) => l.title),
      ['Lesson C', 'Lesson A', 'Lesson B'],
    );
    assert.equal(res.body.version, before.body.version + 1);

    const stale = await owner.send('put', `/api/units/${unit.id}/lesson-order`, {
      version: before.body.version,
      lessonIds: [a.id, b.id, c.id],
    });
    assert.equal(stale.status, 409);
    assert.deepEqual(
      stale.body.error.current.lessons.map((l: { title: string }) => l.title),
      ['Lesson C', 'Lesson A', 'Lesson B'],
    );

    const missing = await owner.send('put', `/api/units/${unit.id}/lesson-order`, {
      version: res.body.version,
      lessonIds: [a.id, b.id],
    });
    assert.equal(missing.status, 409, 'a list without every lesson of the unit is out of date');
    assert.equal(missing.body.error.code, 'order-changed');
    assert.equal(missing.body.error.current.lessons.length, 3);

    const dup = await owner.send('put', `/api/units/${unit.id}/lesson-order`, {
      version: res.body.version,
      lessonIds: [a.id, a.id, 'x'],
    });
    assert.equal(dup.status, 400);
    assert.deepEqual(dup.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'lessonIds.1',
      'lessonIds.2',
    ]);

    const rows = await t.database.db.select().from(lessons).where(eq(lessons.unitId, unit.id));
    const order = rows.sort((x, y) => x.position - y.position).map((l) => l.title);
    assert.deepEqual(
      order,
      ['Lesson C', 'Lesson A', 'Lesson B'],
      'refused reorders changed nothing',
    );

    assert.equal(
      (
        await (
          await as(LEAD)
        ).send('put', `/api/units/${unit.id}/lesson-order`, {
          version: res.body.version,
          lessonIds: [a.id, b.id, c.id],
        })
      ).status,
      403,
    );
    assert.equal(
      (
        await (
          await as(OTHER_TEACHER)
        ).send('put', `/api/units/${unit.id}/lesson-order`, {
          version: res.body.version,
          lessonIds: [a.id, b.id, c.id],
        })
      ).status,
      404,
    );
  });
});

describe('DELETE /api/units/:id', () => {
  it('only the owner deletes; co-authors and readers are refused (403), other schools 404', async () => {
    const unit = await newUnit('Keep me');
    const owner = await as(TEACHER);
    await owner.patch(`/api/units/${unit.id}`, {
      version: 1,
      coauthorIds: [ids[PARTNER]],
      visibility: 'school',
    });
    assert.equal((await (await as(PARTNER)).delete(`/api/units/${unit.id}`)).status, 403);
    assert.equal((await (await as(LEAD)).delete(`/api/units/${unit.id}`)).status, 403);
    assert.equal((await (await as(ADMIN)).delete(`/api/units/${unit.id}`)).status, 404);
    assert.equal((await (await as(OTHER_TEACHER)).delete(`/api/units/${unit.id}`)).status, 404);
    assert.ok(await unitRow(unit.id));
  });

  it('removes the unit with its lessons, activities and materials', async () => {
    const unit = await newUnit('Remove me');
    const l1 = await addLesson(unit.id, 'Doomed 1', 27);
    await addLesson(unit.id, 'Doomed 2', 28);
    const act = await (
      await as(TEACHER)
    ).post(`/api/lessons/${l1.id}/activities`, {
      title: 'Build',
      kind: 'build',
      minutes: 20,
      materials: [{ partCode: 'TR-010', qty: 2, per: 'group' }],
    });
    assert.equal(act.status, 201);
    const stale = await (await as(TEACHER)).delete(`/api/units/${unit.id}?version=99`);
    assert.equal(stale.status, 409, 'a delete naming an old version is refused');
    const res = await (await as(TEACHER)).delete(`/api/units/${unit.id}`);
    assert.equal(res.status, 204);
    assert.equal(await unitRow(unit.id), undefined);
    assert.equal(
      (await t.database.db.select().from(lessons).where(eq(lessons.unitId, unit.id))).length,
      0,
    );
    assert.equal(
      (await t.database.db.select().from(activities).where(eq(activities.id, act.body.id))).length,
      0,
    );
    assert.equal(
      (await t.database.db.select().from(materials).where(eq(materials.activityId, act.body.id)))
        .length,
      0,
    );
    assert.equal((await (await as(TEACHER)).get(`/api/units/${unit.id}`)).status, 404);
  });

  it('is one transaction: when removing the unit fails, its lessons are all still there', async () => {
    const unit = await newUnit('Undeletable');
    await addLesson(unit.id, 'Survivor 1', 29);
    await addLesson(unit.id, 'Survivor 2', 30);
    const db = t.database.db;
    // A trigger makes the unit's own DELETE fail after its lessons were deleted in the same transaction.
    await db.execute(
      sql.raw(`
      CREATE FUNCTION refuse_unit_delete() RETURNS trigger AS $$
      BEGIN RAISE EXCEPTION 'refused for the test'; END $$ LANGUAGE plpgsql;
      CREATE TRIGGER refuse_unit_delete BEFORE DELETE ON units
        FOR EACH ROW WHEN (OLD.id = '${unit.id}') EXECUTE FUNCTION refuse_unit_delete();`),
    );
    const logged: unknown[] = [];
    const log = console.error;
    console.error = (...args: unknown[]) => void logged.push(args);
    try {
      const res = await (await as(TEACHER)).delete(`/api/units/${unit.id}`);
      assert.equal(res.status, 500);
      assert.equal(logged.length, 1, 'the failure is logged once on the server');
      const left = await db.select().from(lessons).where(eq(lessons.unitId, unit.id));
      assert.deepEqual(left.map((l) => l.title).sort(), ['Survivor 1', 'Survivor 2']);
    } finally {
      console.error = log;
      await db.execute(
        sql.raw('DROP TRIGGER refuse_unit_delete ON units; DROP FUNCTION refuse_unit_delete();'),
      );
    }
  });
});
