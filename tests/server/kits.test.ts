import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { crc32 } from 'node:zlib';
import { eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  LEAD,
  OTHER_ADMIN,
  RELIEF,
  TEACHER,
  insertClass,
  insertTestLesson,
  userByEmail,
} from '../support/planning.js';
import {
  activities,
  kitTypes,
  lessons,
  materials,
  partPhotos,
  parts,
  tubMissing,
  tubs,
} from '../../server/db/schema/index.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

/**
 * A valid 1×1 RGBA PNG. ISO/IEC 15948 (PNG) §5.2: the signature 89 50 4E 47 0D 0A 1A 0A; §5.3:
 * each chunk is length, type, data and a CRC-32 of type and data (checked below).
 */
const PNG_1X1 = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);
/** ELF header (System V ABI: 0x7F 'E' 'L' 'F', 64-bit, little-endian) followed by zeros. */
const ELF = Buffer.concat([
  Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00]),
  Buffer.alloc(120),
]);
/** A Windows executable starts with the DOS header magic "MZ" (Microsoft PE format). */
const PE = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(126)]);
/** ISO 32000-1 §7.5.2: a PDF file begins with the header "%PDF-1.n". */
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n',
  'latin1',
);

const PARTS = [
  {
    code: 'TK-010',
    name: 'Hub controller',
    category: 'controller',
    qty: 1,
    small: false,
    chargeMinutes: 180,
  },
  { code: 'TK-020', name: 'Drive motor', category: 'motor', qty: 2 },
  {
    code: 'TK-030',
    name: 'Peg, short',
    colour: 'grey',
    category: 'connector',
    qty: 40,
    compartment: 'A1',
    small: true,
  },
];

async function newKit(b: Browser, name: string, list: unknown[] = PARTS) {
  const made = await b.post('/api/kit-types', { name, description: 'For the tests' });
  assert.equal(made.status, 201, made.text);
  const id = made.body.kitType.id as string;
  const res = await b.send('put', `/api/kit-types/${id}/parts`, {
    version: made.body.kitType.version,
    parts: list,
  });
  assert.equal(res.status, 200, res.text);
  return res.body.kitType;
}

async function upload(
  b: Browser,
  url: string,
  bytes: Buffer,
  filename: string,
  contentType: string,
) {
  await b.ensureCsrf();
  return b.agent
    .put(url)
    .set('X-XSRF-TOKEN', b.csrf)
    .attach('file', bytes, { filename, contentType });
}

/** A lesson using the kit type (and booking the tubs), written straight to the database. */
async function lessonUsing(kitTypeId: string, tubIds: string[] = []): Promise<void> {
  const db = t.database.db;
  const teacher = await userByEmail(db, TEACHER);
  const classId = await insertClass(db, teacher.schoolId, {
    name: `C-${kitTypeId.slice(0, 6)}`,
    yearLevel: 4,
    studentCount: 20,
  });
  await insertTestLesson(
    db,
    teacher,
    {
      classId,
      kitTypeId,
      yearLevel: 4,
      startsAt: '2026-07-28T11:10:00',
      endsAt: '2026-07-28T12:00:00',
    },
    tubIds,
  );
}

describe('kit types: who may do what', () => {
  it('anonymous gets 401 on every route', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Anonymous check kit');
    const b = new Browser(t.app);
    const u = `/api/kit-types/${kit.id}`;
    for (const res of [
      await b.get('/api/kit-types'),
      await b.post('/api/kit-types', { name: 'X' }),
      await b.get(u),
      await b.patch(u, { version: 1, name: 'Y' }),
      await b.delete(u),
      await b.send('put', `${u}/parts`, { version: 1, parts: [] }),
      await b.patch(`${u}/parts/${kit.parts[0].id}`, { version: 1, qty: 3 }),
      await b.get(`${u}/parts.csv`),
      await b.get(`${u}/parts/TK-010/photo`),
      await upload(b, `${u}/parts/TK-010/photo`, PNG_1X1, 'p.png', 'image/png'),
      await b.delete(`${u}/parts/TK-010/photo`),
    ]) {
      assert.equal(res.status, 401);
    }
  });

  it('everyone of the school reads kit types; a lead or relief teacher may not change them (403)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Role check kit');
    const u = `/api/kit-types/${kit.id}`;
    for (const who of ['lead', 'relief']) {
      const b = await signedIn(t.app, `${who}@kestrel-ridge.example`);
      assert.equal((await b.get('/api/kit-types')).status, 200);
      assert.equal((await b.get(u)).status, 200);
      assert.equal((await b.get(`${u}/parts.csv`)).status, 200);
      assert.equal((await b.post('/api/kit-types', { name: `By ${who}` })).status, 403);
      assert.equal((await b.patch(u, { version: kit.version, name: 'Renamed' })).status, 403);
      assert.equal((await b.delete(u)).status, 403);
      assert.equal(
        (await b.send('put', `${u}/parts`, { version: kit.version, parts: [] })).status,
        403,
      );
      assert.equal(
        (await b.patch(`${u}/parts/${kit.parts[0].id}`, { version: kit.version, qty: 9 })).status,
        403,
      );
      assert.equal(
        (await upload(b, `${u}/parts/TK-010/photo`, PNG_1X1, 'p.png', 'image/png')).status,
        403,
      );
      assert.equal((await b.delete(`${u}/parts/TK-010/photo`)).status, 403);
    }
    assert.deepEqual((await admin.get(u)).body.kitType, kit);
  });

  it("another school's kit type is not found on any route (404), nor listed", async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Isolation kit');
    const other = await signedIn(t.app, OTHER_ADMIN);
    const u = `/api/kit-types/${kit.id}`;
    for (const res of [
      await other.get(u),
      await other.patch(u, { version: kit.version, name: 'Mine now' }),
      await other.delete(u),
      await other.send('put', `${u}/parts`, { version: kit.version, parts: [] }),
      await other.patch(`${u}/parts/${kit.parts[0].id}`, { version: kit.version, qty: 9 }),
      await other.get(`${u}/parts.csv`),
      await other.get(`${u}/parts/TK-010/photo`),
      await upload(other, `${u}/parts/TK-010/photo`, PNG_1X1, 'p.png', 'image/png'),
    ]) {
      assert.equal(res.status, 404);
    }
    assert.ok(
      !(await other.get('/api/kit-types')).body.kitTypes.some(
        (k: { id: string }) => k.id === kit.id,
      ),
    );
    assert.deepEqual((await admin.get(u)).body.kitType, kit);
  });
});

describe('kit types: create, read, rename, delete', () => {
  it('creates (201), lists with counts, and reads the parts in order', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const kit = await newKit(teacher, 'Track Kit');
    assert.deepEqual(
      kit.parts.map((p: { code: string }) => p.code),
      ['TK-010', 'TK-020', 'TK-030'],
    );
    assert.deepEqual(
      { ...kit.parts[2], id: undefined },
      {
        id: undefined,
        code: 'TK-030',
        name: 'Peg, short',
        colour: 'grey',
        category: 'connector',
        qty: 40,
        compartment: 'A1',
        small: true,
        chargeMinutes: null,
        hasPhoto: false,
      },
    );
    assert.equal(kit.parts[0].chargeMinutes, 180);
    assert.equal(kit.parts[1].category, 'motor');
    assert.equal(kit.parts[1].colour, null);
    const list = (await teacher.get('/api/kit-types')).body.kitTypes;
    const row = list.find((k: { id: string }) => k.id === kit.id);
    assert.deepEqual([row.partCount, row.pieceCount, row.tubCount, row.lessonCount], [3, 43, 0, 0]);
  });

  it('refuses bad input (400, every issue, nothing stored) and a taken name (409)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const before = (await t.database.db.select().from(kitTypes)).length;
    const bad = await admin.post('/api/kit-types', { name: '  ', description: 'x'.repeat(2001) });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'description',
      'name',
    ]);
    await newKit(admin, 'Dup Kit');
    assert.equal((await admin.post('/api/kit-types', { name: 'dup kit' })).status, 409);
    assert.equal((await t.database.db.select().from(kitTypes)).length, before + 1);
  });

  it('renames with the version read; a stale version is 409 with the current kit type', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Rename Kit');
    const ok = await admin.patch(`/api/kit-types/${kit.id}`, {
      version: kit.version,
      name: 'Renamed Kit',
    });
    assert.equal(ok.status, 200);
    assert.equal(ok.body.kitType.version, kit.version + 1);
    const stale = await admin.patch(`/api/kit-types/${kit.id}`, {
      version: kit.version,
      description: 'lost',
    });
    // RFC 9110 §15.5.10 409 Conflict.
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.name, 'Renamed Kit');
    assert.equal(stale.body.error.current.version, kit.version + 1);
    assert.equal(stale.body.error.current.parts.length, 3);
    const bad = await admin.patch(`/api/kit-types/${kit.id}`, { version: 'one', name: '' });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'name',
      'version',
    ]);
    const now = (await admin.get(`/api/kit-types/${kit.id}`)).body.kitType;
    assert.deepEqual(
      [now.name, now.version],
      ['Renamed Kit', kit.version + 1],
      'unchanged by the 400',
    );
  });

  it('deleting a kit type that a lesson uses is refused (409); an unused one goes with its tubs (204)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const used = await newKit(admin, 'Used Kit');
    await lessonUsing(used.id);
    const refused = await admin.delete(`/api/kit-types/${used.id}`);
    assert.equal(refused.status, 409);
    assert.match(refused.body.error.message, /Used Kit is used by 1 lesson/);
    assert.equal((await admin.get(`/api/kit-types/${used.id}`)).status, 200);

    const unused = await newKit(admin, 'Unused Kit');
    const tub = await admin.post('/api/tubs', { kitTypeId: unused.id, label: 'Tub 1' });
    assert.equal(tub.status, 201);
    assert.equal((await admin.delete(`/api/kit-types/${unused.id}`)).status, 204);
    assert.equal((await admin.get(`/api/kit-types/${unused.id}`)).status, 404);
    assert.equal(
      (await t.database.db.select().from(tubs).where(eq(tubs.id, tub.body.tub.id))).length,
      0,
    );
    assert.equal(
      (await t.database.db.select().from(parts).where(eq(parts.kitTypeId, unused.id))).length,
      0,
    );
  });
});

describe('parts list editing', () => {
  it('PUT replaces the whole list in order and keeps the ids of codes still listed', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Replace Kit');
    const res = await admin.send('put', `/api/kit-types/${kit.id}/parts`, {
      version: kit.version,
      parts: [{ code: 'TK-040', name: 'Wheel', category: 'wheel', qty: 4 }, PARTS[0]],
    });
    assert.equal(res.status, 200);
    const next = res.body.kitType;
    assert.deepEqual(
      next.parts.map((p: { code: string }) => p.code),
      ['TK-040', 'TK-010'],
    );
    assert.equal(next.parts[1].id, kit.parts[0].id);
    assert.equal(next.version, kit.version + 1);
  });

  it('PUT refuses bad lines with every issue (400) and leaves the list as it was', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Bad Lines Kit');
    const res = await admin.send('put', `/api/kit-types/${kit.id}/parts`, {
      version: kit.version,
      parts: [
        { code: 'A', name: 'One', qty: 1 },
        { code: 'A', name: 'Two', qty: -1 },
        { code: 'B', name: '', qty: 2.5, category: 'gadget', chargeMinutes: 0 },
      ],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(res.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'parts.1.code',
      'parts.1.qty',
      'parts.2.category',
      'parts.2.chargeMinutes',
      'parts.2.name',
      'parts.2.qty',
    ]);
    assert.deepEqual((await admin.get(`/api/kit-types/${kit.id}`)).body.kitType, kit);
    const stale = await admin.send('put', `/api/kit-types/${kit.id}/parts`, {
      version: kit.version - 1,
      parts: [],
    });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.parts.length, 3);
  });

  it('PATCH edits one part; a new code carries the photo and the tubs’ missing counts along', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Inline Kit');
    const peg = kit.parts[2];
    assert.equal(
      (
        await upload(
          admin,
          `/api/kit-types/${kit.id}/parts/TK-030/photo`,
          PNG_1X1,
          'peg.png',
          'image/png',
        )
      ).status,
      201,
    );
    const tub = (await admin.post('/api/tubs', { kitTypeId: kit.id, label: 'Tub A' })).body.tub;
    await admin.post(`/api/tubs/${tub.id}/audits`, {
      missing: [{ partCode: 'TK-030', count: 30 }],
    });
    const version = (await admin.get(`/api/kit-types/${kit.id}`)).body.kitType.version;
    const res = await admin.patch(`/api/kit-types/${kit.id}/parts/${peg.id}`, {
      version,
      code: 'TK-031',
      qty: 12,
    });
    assert.equal(res.status, 200);
    const part = res.body.kitType.parts.find((p: { id: string }) => p.id === peg.id);
    assert.deepEqual(
      [part.code, part.qty, part.name, part.hasPhoto],
      ['TK-031', 12, 'Peg, short', true],
    );
    const tubNow = (await admin.get(`/api/tubs/${tub.id}`)).body.tub;
    assert.deepEqual(
      tubNow.missing,
      [{ partCode: 'TK-031', partName: 'Peg, short', count: 12 }],
      'capped at the new quantity',
    );
    assert.equal(tubNow.stock['TK-031'], 0);

    const bad = await admin.patch(`/api/kit-types/${kit.id}/parts/${peg.id}`, {
      version: version + 1,
      qty: -2,
      small: 'maybe',
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'qty',
      'small',
    ]);
    const taken = await admin.patch(`/api/kit-types/${kit.id}/parts/${peg.id}`, {
      version: version + 1,
      code: 'TK-010',
    });
    assert.equal(taken.status, 409);
    const stale = await admin.patch(`/api/kit-types/${kit.id}/parts/${peg.id}`, {
      version,
      qty: 5,
    });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.parts[2].qty, 12);
    const missingRows = await t.database.db
      .select()
      .from(tubMissing)
      .where(eq(tubMissing.tubId, tub.id));
    assert.deepEqual(
      missingRows.map((r) => [r.partCode, r.count]),
      [['TK-031', 12]],
    );
  });
});

describe('one part added or removed by hand', () => {
  it('POST adds a part at the end (201); a taken code, bad fields or a stale version change nothing', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Add Part Kit');
    const part = { code: 'TK-040', name: 'Spacer ring', category: 'structure', qty: 12 };
    const res = await admin.post(`/api/kit-types/${kit.id}/parts`, { version: kit.version, part });
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.kitType.version, kit.version + 1);
    assert.deepEqual(
      res.body.kitType.parts.map((p: { code: string }) => p.code),
      ['TK-010', 'TK-020', 'TK-030', 'TK-040'],
    );
    const added = res.body.kitType.parts[3];
    assert.deepEqual(
      [added.name, added.category, added.qty, added.small, added.chargeMinutes],
      ['Spacer ring', 'structure', 12, false, null],
    );
    const now = res.body.kitType.version;
    const taken = await admin.post(`/api/kit-types/${kit.id}/parts`, {
      version: now,
      part: { ...part, name: 'Another' },
    });
    assert.equal(taken.status, 409);
    assert.equal(taken.body.error.code, 'code-taken');
    const bad = await admin.post(`/api/kit-types/${kit.id}/parts`, {
      version: now,
      part: { code: '', name: 'x\u0000', qty: -1, category: 'gizmo' },
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'part.category',
      'part.code',
      'part.name',
      'part.qty',
    ]);
    const stale = await admin.post(`/api/kit-types/${kit.id}/parts`, {
      version: kit.version,
      part: { ...part, code: 'TK-050' },
    });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.code, 'stale-version');
    const stored = await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit.id));
    assert.equal(stored.length, 4, 'nothing else was added');
  });

  it('DELETE removes an unused part with its photo and missing counts; a part in a lesson is refused (409)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Remove Part Kit');
    const peg = kit.parts[2];
    await upload(
      admin,
      `/api/kit-types/${kit.id}/parts/TK-030/photo`,
      PNG_1X1,
      'peg.png',
      'image/png',
    );
    const tub = (await admin.post('/api/tubs', { kitTypeId: kit.id, label: 'Tub R' })).body.tub;
    await admin.post(`/api/tubs/${tub.id}/audits`, {
      missing: [{ partCode: 'TK-030', count: 3 }],
    });
    const version = (await admin.get(`/api/kit-types/${kit.id}`)).body.kitType.version;
    const stale = await admin.delete(
      `/api/kit-types/${kit.id}/parts/${peg.id}?version=${version - 1}`,
    );
    assert.equal(stale.status, 409);
    const res = await admin.delete(`/api/kit-types/${kit.id}/parts/${peg.id}?version=${version}`);
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(
      res.body.kitType.parts.map((p: { code: string }) => p.code),
      ['TK-010', 'TK-020'],
    );
    assert.deepEqual((await admin.get(`/api/tubs/${tub.id}`)).body.tub.missing, []);
    assert.equal(
      (await admin.get(`/api/kit-types/${kit.id}/parts/TK-030/photo`)).status,
      404,
      'the photo went with the part',
    );
    assert.equal(
      (await admin.delete(`/api/kit-types/${kit.id}/parts/${peg.id}`)).status,
      404,
      'gone',
    );

    // A part that an activity lists: the lesson's plan would break, so it stays.
    await lessonUsing(kit.id);
    const db = t.database.db;
    const [lesson] = await db.select().from(lessons).where(eq(lessons.kitTypeId, kit.id));
    const [activity] = await db
      .insert(activities)
      .values({ lessonId: lesson!.id, title: 'Build', kind: 'build', minutes: 20, position: 0 })
      .returning();
    await db.insert(materials).values({
      activityId: activity!.id,
      position: 0,
      partCode: 'TK-020',
      qty: 2,
      per: 'group',
      returnable: true,
    });
    const motor = kit.parts[1];
    const refused = await admin.delete(`/api/kit-types/${kit.id}/parts/${motor.id}`);
    assert.equal(refused.status, 409);
    assert.equal(refused.body.error.code, 'part-in-use');
    assert.match(
      refused.body.error.message,
      /TK-020 Drive motor is in the materials of “A test lesson”/,
    );
    assert.equal(
      (await db.select().from(parts).where(eq(parts.id, motor.id))).length,
      1,
      'still listed',
    );
  });

  it('a teacher of another school, a lead and a relief teacher cannot add or remove parts', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Guarded Part Kit');
    const part = { code: 'TK-060', name: 'Rod clip', qty: 4 };
    for (const [email, status] of [
      [LEAD, 403],
      [RELIEF, 403],
      [OTHER_ADMIN, 404],
    ] as const) {
      const b = await signedIn(t.app, email);
      assert.equal(
        (await b.post(`/api/kit-types/${kit.id}/parts`, { version: kit.version, part })).status,
        status,
        email,
      );
      assert.equal(
        (await b.delete(`/api/kit-types/${kit.id}/parts/${kit.parts[0].id}`)).status,
        status,
        email,
      );
    }
    assert.equal((await admin.get(`/api/kit-types/${kit.id}`)).body.kitType.parts.length, 3);
  });
});

describe('part photos', () => {
  it('the test PNG is well formed (ISO/IEC 15948 §5.2 signature, §5.3 chunk CRCs)', () => {
    assert.deepEqual([...PNG_1X1.subarray(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    const chunks: string[] = [];
    for (let at = 8; at < PNG_1X1.length;) {
      const length = PNG_1X1.readUInt32BE(at);
      const typeAndData = PNG_1X1.subarray(at + 4, at + 8 + length);
      assert.equal(PNG_1X1.readUInt32BE(at + 8 + length), crc32(typeAndData));
      chunks.push(typeAndData.subarray(0, 4).toString('latin1'));
      at += 12 + length;
    }
    assert.deepEqual(chunks, ['IHDR', 'IDAT', 'IEND']);
    assert.deepEqual(
      [PNG_1X1.readUInt32BE(16), PNG_1X1.readUInt32BE(20)],
      [1, 1],
      'IHDR width and height',
    );
  });

  it('stores a real PNG (201, then 200 on replace: RFC 9110 §9.3.4) and serves it with its type and nosniff', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const kit = await newKit(teacher, 'Photo Kit');
    const u = `/api/kit-types/${kit.id}/parts/TK-020/photo`;
    const first = await upload(teacher, u, PNG_1X1, 'motor.png', 'image/png');
    assert.equal(first.status, 201);
    assert.equal(first.body.part.hasPhoto, true);
    assert.equal((await upload(teacher, u, PNG_1X1, 'motor-2.png', 'image/png')).status, 200);
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    const got = await relief.agent.get(u).buffer(true);
    assert.equal(got.status, 200);
    assert.equal(got.headers['content-type'], 'image/png');
    assert.equal(got.headers['x-content-type-options'], 'nosniff');
    assert.deepEqual(Buffer.from(got.body), PNG_1X1);
    assert.equal(
      (await teacher.get(`/api/kit-types/${kit.id}`)).body.kitType.parts[1].hasPhoto,
      true,
    );
    assert.equal((await teacher.delete(u)).status, 204);
    assert.equal((await teacher.get(u)).status, 404);
    assert.equal((await teacher.delete(u)).status, 404);
  });

  it('refuses a renamed executable or a PDF sent as an image (415, RFC 9110 §15.5.16), whatever the name says', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Sniff Kit');
    const u = `/api/kit-types/${kit.id}/parts/TK-010/photo`;
    for (const [bytes, name] of [
      [ELF, 'photo.png'],
      [PE, 'photo.png'],
      [PDF, 'photo.jpg'],
      [Buffer.from('just text'), 'photo.webp'],
    ] as const) {
      const res = await upload(admin, u, bytes, name, 'image/png');
      assert.equal(res.status, 415, name);
      assert.equal(res.body.error.code, 'unsupported-type');
    }
    assert.equal(
      (await t.database.db.select().from(partPhotos).where(eq(partPhotos.kitTypeId, kit.id)))
        .length,
      0,
    );
  });

  it('refuses a photo over 5 MB (413, RFC 9110 §15.5.14), a missing file (400) and an unknown part (404)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Size Kit');
    const big = Buffer.concat([PNG_1X1, Buffer.alloc(5 * 1024 * 1024)]);
    const res = await upload(
      admin,
      `/api/kit-types/${kit.id}/parts/TK-010/photo`,
      big,
      'big.png',
      'image/png',
    );
    assert.equal(res.status, 413);
    await admin.ensureCsrf();
    const none = await admin.agent
      .put(`/api/kit-types/${kit.id}/parts/TK-010/photo`)
      .set('X-XSRF-TOKEN', admin.csrf)
      .field('note', 'x');
    assert.equal(none.status, 400);
    assert.equal(
      (
        await upload(
          admin,
          `/api/kit-types/${kit.id}/parts/NOPE/photo`,
          PNG_1X1,
          'p.png',
          'image/png',
        )
      ).status,
      404,
    );
    assert.equal(
      (await t.database.db.select().from(partPhotos).where(eq(partPhotos.kitTypeId, kit.id)))
        .length,
      0,
    );
  });
});
