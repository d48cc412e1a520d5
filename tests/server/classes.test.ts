import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  OTHER_ADMIN,
  PARTNER,
  TEACHER,
  insertTestLesson,
  userByEmail,
} from '../support/planning.js';
import { classes, classTeachers } from '../../server/db/schema/index.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const userId = async (email: string) => (await userByEmail(t.database.db, email)).id;

/** Adds a class through the API, as set-up for a test of other routes; returns the class. */
async function newClass(b: Browser, body: Record<string, unknown>) {
  const res = await b.post('/api/classes', body);
  assert.equal(res.status, 201, res.text);
  return res.body.class;
}

const classCount = async () => (await t.database.db.select().from(classes)).length;

/** A lesson for the class, written straight to the database (the lesson routes are not this suite's). */
async function lessonFor(classId: string): Promise<void> {
  const admin = await signedIn(t.app, ADMIN);
  const kit = await admin.post('/api/kit-types', { name: `Kit for class ${classId.slice(0, 8)}` });
  await insertTestLesson(t.database.db, await userByEmail(t.database.db, TEACHER), {
    classId,
    kitTypeId: kit.body.kitType.id,
    yearLevel: 3,
    startsAt: '2026-07-28T11:10:00',
    endsAt: '2026-07-28T12:00:00',
  });
}

describe('classes: who may do what', () => {
  it('anonymous gets 401 on every route', async () => {
    const b = new Browser(t.app);
    const id = '00000000-0000-4000-8000-000000000000';
    assert.equal((await b.get('/api/classes')).status, 401);
    assert.equal((await b.get(`/api/classes/${id}`)).status, 401);
    assert.equal(
      (await b.post('/api/classes', { name: '3A', yearLevel: 3, studentCount: 20, devices: 5 }))
        .status,
      401,
    );
    assert.equal((await b.patch(`/api/classes/${id}`, { devices: 6 })).status, 401);
    assert.equal((await b.delete(`/api/classes/${id}`)).status, 401);
  });

  it('a relief teacher may not list classes, and neither relief nor a lead may change them (403)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const { id } = await newClass(admin, {
      name: '3R',
      yearLevel: 3,
      studentCount: 20,
      devices: 5,
    });
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    assert.equal((await relief.get('/api/classes')).status, 403);
    assert.equal((await relief.get(`/api/classes/${id}`)).status, 403);
    const lead = await signedIn(t.app, 'lead@kestrel-ridge.example');
    assert.equal((await lead.get('/api/classes')).status, 200, 'a lead reads classes');
    const before = await classCount();
    for (const b of [relief, lead]) {
      assert.equal(
        (await b.post('/api/classes', { name: '3Q', yearLevel: 3, studentCount: 20, devices: 5 }))
          .status,
        403,
      );
      assert.equal((await b.patch(`/api/classes/${id}`, { devices: 9 })).status, 403);
      assert.equal((await b.delete(`/api/classes/${id}`)).status, 403);
    }
    assert.equal(await classCount(), before);
    assert.equal((await admin.get(`/api/classes/${id}`)).body.class.devices, 5);
  });

  it("a teacher may not change or delete a colleague's class (403); its teachers and admins may", async () => {
    const admin = await signedIn(t.app, ADMIN);
    const partnerId = await userId(PARTNER);
    const made = await newClass(admin, {
      name: '4C',
      yearLevel: 4,
      studentCount: 25,
      devices: 6,
      teacherIds: [partnerId],
    });
    const teacher = await signedIn(t.app, TEACHER);
    assert.equal((await teacher.get(`/api/classes/${made.id}`)).status, 200, 'still read');
    const patched = await teacher.patch(`/api/classes/${made.id}`, { devices: 1 });
    assert.equal(patched.status, 403);
    assert.match(patched.body.error.message, /teachers of this class/);
    assert.equal((await teacher.delete(`/api/classes/${made.id}`)).status, 403);
    assert.deepEqual((await admin.get(`/api/classes/${made.id}`)).body.class, made);
    // A class nobody teaches yet is the admins' to change.
    const unowned = await newClass(admin, {
      name: '4D',
      yearLevel: 4,
      studentCount: 20,
      devices: 5,
    });
    assert.equal((await teacher.patch(`/api/classes/${unowned.id}`, { devices: 2 })).status, 403);

    const partner = await signedIn(t.app, PARTNER);
    assert.equal((await partner.patch(`/api/classes/${made.id}`, { devices: 7 })).status, 200);
    assert.equal((await admin.patch(`/api/classes/${made.id}`, { devices: 8 })).status, 200);
    assert.equal((await partner.delete(`/api/classes/${made.id}`)).status, 204);
  });

  it("another school's class is not found (404) and not listed", async () => {
    const admin = await signedIn(t.app, ADMIN);
    const { id } = await newClass(admin, {
      name: '5B',
      yearLevel: 5,
      studentCount: 24,
      devices: 6,
    });
    const other = await signedIn(t.app, OTHER_ADMIN);
    assert.equal((await other.get(`/api/classes/${id}`)).status, 404);
    assert.equal((await other.patch(`/api/classes/${id}`, { devices: 1 })).status, 404);
    assert.equal((await other.delete(`/api/classes/${id}`)).status, 404);
    const list = await other.get('/api/classes');
    assert.ok(!list.body.classes.some((c: { id: string }) => c.id === id));
    assert.equal((await admin.get(`/api/classes/${id}`)).body.class.devices, 6);
    assert.equal(
      (await other.get('/api/classes/not-an-id')).status,
      404,
      'a malformed id cannot exist',
    );
  });
});

describe('classes: creating', () => {
  it('a teacher adds a class and teaches it (201)', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const res = await teacher.post('/api/classes', {
      name: ' 4Z ',
      yearLevel: 4,
      studentCount: 27,
      devices: 8,
    });
    assert.equal(res.status, 201);
    const c = res.body.class;
    assert.equal(c.name, '4Z');
    assert.deepEqual([c.yearLevel, c.studentCount, c.devices, c.lessonCount], [4, 27, 8, 0]);
    assert.deepEqual(
      c.teachers.map((x: { email: string }) => x.email),
      [TEACHER],
    );
    const list = await teacher.get('/api/classes');
    assert.ok(list.body.classes.some((x: { id: string }) => x.id === c.id));
    assert.deepEqual((await teacher.get(`/api/classes/${c.id}`)).body.class, c);
  });

  it('an admin names the teachers; the first year of school is year level 0', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const ids = [await userId(TEACHER), await userId('partner@kestrel-ridge.example')];
    const res = await admin.post('/api/classes', {
      name: 'FW',
      yearLevel: 0,
      studentCount: 1,
      devices: 0,
      teacherIds: ids,
    });
    assert.equal(res.status, 201);
    assert.equal(res.body.class.yearLevel, 0);
    assert.deepEqual(
      res.body.class.teachers.map((x: { id: string }) => x.id).sort(),
      [...ids].sort(),
    );
  });

  it('refuses bad input with every issue listed (400) and stores nothing', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const before = await classCount();
    const res = await admin.post('/api/classes', {
      name: '',
      yearLevel: 13,
      studentCount: 0,
      devices: 2.5,
      teacherIds: ['x'],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(res.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'devices',
      'name',
      'studentCount',
      'teacherIds.0',
      'yearLevel',
    ]);
    const limits = await admin.post('/api/classes', {
      name: 'X',
      yearLevel: -1,
      studentCount: 61,
      devices: 201,
    });
    assert.deepEqual(
      limits.body.error.details
        .map((d: { path: string; message: string }) => [d.path, d.message])
        .sort(),
      [
        ['devices', 'Use a whole number from 0 to 200.'],
        ['studentCount', 'Use a whole number from 1 to 60.'],
        ['yearLevel', 'Use a whole number from 0 to 12.'],
      ],
    );
    assert.equal(await classCount(), before);
  });

  it('refuses teachers who are not teachers of the school (400)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const before = await classCount();
    const res = await admin.post('/api/classes', {
      name: '6Q',
      yearLevel: 6,
      studentCount: 25,
      devices: 5,
      teacherIds: [
        await userId(TEACHER),
        await userId('lead@kestrel-ridge.example'),
        await userId(OTHER_ADMIN),
      ],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(
      res.body.error.details.map((d: { path: string }) => d.path),
      ['teacherIds.1', 'teacherIds.2'],
    );
    assert.equal(await classCount(), before);
  });

  it('a class name is unique in the school, whatever its capitals (409); another school may reuse it', async () => {
    const admin = await signedIn(t.app, ADMIN);
    assert.equal(
      (await admin.post('/api/classes', { name: '2D', yearLevel: 2, studentCount: 20, devices: 4 }))
        .status,
      201,
    );
    const again = await admin.post('/api/classes', {
      name: '2d',
      yearLevel: 2,
      studentCount: 21,
      devices: 4,
    });
    assert.equal(again.status, 409);
    assert.deepEqual(
      again.body.error.details.map((d: { path: string }) => d.path),
      ['name'],
    );
    const other = await signedIn(t.app, OTHER_ADMIN);
    assert.equal(
      (await other.post('/api/classes', { name: '2D', yearLevel: 2, studentCount: 12, devices: 2 }))
        .status,
      201,
    );
  });
});

describe('classes: changing and deleting', () => {
  it('PATCH changes the given fields and replaces the teachers', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const { id } = await newClass(admin, {
      name: '1P',
      yearLevel: 1,
      studentCount: 22,
      devices: 4,
      teacherIds: [await userId(TEACHER)],
    });
    const partner = await userId('partner@kestrel-ridge.example');
    const res = await (
      await signedIn(t.app, TEACHER)
    ).patch(`/api/classes/${id}`, { studentCount: 23, teacherIds: [partner] });
    assert.equal(res.status, 200);
    assert.equal(res.body.class.studentCount, 23);
    assert.equal(res.body.class.name, '1P');
    assert.deepEqual(
      res.body.class.teachers.map((x: { id: string }) => x.id),
      [partner],
    );
    const rows = await t.database.db
      .select()
      .from(classTeachers)
      .where(eq(classTeachers.classId, id));
    assert.deepEqual(
      rows.map((r) => r.userId),
      [partner],
    );
  });

  it('PATCH refuses bad input (400, nothing changed), an empty change, and a taken name (409)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const made = await newClass(admin, { name: '1Q', yearLevel: 1, studentCount: 22, devices: 4 });
    const id = made.id;
    const bad = await admin.patch(`/api/classes/${id}`, { studentCount: 99, name: '' });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'name',
      'studentCount',
    ]);
    assert.equal((await admin.patch(`/api/classes/${id}`, {})).status, 400);
    assert.equal(
      (await admin.patch(`/api/classes/${id}`, { name: '1p' })).status,
      409,
      '1P exists',
    );
    assert.deepEqual((await admin.get(`/api/classes/${id}`)).body.class, made);
  });

  it('deleting a class that lessons use is refused (409, clear message); an unused one goes (204)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const used = (
      await admin.post('/api/classes', { name: '6U', yearLevel: 6, studentCount: 29, devices: 8 })
    ).body.class;
    await lessonFor(used.id);
    const refused = await admin.delete(`/api/classes/${used.id}`);
    assert.equal(refused.status, 409);
    assert.match(refused.body.error.message, /6U is used by 1 lesson/);
    assert.equal((await admin.get(`/api/classes/${used.id}`)).body.class.lessonCount, 1);

    const unused = (
      await admin.post('/api/classes', { name: '6V', yearLevel: 6, studentCount: 29, devices: 8 })
    ).body.class;
    assert.equal((await admin.delete(`/api/classes/${unused.id}`)).status, 204);
    assert.equal((await admin.get(`/api/classes/${unused.id}`)).status, 404);
    assert.equal(
      (await t.database.db.select().from(classes).where(eq(classes.id, unused.id))).length,
      0,
    );
  });
});
