/**
 * The relief teacher's "Today" (issue 13): today's assigned lessons in the school's timezone, in
 * time order, with room, class, notes, build instructions and the prep tasks still open.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { asc, eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { Browser, testApp, type TestApp } from '../support/app.js';
import { RELIEF, TEACHER, browsers, userByEmail, type SignIn } from '../support/planning.js';
import { lessons, units } from '../../server/db/schema/index.js';

const ZONE = 'Australia/Adelaide';
let t: TestApp;
let as: SignIn;
let ids: string[] = [];

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const relief = await userByEmail(db, RELIEF);
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  ids = (
    await db
      .select()
      .from(lessons)
      .where(eq(lessons.unitId, unit!.id))
      .orderBy(asc(lessons.position))
  ).map((r) => r.id);
  // IANA time zone database through Luxon: today and tomorrow in the school's zone.
  const today = DateTime.now().setZone(ZONE).toISODate()!;
  const tomorrow = DateTime.now().setZone(ZONE).plus({ days: 1 }).toISODate()!;
  const set = (id: string, day: string, from: string, to: string) =>
    db
      .update(lessons)
      .set({ startsAt: `${day} ${from}`, endsAt: `${day} ${to}`, reliefTeacherId: relief.id })
      .where(eq(lessons.id, id));
  await set(ids[4]!, today, '13:40:00', '14:30:00');
  await set(ids[5]!, today, '09:00:00', '09:50:00');
  await set(ids[6]!, tomorrow, '09:00:00', '09:50:00');
});
after(async () => {
  await t.close();
});

describe('relief today', () => {
  it('lists today’s assigned lessons in time order with their open prep tasks', async () => {
    const res = await (await as(RELIEF)).get('/api/relief/today');
    assert.equal(res.status, 200, res.text);
    assert.equal(res.body.date, DateTime.now().setZone(ZONE).toISODate());
    assert.deepEqual(
      res.body.lessons.map((l: { id: string }) => l.id),
      [ids[5], ids[4]],
      'today only, earliest first',
    );
    const now = Date.now();
    for (const lesson of res.body.lessons) {
      assert.ok('room' in lesson && 'className' in lesson && 'reliefNotes' in lesson);
      assert.ok(Array.isArray(lesson.activities));
      for (const task of lesson.openTasks) assert.ok(Date.parse(task.doneBy) > now - 5000);
      const plan = (await (await as(TEACHER)).get(`/api/lessons/${lesson.id}/prep`)).body;
      const open = plan.tasks.filter((x: { doneBy: string }) => Date.parse(x.doneBy) > now);
      assert.equal(lesson.openTasks.length, open.length);
    }
  });

  it('is for relief teachers only', async () => {
    assert.equal((await (await as(TEACHER)).get('/api/relief/today')).status, 403);
    assert.equal((await new Browser(t.app).get('/api/relief/today')).status, 401);
  });
});
