import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq, ne } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { ADMIN, OTHER_ADMIN, insertTestLesson, userByEmail } from '../support/planning.js';
import {
  bellPeriods,
  lessons,
  schools,
  schoolSettings,
  terms,
} from '../../server/db/schema/index.js';
import { DEFAULT_PREP, isIanaTimeZone } from '../../shared/schemas/school.js';
import { DEFAULT_PREP_SETTINGS, prepSettingsSchema } from '../../shared/prep/schema.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const schoolIdOf = async (email: string) => (await userByEmail(t.database.db, email)).schoolId;

/** A full settings form: four terms, five periods and two non-teaching days (test values). */
function form(version: number, extra: Record<string, unknown> = {}) {
  return {
    version,
    name: 'Kestrel Ridge Primary School',
    timezone: 'Australia/Adelaide',
    paperSize: 'A4',
    prep: { sparesPercent: 20, sortMinutesPerTub: 25 },
    terms: [
      { name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' },
      { name: 'Term 1', startsOn: '2026-01-28', endsOn: '2026-04-10' },
      { name: 'Term 2', startsOn: '2026-04-27', endsOn: '2026-07-03' },
      { name: 'Term 4', startsOn: '2026-10-12', endsOn: '2026-12-11' },
    ],
    periods: [
      { name: 'Period 2', startsAt: '09:50', endsAt: '10:40' },
      { name: 'Period 1', startsAt: '09:00', endsAt: '09:50' },
      { name: 'Period 3', startsAt: '11:10', endsAt: '12:00' },
    ],
    nonTeachingDays: [
      { date: '2026-08-14', reason: 'Staff development day' },
      { date: '2026-07-20', reason: 'Pupil-free day' },
    ],
    ...extra,
  };
}

const put = (b: Browser, body: unknown) => b.send('put', '/api/school', body);

describe('school settings: who may read and change them', () => {
  it('anonymous gets 401 for reading, the zone list and saving', async () => {
    const b = new Browser(t.app);
    assert.equal((await b.get('/api/school')).status, 401);
    assert.equal((await b.get('/api/school/timezones')).status, 401);
    assert.equal((await put(b, form(1))).status, 401);
  });

  it('every role of the school reads them; only the admin saves (403 for the others, nothing saved)', async () => {
    for (const who of ['lead', 'teacher', 'partner', 'relief']) {
      const b = await signedIn(t.app, `${who}@kestrel-ridge.example`);
      const read = await b.get('/api/school');
      assert.equal(read.status, 200, who);
      assert.equal(read.body.school.name, 'Kestrel Ridge Primary School');
      const res = await put(b, form(read.body.school.version, { name: `Renamed by ${who}` }));
      assert.equal(res.status, 403, who);
    }
    const [school] = await t.database.db
      .select()
      .from(schools)
      .where(eq(schools.id, await schoolIdOf(ADMIN)));
    assert.equal(school!.name, 'Kestrel Ridge Primary School');
  });

  it("each school reads and saves only its own settings (another school's never change)", async () => {
    const other = await signedIn(t.app, OTHER_ADMIN);
    const read = await other.get('/api/school');
    assert.equal(read.body.school.name, 'Banksia Flat School');
    const saved = await put(other, {
      ...form(read.body.school.version),
      name: 'Banksia Flat School',
      timezone: 'Australia/Perth',
    });
    assert.equal(saved.status, 200);
    const mine = await (await signedIn(t.app, ADMIN)).get('/api/school');
    assert.equal(mine.body.school.name, 'Kestrel Ridge Primary School');
    assert.notEqual(mine.body.school.timezone, 'Australia/Perth');
    assert.ok(
      !mine.body.school.terms.some((x: { id: string }) =>
        saved.body.school.terms.some((y: { id: string }) => y.id === x.id),
      ),
    );
  });
});

describe('school settings: reading', () => {
  it('a school without a settings row reads the defaults at version 1', async () => {
    const schoolId = await schoolIdOf(OTHER_ADMIN);
    await t.database.db.delete(schoolSettings).where(eq(schoolSettings.schoolId, schoolId));
    const res = await (await signedIn(t.app, OTHER_ADMIN)).get('/api/school');
    assert.equal(res.status, 200);
    assert.equal(res.body.school.version, 1);
    assert.deepEqual(res.body.school.prep, DEFAULT_PREP);
  });

  it('stored allowances are merged over the defaults key by key', async () => {
    const schoolId = await schoolIdOf(OTHER_ADMIN);
    await t.database.db
      .insert(schoolSettings)
      .values({ schoolId, prep: { sparesPercent: 25, setOutMinutes: -3 }, version: 4 })
      .onConflictDoUpdate({
        target: schoolSettings.schoolId,
        set: { prep: { sparesPercent: 25, setOutMinutes: -3 }, version: 4 },
      });
    const res = await (await signedIn(t.app, OTHER_ADMIN)).get('/api/school');
    assert.equal(res.body.school.version, 4);
    assert.equal(res.body.school.prep.sparesPercent, 25);
    assert.equal(
      res.body.school.prep.setOutMinutes,
      5,
      'an out-of-range stored value falls back to its default',
    );
  });

  it('the defaults are the prep engine’s defaults, and the largest allowed values are accepted by the engine', () => {
    // PREP-RULES.md, "settings": both sides must agree, or a saved setting could break a plan.
    assert.deepEqual({ ...DEFAULT_PREP }, { ...DEFAULT_PREP_SETTINGS });
    const largest = {
      setOutMinutes: 480,
      packAwayBaseMinutes: 480,
      packAwaySecondsPerPiece: 3600,
      pullBaseMinutes: 1440,
      pullSecondsPerLine: 3600,
      pullSecondsPerPiece: 3600,
      sparesPercent: 50,
      chargeBufferMinutes: 1440,
      sortMinutesPerTub: 1440,
      deviceCheckMinutesPerDevice: 60,
    };
    const settings = prepSettingsSchema.safeParse(largest);
    assert.equal(settings.success, true);
  });
});

describe('school settings: saving', () => {
  it('saves everything in one go; terms and days come back by date, periods by time, version + 1', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const { version } = (await admin.get('/api/school')).body.school;
    const res = await put(admin, form(version, { paperSize: 'Letter' }));
    assert.equal(res.status, 200);
    const s = res.body.school;
    assert.equal(s.version, version + 1);
    assert.equal(s.paperSize, 'Letter');
    assert.equal(s.prep.sparesPercent, 20);
    assert.equal(s.prep.sortMinutesPerTub, 25);
    assert.equal(s.prep.pullSecondsPerLine, 20, 'left out, so the default');
    assert.deepEqual(
      s.terms.map((x: { name: string }) => x.name),
      ['Term 1', 'Term 2', 'Term 3', 'Term 4'],
    );
    assert.deepEqual(
      s.periods.map((x: { name: string }) => x.name),
      ['Period 1', 'Period 2', 'Period 3'],
    );
    assert.deepEqual(
      s.nonTeachingDays.map((x: { date: string }) => x.date),
      ['2026-07-20', '2026-08-14'],
    );
    assert.deepEqual((await admin.get('/api/school')).body.school, s);
  });

  it('keeps the ids of periods sent back, so lessons booked in a period stay linked', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const s = (await admin.get('/api/school')).body.school;
    const periods = s.periods.map((p: { id: string; name: string }) =>
      p.name === 'Period 3' ? { ...p, name: 'Period 3 (after recess)' } : p,
    );
    const res = await put(admin, { ...form(s.version), periods, terms: s.terms.slice(1) });
    assert.equal(res.status, 200);
    assert.deepEqual(
      res.body.school.periods.map((p: { id: string }) => p.id),
      s.periods.map((p: { id: string }) => p.id),
    );
    assert.equal(res.body.school.periods[2].name, 'Period 3 (after recess)');
    const stored = await t.database.db.select().from(terms).where(eq(terms.schoolId, s.id));
    assert.equal(stored.length, 3, 'a term left out is deleted');
  });

  it('lessons booked in a period follow its new times in the same save (date kept, version + 1)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const db = t.database.db;
    const schoolId = await schoolIdOf(ADMIN);
    const s = (await admin.get('/api/school')).body.school;
    const period = s.periods[0] as { id: string; startsAt: string; endsAt: string };
    const [some] = await db.select().from(lessons).where(eq(lessons.schoolId, schoolId)).limit(1);
    const id = await insertTestLesson(db, await userByEmail(db, ADMIN), {
      classId: some!.classId,
      kitTypeId: some!.kitTypeId,
      yearLevel: 4,
      startsAt: `2026-08-04T${period.startsAt}:00`,
      endsAt: `2026-08-04T${period.endsAt}:00`,
    });
    await db.update(lessons).set({ periodId: period.id }).where(eq(lessons.id, id));
    const [booked] = await db.select().from(lessons).where(eq(lessons.id, id));
    const periods = s.periods.map((p: { id: string; startsAt: string; endsAt: string }) =>
      p.id === period.id ? { ...p, startsAt: '08:35', endsAt: '09:25' } : p,
    );
    const res = await put(admin, { ...form(s.version), periods, terms: s.terms });
    assert.equal(res.status, 200, res.text);
    const [moved] = await db.select().from(lessons).where(eq(lessons.id, booked!.id));
    const day = booked!.startsAt.slice(0, 10);
    assert.equal(moved!.startsAt.replace(' ', 'T').slice(0, 16), `${day}T08:35`);
    assert.equal(moved!.endsAt.replace(' ', 'T').slice(0, 16), `${day}T09:25`);
    assert.equal(moved!.version, booked!.version + 1, 'an editor opened before gets a 409');
    // Lessons not booked in the period keep their times.
    const others = await db
      .select()
      .from(lessons)
      .where(and(eq(lessons.schoolId, schoolId), ne(lessons.id, id)));
    for (const o of others) assert.notEqual(o.startsAt.replace(' ', 'T').slice(11, 16), '08:35');
  });

  it('refuses bad input with every issue listed (400) and changes nothing', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const s = (await admin.get('/api/school')).body.school;
    const res = await put(admin, {
      version: s.version,
      name: ' ',
      timezone: '+09:30',
      paperSize: 'A5',
      prep: { sparesPercent: 51, setOutMinutes: 2.5, pullBaseMinutes: -1 },
      terms: [
        { name: 'Term 1', startsOn: '2026-01-28', endsOn: '2026-04-10' },
        { name: 'Term 2', startsOn: '2026-04-10', endsOn: '2026-07-03' },
        { name: 'Term 3', startsOn: '2026-09-30', endsOn: '2026-07-20' },
        { name: 'Term 4', startsOn: '2026-02-30', endsOn: '2026-12-11' },
      ],
      periods: [
        { name: 'Period 1', startsAt: '09:00', endsAt: '09:50' },
        { name: 'Period 2', startsAt: '09:50', endsAt: '10:40' },
        { name: 'Overlapping', startsAt: '10:30', endsAt: '11:00' },
        { name: 'Backwards', startsAt: '14:00', endsAt: '13:00' },
        { name: '', startsAt: '9:00', endsAt: '24:00' },
      ],
      nonTeachingDays: [{ date: '2026-08-14' }, { date: '2026-08-14', reason: 'again' }],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(
      res.body.error.details.map((d: { path: string }) => d.path).sort(),
      [
        'name',
        'nonTeachingDays.1.date',
        'paperSize',
        'periods.2',
        'periods.3.endsAt',
        'periods.4.endsAt',
        'periods.4.name',
        'periods.4.startsAt',
        'prep.pullBaseMinutes',
        'prep.setOutMinutes',
        'prep.sparesPercent',
        // Term 1 ends on the day Term 2 starts: terms may not share a day.
        'terms.1',
        'terms.2.endsOn',
        'terms.3.startsOn',
        'timezone',
      ].sort(),
    );
    const after = (await admin.get('/api/school')).body.school;
    assert.deepEqual(after, s);
  });

  it('a stale version is refused with 409 and the current settings', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const s = (await admin.get('/api/school')).body.school;
    assert.equal(
      (await put(admin, form(s.version, { name: 'Kestrel Ridge Primary School' }))).status,
      200,
    );
    const stale = await put(admin, form(s.version, { name: 'Overwritten' }));
    // RFC 9110 §15.5.10: 409 Conflict, the request conflicts with the current state of the resource.
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.version, s.version + 1);
    assert.equal(stale.body.error.current.name, 'Kestrel Ridge Primary School');
    const [row] = await t.database.db.select().from(schools).where(eq(schools.id, s.id));
    assert.equal(row!.name, 'Kestrel Ridge Primary School');
  });

  it('a removed period unlinks nothing else: the other periods keep their rows', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const s = (await admin.get('/api/school')).body.school;
    const res = await put(admin, { ...form(s.version), periods: s.periods.slice(0, 2) });
    assert.equal(res.status, 200);
    const rows = await t.database.db
      .select()
      .from(bellPeriods)
      .where(eq(bellPeriods.schoolId, s.id));
    assert.deepEqual(
      rows.map((r) => r.id).sort(),
      s.periods
        .slice(0, 2)
        .map((p: { id: string }) => p.id)
        .sort(),
    );
  });
});

describe('time zones (IANA tz database)', () => {
  it('lists the zones for the select, sorted, every one accepted by the settings', async () => {
    const res = await (
      await signedIn(t.app, 'relief@kestrel-ridge.example')
    ).get('/api/school/timezones');
    assert.equal(res.status, 200);
    const zones: string[] = res.body.timezones;
    // IANA tz database, file "australasia": Zone Australia/Adelaide; "backward"/"etcetera": UTC.
    for (const z of [
      'Australia/Adelaide',
      'Australia/Perth',
      'Pacific/Chatham',
      'America/New_York',
      'UTC',
    ]) {
      assert.ok(zones.includes(z), z);
    }
    assert.deepEqual([...zones].sort(), zones);
    assert.ok(zones.every(isIanaTimeZone));
  });

  it('accepts zone names of the IANA database and refuses offsets and made-up names', () => {
    // IANA tz database, file "asia": Zone Asia/Kolkata (its older name Asia/Calcutta is a link).
    assert.equal(isIanaTimeZone('Asia/Kolkata'), true);
    assert.equal(isIanaTimeZone('Asia/Calcutta'), true);
    assert.equal(isIanaTimeZone('America/Argentina/Buenos_Aires'), true);
    // Not zone names: an offset, a lower-case spelling, and an area the database does not have.
    assert.equal(isIanaTimeZone('+09:30'), false);
    assert.equal(isIanaTimeZone('australia/adelaide'), false);
    assert.equal(isIanaTimeZone('Mars/Olympus_Mons'), false);
  });
});

describe('GET /api/school/teachers', () => {
  it('lists the active teachers of the school to admins, leads and teachers, never another school’s', async () => {
    const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const res = await teacher.get('/api/school/teachers');
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(res.body.teachers.map((x: { email: string }) => x.email).sort(), [
      'partner@kestrel-ridge.example',
      'teacher@kestrel-ridge.example',
    ]);
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    assert.equal((await relief.get('/api/school/teachers')).status, 403);
    assert.equal((await new Browser(t.app).get('/api/school/teachers')).status, 401);
    const other = await signedIn(t.app, 'admin@banksia-flat.example');
    assert.deepEqual((await other.get('/api/school/teachers')).body.teachers, []);
  });
});
