/**
 * Activities and their attachments over HTTP against a real PostgreSQL: add with a bill of
 * materials, edit with versions (materials replaced whole), delete; upload, download and delete
 * attachments whose type is read from their bytes; and who may do each.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
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
import { activities, attachments, materials } from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let lessonId = '';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel } = await schoolIds(db);
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  ids = await userIds(db);
  const kitId = await insertKit(db, kestrel, {
    name: 'Trial Rover Tub',
    parts: [
      { code: 'TR-001', name: 'Controller', category: 'controller', qty: 1, chargeMinutes: 180 },
      { code: 'TR-010', name: 'Motor', category: 'motor', qty: 2 },
      { code: 'TR-020', name: 'Pin', category: 'connector', qty: 40, small: true },
    ],
  });
  await insertTubs(db, kestrel, kitId, ['Tub 1']);
  const classId = await insertClass(db, kestrel, {
    name: '4Q',
    yearLevel: 4,
    studentCount: 24,
    devices: 6,
  });
  // A unit shared with the school, so the partner is a reader (not an author) of its lesson.
  const owner = await as(TEACHER);
  const unit = await owner.post('/api/units', { title: 'Activity host', yearLevel: 4 });
  await owner.patch(`/api/units/${unit.body.id}`, { version: 1, visibility: 'school' });
  const lesson = await owner.post(`/api/units/${unit.body.id}/lessons`, {
    title: 'Motors',
    classId,
    kitTypeId: kitId,
    startsAt: '2026-07-28T11:10',
    endsAt: '2026-07-28T12:00',
    groupSize: 4,
  });
  assert.equal(lesson.status, 201, lesson.text);
  lessonId = lesson.body.id;
  assert.equal(
    (await owner.patch(`/api/lessons/${lessonId}`, { version: 1, reliefTeacherId: ids[RELIEF] }))
      .status,
    200,
  );
});
after(async () => {
  await t.close();
});

const build = {
  title: 'Build the drive base',
  kind: 'build',
  minutes: 25,
  materials: [
    { partCode: 'TR-001', qty: 1, per: 'group' },
    { partCode: 'TR-020', qty: 4, per: 'student', returnable: false },
    { consumable: 'Zip ties', qty: 2, per: 'group' },
  ],
};
async function newActivity(body: Record<string, unknown> = build) {
  const res = await (await as(TEACHER)).post(`/api/lessons/${lessonId}/activities`, body);
  assert.equal(res.status, 201, res.text);
  return res.body;
}
const activityCount = async () => (await t.database.db.select().from(activities)).length;
const paths = (res: { body: { error: { details: { path: string }[] } } }) =>
  res.body.error.details.map((d) => d.path).sort();

describe('POST /api/lessons/:id/activities', () => {
  it('appends the activity with its materials in order; returnable defaults by kind of line (201)', async () => {
    const first = await newActivity();
    assert.equal(first.version, 1);
    assert.equal(first.kind, 'build');
    assert.deepEqual(
      first.materials.map((m: Record<string, unknown>) => [
        m.partCode,
        m.partName,
        m.consumable,
        m.qty,
        m.per,
        m.returnable,
      ]),
      [
        ['TR-001', 'Controller', null, 1, 'group', true],
        ['TR-020', 'Pin', null, 4, 'student', false],
        [null, null, 'Zip ties', 2, 'group', false],
      ],
    );
    const second = await newActivity({ title: 'Code a square', kind: 'code', minutes: 15 });
    assert.equal(second.position, first.position + 1);
    assert.deepEqual(second.materials, []);
  });

  it('lists every problem (400), unknown part codes named, and stores nothing', async () => {
    const before = await activityCount();
    const res = await (
      await as(TEACHER)
    ).post(`/api/lessons/${lessonId}/activities`, {
      title: '',
      kind: 'play',
      minutes: 481,
      materials: [
        { partCode: 'TR-999', qty: 1, per: 'group' },
        { partCode: 'TR-010', consumable: 'Glue', qty: 1, per: 'class' },
        { qty: 1.5, per: 'team' },
        { consumable: 'Card', qty: 10001, per: 'class' },
      ],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(paths(res), [
      'kind',
      'materials.0.partCode',
      'materials.1.partCode',
      'materials.2.partCode',
      'materials.2.per',
      'materials.2.qty',
      'materials.3.qty',
      'minutes',
      'title',
    ]);
    const unknown = res.body.error.details.find(
      (d: { path: string }) => d.path === 'materials.0.partCode',
    );
    assert.equal(unknown.message, 'TR-999 is not in the parts list of Trial Rover Tub.');
    assert.equal(await activityCount(), before);
  });

  it('who may add: authors only (lead, reader, relief 403; admin and other schools 404; anonymous 401)', async () => {
    const before = await activityCount();
    const url = `/api/lessons/${lessonId}/activities`;
    for (const [email, status] of [
      [LEAD, 403],
      [PARTNER, 403],
      [RELIEF, 403],
      [ADMIN, 404],
      [OTHER_TEACHER, 404],
    ] as const) {
      assert.equal((await (await as(email)).post(url, build)).status, status, email);
    }
    assert.equal((await new Browser(t.app).post(url, build)).status, 401);
    assert.equal(await activityCount(), before);
  });
});

describe('GET, PATCH and DELETE /api/activities/:id', () => {
  it('replaces the materials whole and answers the new version; a stale version is 409 with the current activity', async () => {
    const a = await newActivity();
    const owner = await as(TEACHER);
    const res = await owner.patch(`/api/activities/${a.id}`, {
      version: 1,
      minutes: 30,
      materials: [{ partCode: 'TR-010', qty: 2, per: 'group' }],
    });
    assert.equal(res.status, 200);
    assert.equal(res.body.version, 2);
    assert.equal(res.body.minutes, 30);
    assert.deepEqual(
      res.body.materials.map((m: { partCode: string }) => m.partCode),
      ['TR-010'],
    );
    const rows = await t.database.db.select().from(materials).where(eq(materials.activityId, a.id));
    assert.equal(rows.length, 1, 'the old lines are gone');
    // RFC 9110 §15.5.10: 409 Conflict carries what the client needs to resolve it (the current record).
    const stale = await owner.patch(`/api/activities/${a.id}`, {
      version: 1,
      title: 'Lost update',
    });
    assert.equal(stale.status, 409);
    assert.equal(stale.body.error.current.version, 2);
    assert.equal(stale.body.error.current.minutes, 30);
    assert.equal((await owner.get(`/api/activities/${a.id}`)).body.title, 'Build the drive base');
  });

  it('a bad edit (400) changes nothing, materials included', async () => {
    const a = await newActivity();
    const res = await (
      await as(TEACHER)
    ).patch(`/api/activities/${a.id}`, {
      version: 1,
      kind: 'nap',
      minutes: -1,
      materials: [{ partCode: 'TR-404', qty: 1, per: 'group' }],
    });
    assert.equal(res.status, 400);
    assert.deepEqual(paths(res), ['kind', 'materials.0.partCode', 'minutes']);
    const rows = await t.database.db.select().from(materials).where(eq(materials.activityId, a.id));
    assert.equal(rows.length, 3);
    const [row] = await t.database.db.select().from(activities).where(eq(activities.id, a.id));
    assert.equal(row!.version, 1);
  });

  it('who may read, edit and delete', async () => {
    const a = await newActivity();
    const url = `/api/activities/${a.id}`;
    for (const email of [PARTNER, LEAD, RELIEF])
      assert.equal((await (await as(email)).get(url)).status, 200, email);
    for (const email of [ADMIN, OTHER_TEACHER])
      assert.equal((await (await as(email)).get(url)).status, 404, email);
    for (const [email, status] of [
      [PARTNER, 403],
      [LEAD, 403],
      [RELIEF, 403],
      [ADMIN, 404],
      [OTHER_TEACHER, 404],
    ] as const) {
      assert.equal(
        (await (await as(email)).patch(url, { version: 1, title: 'Mine now' })).status,
        status,
        email,
      );
      assert.equal((await (await as(email)).delete(url)).status, status, email);
    }
    const anon = new Browser(t.app);
    assert.equal((await anon.get(url)).status, 401);
    assert.equal((await anon.patch(url, { version: 1, title: 'x' })).status, 401);
    assert.equal((await anon.delete(url)).status, 401);
    assert.equal((await (await as(TEACHER)).delete(url)).status, 204);
    assert.equal(
      (await t.database.db.select().from(materials).where(eq(materials.activityId, a.id))).length,
      0,
    );
    assert.equal((await (await as(TEACHER)).get(url)).status, 404);
  });
});

// Magic numbers from the formats' own specifications.
/** ISO 32000-1 §7.5.2: a PDF file begins with the header `%PDF-1.n`. */
const PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n',
);
/** A 1×1 PNG; PNG (ISO/IEC 15948) §5.2: the signature is 89 50 4E 47 0D 0A 1A 0A. */
const PNG = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);
/** System V ABI, ELF header: 7F 'E' 'L' 'F', class 2 (64-bit), data 1 (little-endian), version 1. */
const ELF = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(56)]);
/** Microsoft PE format: an executable starts with the MS-DOS stub's 'MZ'. */
const EXE = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(62)]);
const HTML = Buffer.from('<!DOCTYPE html><html><body><script>alert(1)</script></body></html>');

async function upload(
  email: string,
  activityId: string,
  bytes: Buffer,
  filename: string,
  contentType: string,
) {
  const b = await as(email);
  await b.ensureCsrf();
  return b.agent
    .post(`/api/activities/${activityId}/attachments`)
    .set('X-XSRF-TOKEN', b.csrf)
    .attach('file', bytes, { filename, contentType });
}

describe('attachments', () => {
  it('stores a PDF and downloads it with its name, type and nosniff', async () => {
    assert.deepEqual([...PNG.subarray(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    const a = await newActivity();
    const res = await upload(TEACHER, a.id, PDF, 'Build steps.pdf', 'application/pdf');
    assert.equal(res.status, 201, res.text);
    assert.deepEqual(res.body, {
      id: res.body.id,
      filename: 'Build steps.pdf',
      size: PDF.length,
      contentType: 'application/pdf',
    });
    const lesson = await (await as(TEACHER)).get(`/api/lessons/${lessonId}`);
    const listed = lesson.body.activities.find((x: { id: string }) => x.id === a.id);
    assert.deepEqual(listed.attachments, [res.body]);

    const down = await (
      await as(TEACHER)
    ).agent
      .get(`/api/activities/attachments/${res.body.id}`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    assert.equal(down.status, 200);
    assert.ok(Buffer.compare(down.body as Buffer, PDF) === 0, 'the same bytes come back');
    assert.equal(down.headers['content-type'], 'application/pdf');
    assert.equal(down.headers['x-content-type-options'], 'nosniff');
    // RFC 6266 §4.1: disposition-type "attachment" with a quoted filename parameter.
    assert.equal(down.headers['content-disposition'], 'attachment; filename="Build steps.pdf"');
  });

  it('names a non-ASCII file with filename* (RFC 6266 §5, RFC 8187)', async () => {
    const a = await newActivity();
    const res = await upload(TEACHER, a.id, PDF, '€ rates.pdf', 'application/pdf');
    assert.equal(res.status, 201);
    assert.equal(res.body.filename, '€ rates.pdf');
    const down = await (await as(TEACHER)).get(`/api/activities/attachments/${res.body.id}`);
    const header = down.headers['content-disposition'] as string;
    // RFC 6266 §5's example: `attachment; filename*= UTF-8''%e2%82%ac%20rates` is "€ rates".
    assert.match(
      header,
      /^attachment; filename="[\x20-\x7e]+"; filename\*=UTF-8''%E2%82%AC%20rates\.pdf$/i,
    );
    const encoded = /filename\*=UTF-8''(.+)$/.exec(header)![1]!;
    assert.equal(decodeURIComponent(encoded), '€ rates.pdf');
  });

  it('decides the type from the bytes: a PNG named .pdf is stored as a PNG with a matching name', async () => {
    const a = await newActivity();
    const res = await upload(TEACHER, a.id, PNG, 'diagram.pdf', 'application/pdf');
    assert.equal(res.status, 201);
    assert.equal(res.body.contentType, 'image/png');
    assert.equal(res.body.filename, 'diagram.pdf.png');
  });

  it('refuses renamed executables and an HTML page (415), a file over 10 MB (413) and no file (400)', async () => {
    const a = await newActivity();
    const before = (await t.database.db.select().from(attachments)).length;
    // RFC 9110 §15.5.16: 415 Unsupported Media Type, "the content is in a format not supported".
    assert.equal(
      (await upload(TEACHER, a.id, ELF, 'build-steps.pdf', 'application/pdf')).status,
      415,
    );
    assert.equal((await upload(TEACHER, a.id, EXE, 'gears.png', 'image/png')).status, 415);
    const html = await upload(TEACHER, a.id, HTML, 'steps.png', 'image/png');
    assert.equal(html.status, 415);
    assert.equal(html.body.error.code, 'unsupported-type');
    // RFC 9110 §15.5.14: 413 Content Too Large. The limit is 10 MB = 10 × 1024 × 1024 bytes.
    const big = Buffer.concat([PDF, Buffer.alloc(10 * 1024 * 1024 + 1 - PDF.length)]);
    const tooBig = await upload(TEACHER, a.id, big, 'huge.pdf', 'application/pdf');
    assert.equal(tooBig.status, 413);
    const justFits = Buffer.concat([PDF, Buffer.alloc(10 * 1024 * 1024 - PDF.length)]);
    const fits = await upload(TEACHER, a.id, justFits, 'exactly-ten.pdf', 'application/pdf');
    assert.equal(fits.status, 201, 'exactly 10 MB is allowed');
    const b = await as(TEACHER);
    const none = await b.agent
      .post(`/api/activities/${a.id}/attachments`)
      .set('X-XSRF-TOKEN', b.csrf)
      .field('note', 'no file');
    assert.equal(none.status, 400);
    assert.equal((await t.database.db.select().from(attachments)).length, before + 1);
  });

  it('who may upload, download and delete', async () => {
    const a = await newActivity();
    const saved = await upload(TEACHER, a.id, PDF, 'steps.pdf', 'application/pdf');
    const url = `/api/activities/attachments/${saved.body.id}`;
    for (const email of [PARTNER, LEAD, RELIEF])
      assert.equal((await (await as(email)).get(url)).status, 200, email);
    for (const email of [ADMIN, OTHER_TEACHER])
      assert.equal((await (await as(email)).get(url)).status, 404, email);
    assert.equal((await new Browser(t.app).get(url)).status, 401);
    for (const [email, status] of [
      [PARTNER, 403],
      [LEAD, 403],
      [RELIEF, 403],
      [ADMIN, 404],
      [OTHER_TEACHER, 404],
    ] as const) {
      assert.equal(
        (await upload(email, a.id, PDF, 'mine.pdf', 'application/pdf')).status,
        status,
        email,
      );
      assert.equal((await (await as(email)).delete(url)).status, status, email);
    }
    assert.equal((await new Browser(t.app).delete(url)).status, 401);
    assert.equal(
      (await t.database.db.select().from(attachments).where(eq(attachments.activityId, a.id)))
        .length,
      1,
    );
    assert.equal((await (await as(TEACHER)).delete(url)).status, 204);
    assert.equal((await (await as(TEACHER)).get(url)).status, 404);
  });
});
