/**
 * Prep-task ticks (GET/PUT /api/lessons/:id/prep/ticks, and the ticks inside the prep answer and
 * the agenda): shared by the lesson's teachers — its unit's owner and co-authors and the relief
 * teacher assigned to it — set and cleared idempotently by the task's key in the plan.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import {
  addTeacher,
  ADMIN,
  BANKSIA_FLAT,
  KESTREL_RIDGE,
  LEAD,
  OTHER_ADMIN,
  OTHER_TEACHER,
  PARTNER,
  RELIEF,
  TEACHER,
  userByEmail,
} from '../support/planning.js';
import { Browser as Anonymous } from '../support/app.js';
import { demoLessonId } from '../support/trays.js';
import { lessons, prepTaskTicks, unitCoauthors, units } from '../../server/db/schema/index.js';
import type { LessonPrep } from '../../shared/prep/index.js';

let t: TestApp;
let owner: Browser;
let lessonId = '';
let prep: LessonPrep;
const url = () => `/api/lessons/${lessonId}/prep/ticks`;
const put = (b: Browser, body: unknown) => b.send('put', url(), body);
const rows = () =>
  t.database.db.select().from(prepTaskTicks).where(eq(prepTaskTicks.lessonId, lessonId));

before(async () => {
  t = await testApp();
  const db = t.database.db;
  lessonId = await demoLessonId(db);
  const [lesson] = await db.select().from(lessons).where(eq(lessons.id, lessonId));
  // The unit is shared with the school, so another teacher reads it but does not run it; the
  // partner co-authors it and the relief teacher is assigned to this lesson.
  await db.update(units).set({ visibility: 'school' }).where(eq(units.id, lesson!.unitId));
  const partner = await userByEmail(db, PARTNER);
  await db.insert(unitCoauthors).values({ unitId: lesson!.unitId, userId: partner.id });
  const relief = await userByEmail(db, RELIEF);
  await db.update(lessons).set({ reliefTeacherId: relief.id }).where(eq(lessons.id, lessonId));
  await addTeacher(db, KESTREL_RIDGE, 'colleague@kestrel-ridge.example', 'Colleague');
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  owner = await signedIn(t.app, TEACHER);
  prep = (await owner.get(`/api/lessons/${lessonId}/prep`)).body as LessonPrep;
});
after(async () => {
  await t.close();
});

describe('prep-task ticks', () => {
  it('gives every task a key that names it without counts, and no tick at first', () => {
    const keys = prep.tasks.map((task) => task.key);
    assert.ok(keys.includes('pull'));
    assert.ok(
      keys.some((k) => /^charge:/.test(k)),
      'the demo lesson charges its controllers',
    );
    assert.equal(new Set(keys).size, keys.length, 'keys are unique within a plan');
    assert.deepEqual(prep.ticks, []);
  });

  it('a tick by the owner is seen by the co-author, the relief teacher and on the agenda', async () => {
    const charge = prep.tasks.find((task) => task.kind === 'charge')!;
    const res = await put(owner, { taskKey: charge.key, done: true });
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(
      res.body.ticks.map((x: { taskKey: string }) => x.taskKey),
      [charge.key],
    );
    assert.equal(res.body.ticks[0].by.name, (await userByEmail(t.database.db, TEACHER)).name);
    for (const email of [PARTNER, RELIEF]) {
      const b = await signedIn(t.app, email);
      const seen = await b.get(`/api/lessons/${lessonId}/prep`);
      assert.equal(seen.status, 200, `${email}: ${seen.text}`);
      assert.deepEqual(seen.body.ticks, res.body.ticks, email);
      assert.deepEqual((await b.get(url())).body, res.body, email);
    }
    const week = prep.timeline.segments[0]!.startsAt.slice(0, 10);
    const agenda = await owner.get(`/api/agenda?week=${week}&mine=true`);
    assert.equal(agenda.status, 200);
    const mine = agenda.body.tasks.filter(
      (x: { lesson: { id: string } }) => x.lesson.id === lessonId,
    );
    assert.equal(mine.length, prep.tasks.length);
    for (const task of mine) {
      assert.equal(task.tick !== null, task.key === charge.key, task.key);
    }
  });

  it('setting twice keeps the first tick; clearing twice leaves it cleared (idempotent)', async () => {
    const pull = prep.tasks.find((task) => task.kind === 'pull')!;
    const partner = await signedIn(t.app, PARTNER);
    const first = await put(partner, { taskKey: pull.key, done: true });
    const again = await put(owner, { taskKey: pull.key, done: true });
    assert.equal(again.status, 200);
    assert.deepEqual(again.body, first.body, 'the same state, first tick kept');
    const tick = again.body.ticks.find((x: { taskKey: string }) => x.taskKey === pull.key);
    assert.equal(tick.by.name, (await userByEmail(t.database.db, PARTNER)).name);
    assert.equal((await rows()).filter((r) => r.taskKey === pull.key).length, 1);
    for (let i = 0; i < 2; i++) {
      const cleared = await put(owner, { taskKey: pull.key, done: false });
      assert.equal(cleared.status, 200);
      assert.ok(!cleared.body.ticks.some((x: { taskKey: string }) => x.taskKey === pull.key));
    }
    assert.equal((await rows()).filter((r) => r.taskKey === pull.key).length, 0);
  });

  it('a tick stays on its task when the plan’s counts change (group size edited)', async () => {
    const charge = prep.tasks.find((task) => task.kind === 'charge')!;
    const lesson = (await owner.get(`/api/lessons/${lessonId}`)).body;
    const record = lesson.lesson ?? lesson;
    // Groups of 8 need fewer controllers than the demo's groups (fewer than 8).
    const groupSize = 8;
    assert.ok(record.groupSize < 8);
    const edit = await owner.patch(`/api/lessons/${lessonId}`, {
      version: record.version,
      groupSize,
    });
    assert.equal(edit.status, 200, edit.text);
    const now = (await owner.get(`/api/lessons/${lessonId}/prep`)).body as LessonPrep;
    const recharge = now.tasks.find((task) => task.key === charge.key)!;
    assert.notEqual(recharge.label, charge.label, 'the count of controllers changed');
    assert.ok(now.ticks.some((x) => x.taskKey === charge.key));
  });

  it('refuses a task the plan does not have and bad bodies (400), changing nothing', async () => {
    const before = await rows();
    for (const body of [
      { taskKey: 'charge:NO-SUCH-PART', done: true },
      { taskKey: 'pull', done: 'yes' },
      { taskKey: '', done: true },
      { taskKey: 'pull\u0000', done: true },
      { taskKey: 'x'.repeat(201), done: true },
      { taskKey: 'pull', done: true, by: 'someone' },
      { done: true },
    ]) {
      const res = await put(owner, body);
      assert.equal(res.status, 400, JSON.stringify(body));
      assert.equal(res.body.error.code, 'invalid-input');
      assert.ok(res.body.error.details.length > 0);
    }
    const unknown = await put(owner, { taskKey: 'sort:nothing', done: true });
    assert.equal(unknown.body.error.details[0].path, 'taskKey');
    assert.deepEqual(await rows(), before);
  });

  it('lets only the lesson’s teachers tick: reader 403, not a reader or other school 404, anonymous 401', async () => {
    const before = await rows();
    const body = { taskKey: 'pull', done: true };
    const expected: [string, number][] = [
      [LEAD, 403],
      ['colleague@kestrel-ridge.example', 403],
      [ADMIN, 404],
      [OTHER_ADMIN, 404],
      [OTHER_TEACHER, 404],
    ];
    for (const [email, status] of expected) {
      const b = await signedIn(t.app, email);
      assert.equal((await put(b, body)).status, status, email);
    }
    // The relief teacher of another lesson cannot read this one.
    const db = t.database.db;
    await db.update(lessons).set({ reliefTeacherId: null }).where(eq(lessons.id, lessonId));
    const relief = await signedIn(t.app, RELIEF);
    assert.equal((await put(relief, body)).status, 404);
    assert.equal((await relief.get(url())).status, 404);
    const relief2 = await userByEmail(db, RELIEF);
    await db.update(lessons).set({ reliefTeacherId: relief2.id }).where(eq(lessons.id, lessonId));
    // Readers who do not run the lesson still see the ticks; others get 404.
    assert.equal((await (await signedIn(t.app, LEAD)).get(url())).status, 200);
    assert.equal((await (await signedIn(t.app, OTHER_ADMIN)).get(url())).status, 404);
    const anonymous = new Anonymous(t.app);
    assert.equal((await put(anonymous, body)).status, 401);
    assert.equal((await anonymous.get(url())).status, 401);
    // Without the CSRF header the owner is refused too.
    assert.equal((await owner.send('put', url(), body, { csrf: false })).status, 403);
    // A malformed or unknown lesson id is a lesson that does not exist (parseParams).
    assert.equal((await owner.send('put', '/api/lessons/not-an-id/prep/ticks', body)).status, 404);
    const missing = `/api/lessons/${crypto.randomUUID()}/prep/ticks`;
    assert.equal((await owner.send('put', missing, body)).status, 404);
    assert.deepEqual(await rows(), before, 'nothing refused was written');
    assert.equal((await put(owner, body)).status, 200);
    assert.deepEqual(
      (await rows()).map((r) => r.taskKey).sort(),
      [...before.map((r) => r.taskKey), 'pull'].sort(),
    );
  });
});
