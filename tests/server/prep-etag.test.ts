/**
 * Conditional GET of a lesson's plan: an ETag that changes with everything the plan is computed
 * from, 304 for an unchanged plan (RFC 9110 §13.1.2 If-None-Match, §15.4.5 304 Not Modified), and
 * `Cache-Control: private, no-cache` so the browser revalidates by itself (RFC 9111 §5.2.2.4).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq, ne, sql } from 'drizzle-orm';
import { Browser, testApp, type TestApp } from '../support/app.js';
import { OTHER_ADMIN, browsers, schoolIds, type SignIn } from '../support/planning.js';
import {
  activities,
  classes,
  lessonTubs,
  lessons,
  materials,
  parts,
  prepTaskTicks,
  schoolSettings,
  schools,
  tubMissing,
  units,
  users,
} from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let lesson: typeof lessons.$inferSelect;
let url = '';
/** The lesson's unit's owner, who may read its plan. */
let OWNER = '';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel } = await schoolIds(db);
  // A demo lesson that books tubs and has materials: the plan reads every kind of row.
  const [row] = await db
    .select({ lesson: lessons, owner: users.email })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .innerJoin(users, eq(users.id, units.ownerId))
    .innerJoin(lessonTubs, eq(lessonTubs.lessonId, lessons.id))
    .innerJoin(activities, eq(activities.lessonId, lessons.id))
    .innerJoin(materials, eq(materials.activityId, activities.id))
    .where(eq(lessons.schoolId, kestrel))
    .limit(1);
  assert.ok(row, 'the demo school has a lesson with tubs and materials');
  lesson = row.lesson;
  OWNER = row.owner;
  url = `/api/lessons/${lesson.id}/prep`;
});
after(async () => {
  await t.close();
});

const conditional = async (b: Browser, tag: string) =>
  b.agent.get(url).set('If-None-Match', tag).buffer(true);

describe('GET /api/lessons/:id/prep answers 304 for an unchanged plan', () => {
  it('sends a strong ETag with private, no-cache; If-None-Match with it is 304 with no body', async () => {
    const admin = await as(OWNER);
    const first = await admin.get(url);
    assert.equal(first.status, 200);
    const tag = first.headers['etag'] as string;
    assert.match(tag, /^"[^"]+"$/, 'a strong entity tag (RFC 9110 §8.8.3)');
    assert.equal(first.headers['cache-control'], 'private, no-cache');
    assert.equal((await admin.get(url)).headers['etag'], tag, 'the same plan, the same tag');

    const again = await conditional(admin, tag);
    assert.equal(again.status, 304);
    assert.equal(again.text ?? '', '');
    assert.equal(again.headers['etag'], tag);
    // A tag list or a weak comparison (W/) matches too (RFC 9110 §13.1.2 uses weak comparison).
    assert.equal((await conditional(admin, `"other", W/${tag}`)).status, 304);
    assert.equal((await conditional(admin, '"not-this-plan"')).status, 200);
  });

  // The server keeps answers by their tag (server/prep/plan-cache.ts): a kept answer must never
  // outlive a change, whoever asks and whether or not they send If-None-Match.
  it('an unconditional GET after a change answers the new plan, never a kept one', async () => {
    const owner = await as(OWNER);
    const first = await owner.get(url);
    assert.deepEqual((await owner.get(url)).body, first.body, 'the same plan twice');
    const sizes = (body: { groups: { size: number }[] }) => body.groups.map((g) => g.size);
    const [row] = await t.database.db.select().from(lessons).where(eq(lessons.id, lesson.id));
    const groupSize = row!.groupSize === 2 ? 3 : 2;
    await t.database.db.update(lessons).set({ groupSize }).where(eq(lessons.id, lesson.id));
    const after = await owner.get(url);
    assert.equal(after.status, 200);
    assert.notEqual(after.headers['etag'], first.headers['etag']);
    assert.ok(sizes(after.body).every((s) => s <= groupSize + 1));
    assert.notDeepEqual(sizes(after.body), sizes(first.body), 'the groups follow the new size');
    // Put back: the first answer's tag does not come back (a new row version), the plan does.
    await t.database.db
      .update(lessons)
      .set({ groupSize: row!.groupSize })
      .where(eq(lessons.id, lesson.id));
    const back = await owner.get(url);
    assert.deepEqual(sizes(back.body), sizes(first.body));
    assert.notEqual(back.headers['etag'], first.headers['etag']);
  });

  it('another school gets 404 and anonymous 401, never a 304 that confirms the lesson', async () => {
    const tag = (await (await as(OWNER)).get(url)).headers['etag'] as string;
    assert.equal((await conditional(await as(OTHER_ADMIN), tag)).status, 404);
    assert.equal((await conditional(new Browser(t.app), tag)).status, 401);
  });

  // Each change is written straight to the database, as any route or a second instance would.
  const db = () => t.database.db;
  const changes: [string, () => Promise<unknown>][] = [
    [
      'the lesson',
      () =>
        db()
          .update(lessons)
          .set({ groupSize: lesson.groupSize === 3 ? 4 : 3 })
          .where(eq(lessons.id, lesson.id)),
    ],
    [
      'its class',
      () =>
        db()
          .update(classes)
          .set({ studentCount: sql`${classes.studentCount} + 1` })
          .where(eq(classes.id, lesson.classId)),
    ],
    [
      'an activity',
      () =>
        db()
          .update(activities)
          .set({ minutes: sql`${activities.minutes} + 1` })
          .where(eq(activities.lessonId, lesson.id)),
    ],
    [
      'a material',
      async () => {
        const [a] = await db()
          .select({ id: activities.id })
          .from(activities)
          .innerJoin(materials, eq(materials.activityId, activities.id))
          .where(eq(activities.lessonId, lesson.id))
          .limit(1);
        await db()
          .update(materials)
          .set({ qty: sql`${materials.qty} + 1` })
          .where(eq(materials.activityId, a!.id));
      },
    ],
    [
      'a part of the kit',
      () =>
        db()
          .update(parts)
          .set({ qty: sql`${parts.qty} + 1` })
          .where(eq(parts.kitTypeId, lesson.kitTypeId)),
    ],
    [
      'a booked tub’s missing parts',
      async () => {
        const [booked] = await db()
          .select()
          .from(lessonTubs)
          .where(eq(lessonTubs.lessonId, lesson.id));
        const [part] = await db()
          .select()
          .from(parts)
          .where(eq(parts.kitTypeId, lesson.kitTypeId))
          .limit(1);
        await db()
          .insert(tubMissing)
          .values({ tubId: booked!.tubId, partCode: part!.code, count: 1 })
          .onConflictDoUpdate({
            target: [tubMissing.tubId, tubMissing.partCode],
            set: { count: sql`${tubMissing.count} + 1` },
          });
      },
    ],
    [
      'the school’s prep settings',
      () =>
        db()
          .update(schoolSettings)
          .set({ version: sql`${schoolSettings.version} + 1` })
          .where(eq(schoolSettings.schoolId, lesson.schoolId)),
    ],
    [
      'the school’s time zone',
      () =>
        db()
          .update(schools)
          .set({ timezone: sql`${schools.timezone}` })
          .where(eq(schools.id, lesson.schoolId)),
    ],
    [
      'a prep task ticked',
      () => db().insert(prepTaskTicks).values({ lessonId: lesson.id, taskKey: 'etag-test' }),
    ],
    [
      'another lesson the same day booking one of its tubs',
      async () => {
        const [other] = await db()
          .select({ id: lessons.id })
          .from(lessons)
          .where(and(eq(lessons.schoolId, lesson.schoolId), ne(lessons.id, lesson.id)))
          .limit(1);
        await db()
          .update(lessons)
          .set({
            startsAt: lesson.endsAt,
            endsAt: sql`${lesson.endsAt}::timestamp + interval '50 minutes'`,
          })
          .where(eq(lessons.id, other!.id));
        const [booked] = await db()
          .select()
          .from(lessonTubs)
          .where(eq(lessonTubs.lessonId, lesson.id));
        await db()
          .insert(lessonTubs)
          .values({ lessonId: other!.id, tubId: booked!.tubId })
          .onConflictDoNothing();
      },
    ],
  ];
  for (const [what, change] of changes) {
    it(`a change to ${what} changes the tag: the next conditional GET is a full 200`, async () => {
      const admin = await as(OWNER);
      const before = (await admin.get(url)).headers['etag'] as string;
      assert.equal((await conditional(admin, before)).status, 304);
      await change();
      const after = await conditional(admin, before);
      assert.equal(after.status, 200, `${what}: the plan is sent again`);
      assert.notEqual(after.headers['etag'], before);
      assert.equal((await conditional(admin, after.headers['etag'] as string)).status, 304);
    });
  }
});
