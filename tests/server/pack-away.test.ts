/**
 * POST /api/lessons/:id/pack-away: one audit per booked tub with the lesson's id, in one
 * transaction, as POST /api/tubs/:id/audits records each. Checked by arithmetic on the tubs'
 * stock (after = before − missing + found, per part) and by forcing failures midway.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq, sql } from 'drizzle-orm';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { LEAD, OTHER_ADMIN, RELIEF, TEACHER, userByEmail } from '../support/planning.js';
import { demoLessonId } from '../support/trays.js';
import { lessons, lessonTubs, tubAudits, tubMissing, tubs } from '../../server/db/schema/index.js';
import type { PrepPlan } from '../../shared/prep/index.js';

let t: TestApp;
let teacher: Browser;
let lessonId = '';
let plan: PrepPlan;
/** Booked tubs by label. */
let booked: Record<string, string> = {};

async function stock(tubId: string): Promise<Record<string, number>> {
  const res = await teacher.get(`/api/tubs/${tubId}`);
  assert.equal(res.status, 200);
  return res.body.tub.stock as Record<string, number>;
}

async function snapshot() {
  const db = t.database.db;
  return {
    audits: await db.select().from(tubAudits),
    missing: await db.select().from(tubMissing).orderBy(tubMissing.tubId, tubMissing.partCode),
  };
}

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, TEACHER);
  lessonId = await demoLessonId(t.database.db);
  plan = (await teacher.get(`/api/lessons/${lessonId}/prep`)).body as PrepPlan;
  const rows = await t.database.db
    .select({ id: tubs.id, label: tubs.label })
    .from(lessonTubs)
    .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
    .where(eq(lessonTubs.lessonId, lessonId));
  booked = Object.fromEntries(rows.map((r) => [r.label, r.id]));
});
after(async () => {
  await t.close();
});

describe('POST /api/lessons/:id/pack-away', () => {
  it('writes one audit per tub with the lesson id; stock after = before − missing + found; borrows come back', async () => {
    assert.ok(plan.borrows.length > 0, 'the demo lesson borrows between tubs');
    const borrow = plan.borrows[0]!;
    const home = booked[borrow.homeTub]!;
    const lender = booked[borrow.fromTub]!;
    // Parts the home tub holds plenty of, so no count is cut at 0 or at the kit's quantity.
    const full = await stock(home);
    const [lostCode, foundCode] = Object.entries(full)
      .filter(([, n]) => n >= 4)
      .map(([code]) => code);
    assert.ok(lostCode && foundCode);
    const line = { partCode: lostCode };
    // Something the home tub already misses, that turns up in the lost-parts box.
    await t.database.db
      .insert(tubMissing)
      .values({ tubId: home, partCode: foundCode, count: 3 })
      .onConflictDoUpdate({ target: [tubMissing.tubId, tubMissing.partCode], set: { count: 3 } });
    const before = { home: await stock(home), lender: await stock(lender) };
    const res = await teacher.post(`/api/lessons/${lessonId}/pack-away`, {
      tubs: [
        {
          tubId: home,
          missing: [{ partCode: line.partCode, count: 2 }],
          found: [{ partCode: foundCode, count: 1 }],
        },
        { tubId: lender, missing: [], found: [] },
      ],
      note: 'Counted back by the groups.',
    });
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.audits.length, 2);
    for (const a of res.body.audits) assert.equal(a.lessonId, lessonId);
    assert.deepEqual(
      res.body.audits.map((a: { tubId: string }) => a.tubId),
      [home, lender],
    );
    const after = { home: await stock(home), lender: await stock(lender) };
    const expected = { ...before.home };
    expected[line.partCode] = before.home[line.partCode]! - 2;
    expected[foundCode] = before.home[foundCode]! + 1;
    assert.deepEqual(after.home, expected);
    // The lender's pieces all came back: its stock is what it was.
    assert.deepEqual(after.lender, before.lender);
    const history = await teacher.get(`/api/tubs/${home}/audits`);
    assert.equal(history.body.audits[0].lessonId, lessonId);
  });

  it('refuses a tub not booked for the lesson, a tub twice, or a bad count (400), writing nothing', async () => {
    const [unbooked] = await t.database.db
      .select({ id: tubs.id })
      .from(tubs)
      .where(sql`${tubs.id} NOT IN (SELECT tub_id FROM lesson_tubs WHERE lesson_id = ${lessonId})`);
    const tubId = Object.values(booked)[0]!;
    const before = await snapshot();
    for (const body of [
      { tubs: [{ tubId: unbooked!.id, missing: [], found: [] }] },
      {
        tubs: [
          { tubId, missing: [] },
          { tubId, missing: [] },
        ],
      },
      { tubs: [{ tubId, missing: [{ partCode: 'X', count: 0 }] }] },
      { tubs: [] },
    ]) {
      const res = await teacher.post(`/api/lessons/${lessonId}/pack-away`, body);
      assert.equal(res.status, 400, JSON.stringify(body));
    }
    assert.deepEqual(await snapshot(), before);
  });

  it('writes nothing when a later tub fails: an unknown part (400) or a forced database error', async () => {
    const [first, second] = Object.values(booked).sort();
    const code = plan.groups[0]!.lines[0]!.partCode;
    const before = await snapshot();
    const bad = await teacher.post(`/api/lessons/${lessonId}/pack-away`, {
      tubs: [
        { tubId: first, missing: [{ partCode: code, count: 1 }] },
        { tubId: second, missing: [{ partCode: 'NOT-A-PART', count: 1 }] },
      ],
    });
    assert.equal(bad.status, 400);
    assert.equal(bad.body.error.details[0].path, 'tubs.1.missing.0.partCode');
    assert.deepEqual(await snapshot(), before);
    // A failure the route cannot foresee: the second audit's insert is made to fail.
    await t.database.db.execute(
      sql.raw(`
      CREATE FUNCTION fail_second_audit() RETURNS trigger AS $$
      BEGIN
        IF EXISTS (SELECT 1 FROM tub_audits WHERE lesson_id = NEW.lesson_id AND note = 'forced') THEN
          RAISE EXCEPTION 'forced failure';
        END IF;
        RETURN NEW;
      END $$ LANGUAGE plpgsql;
      CREATE TRIGGER fail_second_audit BEFORE INSERT ON tub_audits
        FOR EACH ROW WHEN (NEW.note = 'forced') EXECUTE FUNCTION fail_second_audit();`),
    );
    const originalError = console.error;
    console.error = () => {};
    try {
      const res = await teacher.post(`/api/lessons/${lessonId}/pack-away`, {
        tubs: [
          { tubId: first, missing: [{ partCode: code, count: 1 }] },
          { tubId: second, missing: [{ partCode: code, count: 1 }] },
        ],
        note: 'forced',
      });
      assert.equal(res.status, 500);
    } finally {
      console.error = originalError;
      await t.database.db.execute(
        sql.raw('DROP TRIGGER fail_second_audit ON tub_audits; DROP FUNCTION fail_second_audit();'),
      );
    }
    assert.deepEqual(await snapshot(), before);
  });

  it('lets the lesson’s relief teacher record it; 404 for another relief teacher or school, 403 for a lead, 401 anonymous', async () => {
    const tubId = Object.values(booked)[0]!;
    const body = { tubs: [{ tubId, missing: [], found: [] }] };
    const relief = await signedIn(t.app, RELIEF);
    const reliefId = (await userByEmail(t.database.db, RELIEF)).id;
    await t.database.db
      .update(lessons)
      .set({ reliefTeacherId: null })
      .where(eq(lessons.id, lessonId));
    assert.equal((await relief.post(`/api/lessons/${lessonId}/pack-away`, body)).status, 404);
    await t.database.db
      .update(lessons)
      .set({ reliefTeacherId: reliefId })
      .where(eq(lessons.id, lessonId));
    assert.equal((await relief.post(`/api/lessons/${lessonId}/pack-away`, body)).status, 201);
    const lead = await signedIn(t.app, LEAD);
    assert.equal((await lead.post(`/api/lessons/${lessonId}/pack-away`, body)).status, 403);
    const other = await signedIn(t.app, OTHER_ADMIN);
    assert.equal((await other.post(`/api/lessons/${lessonId}/pack-away`, body)).status, 404);
    const anonymous = new (await import('../support/app.js')).Browser(t.app);
    assert.equal((await anonymous.post(`/api/lessons/${lessonId}/pack-away`, body)).status, 401);
  });
});
