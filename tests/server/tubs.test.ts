import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  OTHER_ADMIN,
  RELIEF,
  TEACHER,
  insertClass,
  insertTestLesson,
  userByEmail,
} from '../support/planning.js';
import { tubAudits, tubMissing, tubs } from '../../server/db/schema/index.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000';

const PARTS = [
  { code: 'GT-1', name: 'Controller', category: 'controller', qty: 1, chargeMinutes: 180 },
  { code: 'GT-2', name: 'Gear, 24 teeth', category: 'gear', qty: 6, small: true },
  { code: 'GT-3', name: 'Peg', category: 'connector', qty: 40, small: true },
];

async function newKit(b: Browser, name: string): Promise<string> {
  const made = await b.post('/api/kit-types', { name });
  const id = made.body.kitType.id;
  const res = await b.send('put', `/api/kit-types/${id}/parts`, {
    version: made.body.kitType.version,
    parts: PARTS,
  });
  assert.equal(res.status, 200, res.text);
  return id;
}

async function newTub(
  b: Browser,
  kitTypeId: string,
  label: string,
  extra: Record<string, unknown> = {},
) {
  const res = await b.post('/api/tubs', { kitTypeId, label, ...extra });
  assert.equal(res.status, 201, res.text);
  return res.body.tub;
}

/** A lesson booking the tub, written straight to the database; returns the lesson id. */
async function lessonBooking(kitTypeId: string, tubId: string, email = TEACHER): Promise<string> {
  const db = t.database.db;
  const teacher = await userByEmail(db, email);
  const classId = await insertClass(db, teacher.schoolId, {
    name: `C-${tubId.slice(0, 8)}`,
    yearLevel: 5,
    studentCount: 24,
  });
  return insertTestLesson(
    db,
    teacher,
    {
      classId,
      kitTypeId,
      yearLevel: 5,
      startsAt: '2026-08-04T11:10:00',
      endsAt: '2026-08-04T12:00:00',
    },
    [tubId],
  );
}

describe('tubs: who may do what', () => {
  it('anonymous gets 401 on every route', async () => {
    const b = new Browser(t.app);
    for (const res of [
      await b.get('/api/tubs'),
      await b.post('/api/tubs', { kitTypeId: NO_SUCH_ID, label: 'Tub 1' }),
      await b.get(`/api/tubs/${NO_SUCH_ID}`),
      await b.patch(`/api/tubs/${NO_SUCH_ID}`, { version: 1, status: 'ready' }),
      await b.delete(`/api/tubs/${NO_SUCH_ID}`),
      await b.get(`/api/tubs/${NO_SUCH_ID}/audits`),
      await b.post(`/api/tubs/${NO_SUCH_ID}/audits`, { missing: [], found: [] }),
    ]) {
      assert.equal(res.status, 401);
    }
  });

  it('relief and leads read tubs; they may not change them (403); a lead may not record an audit (403)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Role Tub Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    for (const who of [RELIEF, 'lead@kestrel-ridge.example']) {
      const b = await signedIn(t.app, who);
      assert.equal((await b.get(`/api/tubs/${tub.id}`)).status, 200);
      assert.equal((await b.get(`/api/tubs?kitTypeId=${kit}`)).status, 200);
      assert.equal((await b.get(`/api/tubs/${tub.id}/audits`)).status, 200);
      assert.equal((await b.post('/api/tubs', { kitTypeId: kit, label: 'Tub 9' })).status, 403);
      assert.equal(
        (await b.patch(`/api/tubs/${tub.id}`, { version: tub.version, status: 'retired' })).status,
        403,
      );
      assert.equal((await b.delete(`/api/tubs/${tub.id}`)).status, 403);
    }
    const lead = await signedIn(t.app, 'lead@kestrel-ridge.example');
    assert.equal(
      (await lead.post(`/api/tubs/${tub.id}/audits`, { missing: [{ partCode: 'GT-3', count: 1 }] }))
        .status,
      403,
    );
    const now = (await admin.get(`/api/tubs/${tub.id}`)).body.tub;
    assert.deepEqual(now, tub);
    assert.equal((await admin.get(`/api/tubs?kitTypeId=${kit}`)).body.tubs.length, 1);
  });

  it("another school's tubs and kit types are not found (404) and not listed", async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Isolated Tub Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    const other = await signedIn(t.app, OTHER_ADMIN);
    for (const res of [
      await other.get(`/api/tubs/${tub.id}`),
      await other.patch(`/api/tubs/${tub.id}`, { version: tub.version, label: 'Mine' }),
      await other.delete(`/api/tubs/${tub.id}`),
      await other.get(`/api/tubs/${tub.id}/audits`),
      await other.post(`/api/tubs/${tub.id}/audits`, { missing: [{ partCode: 'GT-3', count: 2 }] }),
      await other.get(`/api/tubs?kitTypeId=${kit}`),
      await other.post('/api/tubs', { kitTypeId: kit, label: 'Tub 2' }),
    ]) {
      assert.equal(res.status, 404);
    }
    assert.ok(
      !(await other.get('/api/tubs')).body.tubs.some((x: { id: string }) => x.id === tub.id),
    );
    assert.deepEqual((await admin.get(`/api/tubs/${tub.id}`)).body.tub, tub);
  });
});

describe('tubs: create, read, change, delete', () => {
  it('creates a tub (201, ready unless told), with full stock per part', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const kit = await newKit(teacher, 'Gate Kit');
    const tub = await newTub(teacher, kit, ' Tub 1 ', { controllerLabel: 'CTRL-01' });
    assert.deepEqual(
      [
        tub.label,
        tub.controllerLabel,
        tub.status,
        tub.needsSorting,
        tub.kitTypeName,
        tub.missingPieces,
      ],
      ['Tub 1', 'CTRL-01', 'ready', false, 'Gate Kit', 0],
    );
    assert.deepEqual(tub.stock, { 'GT-1': 1, 'GT-2': 6, 'GT-3': 40 });
    const sorting = await newTub(teacher, kit, 'Tub 2', { status: 'needs-sorting' });
    assert.equal(sorting.needsSorting, true);
    const list = (await teacher.get(`/api/tubs?kitTypeId=${kit}`)).body.tubs;
    assert.deepEqual(
      list.map((x: { label: string; needsSorting: boolean }) => [x.label, x.needsSorting]),
      [
        ['Tub 1', false],
        ['Tub 2', true],
      ],
    );
    assert.equal(list[0].stock, undefined, 'the list carries the missing summary, not the stock');
  });

  it('lists tubs in label order with numbers read as numbers (Tub 2 before Tub 10)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Order Kit');
    for (const label of ['Tub 10', 'Tub 2', 'Spare tub', 'Tub 1']) await newTub(admin, kit, label);
    const list = (await admin.get(`/api/tubs?kitTypeId=${kit}`)).body.tubs;
    assert.deepEqual(
      list.map((x: { label: string }) => x.label),
      ['Spare tub', 'Tub 1', 'Tub 2', 'Tub 10'],
    );
  });

  it('refuses bad input (400, every issue, nothing stored), an unknown kit type (404) and a taken label (409)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Bad Tub Kit');
    const before = (await t.database.db.select().from(tubs)).length;
    const bad = await admin.post('/api/tubs', {
      kitTypeId: 'nope',
      label: '',
      status: 'lost',
      controllerLabel: 'x'.repeat(61),
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'controllerLabel',
      'kitTypeId',
      'label',
      'status',
    ]);
    assert.equal(
      (await admin.post('/api/tubs', { kitTypeId: NO_SUCH_ID, label: 'Tub 1' })).status,
      404,
    );
    await newTub(admin, kit, 'Tub 1');
    const taken = await admin.post('/api/tubs', { kitTypeId: kit, label: 'TUB 1' });
    assert.equal(taken.status, 409);
    assert.equal((await t.database.db.select().from(tubs)).length, before + 1);
    assert.equal((await admin.get('/api/tubs?kitTypeId=nope')).status, 400);
  });

  it('PATCH changes label, controller and status with the version; a stale version is 409 with the current tub', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Patch Tub Kit');
    const tub = await newTub(admin, kit, 'Tub 1', { status: 'needs-sorting' });
    const ok = await admin.patch(`/api/tubs/${tub.id}`, {
      version: tub.version,
      status: 'ready',
      controllerLabel: 'CTRL-07',
    });
    assert.equal(ok.status, 200);
    assert.deepEqual(
      [
        ok.body.tub.status,
        ok.body.tub.needsSorting,
        ok.body.tub.controllerLabel,
        ok.body.tub.version,
      ],
      ['ready', false, 'CTRL-07', tub.version + 1],
    );
    const stale = await admin.patch(`/api/tubs/${tub.id}`, {
      version: tub.version,
      label: 'Tub X',
    });
    // RFC 9110 §15.5.10 409 Conflict.
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.version, tub.version + 1);
    assert.equal(stale.body.error.current.controllerLabel, 'CTRL-07');
    const bad = await admin.patch(`/api/tubs/${tub.id}`, {
      version: tub.version + 1,
      status: 'gone',
      label: '',
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'label',
      'status',
    ]);
    assert.equal((await admin.get(`/api/tubs/${tub.id}`)).body.tub.label, 'Tub 1');
  });

  it('deleting a tub that a lesson books is refused (409, clear message); an unbooked one goes (204)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Delete Tub Kit');
    const booked = await newTub(admin, kit, 'Tub 1');
    await lessonBooking(kit, booked.id);
    const refused = await admin.delete(`/api/tubs/${booked.id}`);
    assert.equal(refused.status, 409);
    assert.match(refused.body.error.message, /Tub 1 is booked by 1 lesson/);
    assert.equal((await admin.get(`/api/tubs/${booked.id}`)).body.tub.lessonCount, 1);
    const free = await newTub(admin, kit, 'Tub 2');
    assert.equal((await admin.delete(`/api/tubs/${free.id}`)).status, 204);
    assert.equal((await admin.get(`/api/tubs/${free.id}`)).status, 404);
  });
});

describe('pack-away audits', () => {
  it('a relief teacher records an audit (201): missing counts go up, stock goes down', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Audit Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    const lessonId = await lessonBooking(kit, tub.id);
    const relief = await signedIn(t.app, RELIEF);
    const res = await relief.post(`/api/tubs/${tub.id}/audits`, {
      lessonId,
      missing: [
        { partCode: 'GT-3', count: 3 },
        { partCode: 'GT-2', count: 1 },
      ],
      note: 'Counted back at the end of period 3.',
    });
    assert.equal(res.status, 201);
    assert.equal(res.body.audit.userName, 'Robin Tally');
    assert.equal(res.body.audit.lessonId, lessonId);
    assert.deepEqual(res.body.tub.missing, [
      { partCode: 'GT-2', partName: 'Gear, 24 teeth', count: 1 },
      { partCode: 'GT-3', partName: 'Peg', count: 3 },
    ]);
    assert.deepEqual(res.body.tub.stock, { 'GT-1': 1, 'GT-2': 5, 'GT-3': 37 });
    assert.deepEqual([res.body.tub.missingLines, res.body.tub.missingPieces], [2, 4]);
  });

  it('found parts bring counts down, never below 0; missing never above the kit quantity', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const kit = await newKit(teacher, 'Clamp Kit');
    const tub = await newTub(teacher, kit, 'Tub 1');
    const audit = (body: unknown) => teacher.post(`/api/tubs/${tub.id}/audits`, body);
    await audit({ missing: [{ partCode: 'GT-3', count: 5 }] });
    const found = await audit({
      found: [
        { partCode: 'GT-3', count: 8 },
        { partCode: 'GT-1', count: 1 },
      ],
    });
    assert.equal(found.status, 201);
    assert.deepEqual(found.body.tub.missing, [], 'found more than was missing: 0, not −3');
    assert.equal(found.body.tub.stock['GT-3'], 40);
    const over = await audit({ missing: [{ partCode: 'GT-2', count: 50 }] });
    assert.deepEqual(over.body.tub.missing, [
      { partCode: 'GT-2', partName: 'Gear, 24 teeth', count: 6 },
    ]);
    assert.equal(over.body.tub.stock['GT-2'], 0);
    const both = await audit({
      missing: [{ partCode: 'GT-3', count: 4 }],
      found: [{ partCode: 'GT-3', count: 1 }],
    });
    assert.equal(both.body.tub.stock['GT-3'], 37, 'net +3 missing');
    const rows = await t.database.db.select().from(tubMissing).where(eq(tubMissing.tubId, tub.id));
    assert.ok(rows.every((r) => r.count > 0));
  });

  it('refuses unknown part codes, repeated codes, bad counts and another school’s lesson (400), changing nothing', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Bad Audit Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    const otherKit = await newKit(await signedIn(t.app, OTHER_ADMIN), 'Other school kit');
    const otherTub = await newTub(await signedIn(t.app, OTHER_ADMIN), otherKit, 'Tub 1');
    const otherLesson = await lessonBooking(otherKit, otherTub.id, OTHER_ADMIN);
    const shape = await admin.post(`/api/tubs/${tub.id}/audits`, {
      missing: [
        { partCode: 'GT-3', count: 0 },
        { partCode: 'GT-3', count: 2 },
      ],
      found: [{ partCode: '', count: 1.5 }],
      note: 5,
    });
    assert.equal(shape.status, 400);
    assert.deepEqual(shape.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'found.0.count',
      'found.0.partCode',
      'missing.0.count',
      'missing.1.partCode',
      'note',
    ]);
    const unknown = await admin.post(`/api/tubs/${tub.id}/audits`, {
      lessonId: otherLesson,
      missing: [
        { partCode: 'GT-3', count: 2 },
        { partCode: 'ZZ-9', count: 1 },
      ],
      found: [{ partCode: 'QQ-1', count: 1 }],
    });
    assert.equal(unknown.status, 400);
    assert.deepEqual(
      unknown.body.error.details.map((d: { path: string }) => d.path),
      ['missing.1.partCode', 'found.0.partCode', 'lessonId'],
    );
    assert.deepEqual((await admin.get(`/api/tubs/${tub.id}`)).body.tub.missing, []);
    assert.equal(
      (await t.database.db.select().from(tubAudits).where(eq(tubAudits.tubId, tub.id))).length,
      0,
    );
  });

  it('keeps the history, newest first', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'History Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    for (const count of [1, 2, 3]) {
      assert.equal(
        (
          await admin.post(`/api/tubs/${tub.id}/audits`, {
            missing: [{ partCode: 'GT-3', count }],
            note: `Audit ${count}`,
          })
        ).status,
        201,
      );
    }
    const res = await (await signedIn(t.app, RELIEF)).get(`/api/tubs/${tub.id}/audits`);
    assert.equal(res.status, 200);
    assert.deepEqual(
      res.body.audits.map((a: { note: string }) => a.note),
      ['Audit 3', 'Audit 2', 'Audit 1'],
    );
    assert.deepEqual(res.body.audits[0].missing, [{ partCode: 'GT-3', count: 3 }]);
    assert.equal(res.body.audits[0].userName, 'Avery Quill');
    assert.ok(!Number.isNaN(Date.parse(res.body.audits[0].createdAt)));
    const [tubNow] = (await admin.get(`/api/tubs?kitTypeId=${kit}`)).body.tubs;
    assert.deepEqual([tubNow.missingLines, tubNow.missingPieces], [1, 6]);
  });

  it('a re-imported parts list drops missing counts of codes no longer listed and caps the rest', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Reimport Kit');
    const tub = await newTub(admin, kit, 'Tub 1');
    await admin.post(`/api/tubs/${tub.id}/audits`, {
      missing: [
        { partCode: 'GT-2', count: 2 },
        { partCode: 'GT-3', count: 30 },
      ],
    });
    await admin.ensureCsrf();
    const res = await admin.agent
      .post(`/api/kit-types/${kit}/parts/import`)
      .set('X-XSRF-TOKEN', admin.csrf)
      .attach('file', Buffer.from('code,name,qty\nGT-1,Controller,1\nGT-3,Peg,20\n'), {
        filename: 'parts.csv',
        contentType: 'text/csv',
      });
    assert.equal(res.status, 200);
    const now = (await admin.get(`/api/tubs/${tub.id}`)).body.tub;
    assert.deepEqual(now.missing, [{ partCode: 'GT-3', partName: 'Peg', count: 20 }]);
    assert.deepEqual(now.stock, { 'GT-1': 1, 'GT-3': 0 });
  });
});
