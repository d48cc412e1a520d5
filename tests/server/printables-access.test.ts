/**
 * Who may download printables: as for reading the lesson (or unit) itself. Anonymous → 401;
 * another school, a relief teacher not assigned to the lesson, a role that cannot read units,
 * an unknown or malformed id → 404 (never 403: no leak of existence). And a lesson the engine
 * cannot plan answers 422 with the reasons rather than a broken file.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, asc, eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { insertLesson, insertUnit, schoolIds, userByEmail } from '../support/planning.js';
import {
  activities,
  classes,
  kitTypes,
  lessons,
  materials,
  units,
} from '../../server/db/schema/index.js';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { closePdfPool } from '../../server/pdf/pool.js';

let t: TestApp;
let unitId = '';
/** Lesson 2 (no relief teacher) and lesson 3 (the demo relief teacher's). */
let lesson2 = '';
let lesson3 = '';
let lesson4 = '';
let otherLesson = '';
let otherUnit = '';

const lessonRoutes = (id: string) => [
  `/api/lessons/${id}/pack.pdf`,
  `/api/lessons/${id}/labels.pdf`,
  `/api/lessons/${id}/prep.ics`,
];
const unitRoutes = (id: string) => [`/api/units/${id}/pack.pdf`, `/api/units/${id}/prep.ics`];

async function status(b: Browser, url: string): Promise<number> {
  return (
    await b.agent
      .get(url)
      .buffer(true)
      .parse((res, done) => {
        res.on('data', () => {});
        res.on('end', () => done(null, null));
      })
  ).status;
}

before(async () => {
  t = await testApp();
  const db = t.database.db;
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  unitId = unit!.id;
  const rows = await db
    .select()
    .from(lessons)
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position));
  [lesson2, lesson3, lesson4] = [rows[1]!.id, rows[2]!.id, rows[3]!.id];
  const relief = await userByEmail(db, 'relief@kestrel-ridge.example');
  assert.equal(
    rows[2]!.reliefTeacherId,
    relief.id,
    'the demo assigns lesson 3 to the relief teacher',
  );
  assert.equal(rows[1]!.reliefTeacherId, null);
  // A unit and lesson of the other school, shared with that school.
  const { banksia } = await schoolIds(db);
  const bAdmin = await userByEmail(db, 'admin@banksia-flat.example');
  const [bKit] = await db.select().from(kitTypes).where(eq(kitTypes.schoolId, banksia));
  const [bClass] = await db.select().from(classes).where(eq(classes.schoolId, banksia));
  otherUnit = await insertUnit(db, {
    schoolId: banksia,
    ownerId: bAdmin.id,
    title: 'Banksia unit',
    yearLevel: 3,
    visibility: 'school',
  });
  otherLesson = await insertLesson(db, {
    schoolId: banksia,
    unitId: otherUnit,
    title: 'Banksia lesson',
    classId: bClass!.id,
    kitTypeId: bKit!.id,
    startsAt: '2026-07-28 09:00:00',
    endsAt: '2026-07-28 09:50:00',
    groupSize: 4,
  });
});
after(async () => {
  await closePdfPool();
  await t.close();
});

describe('printables are read as the lesson or unit is read', () => {
  it('answer 401 to anonymous requests', async () => {
    const anon = new Browser(t.app);
    for (const url of [...lessonRoutes(lesson2), ...unitRoutes(unitId)])
      assert.equal(await status(anon, url), 401, url);
  });

  it('answer 404 to another school, both ways', async () => {
    const banksia = await signedIn(t.app, 'admin@banksia-flat.example');
    for (const url of [...lessonRoutes(lesson2), ...unitRoutes(unitId)])
      assert.equal(await status(banksia, url), 404, url);
    // A Kestrel Ridge lead reads every unit of their own school, and still none of Banksia Flat's.
    const lead = await signedIn(t.app, 'lead@kestrel-ridge.example');
    for (const url of [...lessonRoutes(otherLesson), ...unitRoutes(otherUnit)])
      assert.equal(await status(lead, url), 404, url);
  });

  it('answer 404 to a relief teacher for a lesson not assigned to them, and to units', async () => {
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    for (const url of [...lessonRoutes(lesson2), ...unitRoutes(unitId)])
      assert.equal(await status(relief, url), 404, url);
  });

  it('let the relief teacher download the lesson assigned to them', async () => {
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    for (const url of lessonRoutes(lesson3)) assert.equal(await status(relief, url), 200, url);
  });

  it('answer 404 to a school admin (admins do not read units) and to unknown or malformed ids', async () => {
    const admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
    for (const url of [...lessonRoutes(lesson2), ...unitRoutes(unitId)])
      assert.equal(await status(admin, url), 404, url);
    const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    const unknown = '00000000-0000-4000-8000-000000000000';
    for (const url of [
      ...lessonRoutes(unknown),
      ...unitRoutes(unknown),
      ...lessonRoutes('not-an-id'),
      ...unitRoutes('not-an-id'),
    ]) {
      assert.equal(await status(teacher, url), 404, url);
    }
  });

  it('serve the owner, a lead, and a colleague when the unit is shared with the school', async () => {
    for (const email of [
      'teacher@kestrel-ridge.example',
      'lead@kestrel-ridge.example',
      'partner@kestrel-ridge.example',
    ]) {
      const b = await signedIn(t.app, email);
      for (const url of [...lessonRoutes(lesson2), `/api/units/${unitId}/prep.ics`]) {
        assert.equal(await status(b, url), 200, `${email} ${url}`);
      }
    }
    const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    assert.equal(await status(teacher, `/api/units/${unitId}/pack.pdf`), 200);
  });

  it('answer 404 to a colleague once the unit is private again', async () => {
    const db = t.database.db;
    await db.update(units).set({ visibility: 'private' }).where(eq(units.id, unitId));
    try {
      const partner = await signedIn(t.app, 'partner@kestrel-ridge.example');
      for (const url of [...lessonRoutes(lesson2), ...unitRoutes(unitId)])
        assert.equal(await status(partner, url), 404, url);
    } finally {
      await db.update(units).set({ visibility: 'school' }).where(eq(units.id, unitId));
    }
  });
});

describe('a lesson the prep engine refuses', () => {
  it('answers 422 with the reasons for its own files; the unit pack prints it as a page saying why', async () => {
    const db = t.database.db;
    const [first] = await db
      .select()
      .from(activities)
      .where(eq(activities.lessonId, lesson4))
      .orderBy(asc(activities.position));
    // A material naming a part code the kit type's parts list does not have.
    const [bad] = await db
      .insert(materials)
      .values({
        activityId: first!.id,
        position: 99,
        partCode: 'ZZ-999',
        qty: 1,
        per: 'group',
        returnable: true,
      })
      .returning();
    try {
      const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
      for (const url of lessonRoutes(lesson4)) {
        const res = await teacher.get(url);
        assert.equal(res.status, 422, url);
        assert.equal(res.body.error.code, 'lesson-not-plannable');
        assert.ok(res.body.error.details.length >= 1);
        assert.ok(
          res.body.error.details.some((d: { message: string }) => d.message.includes('ZZ-999')),
          JSON.stringify(res.body),
        );
      }
      const ics = await teacher.get(`/api/units/${unitId}/prep.ics`);
      assert.equal(ics.status, 200, 'the other lessons’ tasks still come');
      const pack = await teacher.agent
        .get(`/api/units/${unitId}/pack.pdf`)
        .buffer(true)
        .parse((res, done) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => done(null, Buffer.concat(chunks)));
        });
      assert.equal(pack.status, 200);
      const doc = await getDocument({ data: new Uint8Array(pack.body as Buffer) }).promise;
      const texts: string[] = [];
      for (let n = 1; n <= doc.numPages; n++) {
        const content = await (await doc.getPage(n)).getTextContent();
        texts.push(content.items.map((i) => ('str' in i ? i.str : '')).join(' '));
      }
      const why = texts.filter((x) => x.includes('This lesson cannot be planned yet'));
      assert.equal(why.length, 1);
      assert.ok(why[0]!.includes('ZZ-999'), why[0]);
      assert.ok(why[0]!.includes('Lesson 4 of 8'));
      await doc.destroy();
    } finally {
      await db.delete(materials).where(and(eq(materials.id, bad!.id)));
    }
  });
});
