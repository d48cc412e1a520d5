/**
 * Build instructions in the lesson pack (issue 13): an image attachment is drawn on a "Build
 * instructions" page, a two-page PDF attachment is appended after the pack's own pages, and
 * "Page N of M" is right on every page. Read back with pdfjs-dist (a reference PDF reader).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, asc, eq, ne } from 'drizzle-orm';
import supertest from 'supertest';
import QRCode from 'qrcode';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { getDocument, OPS } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { testApp, type TestApp } from '../support/app.js';
import { TEACHER, browsers, download } from '../support/planning.js';
import { activities, attachments, lessons, units } from '../../server/db/schema/index.js';

let t: TestApp;
let lessonId = '';

async function sharedPack(): Promise<Buffer> {
  const teacher = await browsers(t.app)(TEACHER);
  const link = await teacher.post(`/api/lessons/${lessonId}/share-links`, {});
  const token = /\/pack\/(.+)$/.exec(link.body.url)![1]!;
  const res = await supertest(t.app)
    .get(`/api/share/${token}/pack.pdf`)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
  assert.equal(res.status, 200);
  return res.body as Buffer;
}

async function pageTexts(pdf: Awaited<ReturnType<typeof getDocument>['promise']>) {
  const texts: string[] = [];
  for (let i = 1; i <= pdf.numPages; i++) {
    const content = await (await pdf.getPage(i)).getTextContent();
    texts.push(content.items.map((item) => ('str' in item ? item.str : '')).join(' '));
  }
  return texts;
}

before(async () => {
  t = await testApp();
  const db = t.database.db;
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  const [lesson] = await db
    .select()
    .from(lessons)
    .where(eq(lessons.unitId, unit!.id))
    .orderBy(asc(lessons.position));
  lessonId = lesson!.id;
});
after(async () => {
  await t.close();
});

describe('build instructions in the lesson pack', () => {
  it('adds an image page and a two-page PDF, numbered Page N of M on every page', async () => {
    const plain = await getDocument({ data: new Uint8Array(await sharedPack()) }).promise;
    const base = plain.numPages;
    await plain.destroy();

    const db = t.database.db;
    const [activity] = await db
      .select()
      .from(activities)
      .where(eq(activities.lessonId, lessonId))
      .orderBy(asc(activities.position));
    const png = await QRCode.toBuffer('build step one', { width: 240 });
    const two = await PDFDocument.create();
    const font = await two.embedFont(StandardFonts.Helvetica);
    for (const words of ['Attached step one', 'Attached step two']) {
      two.addPage([595.28, 841.89]).drawText(words, { x: 72, y: 700, size: 24, font });
    }
    const pdfBytes = Buffer.from(await two.save());
    await db.insert(attachments).values([
      {
        activityId: activity!.id,
        filename: 'step-one.png',
        contentType: 'image/png',
        size: png.length,
        bytes: png,
      },
      {
        activityId: activity!.id,
        filename: 'steps.pdf',
        contentType: 'application/pdf',
        size: pdfBytes.length,
        bytes: pdfBytes,
      },
    ]);

    const pdf = await getDocument({ data: new Uint8Array(await sharedPack()) }).promise;
    // One "Build instructions" page for the activity's image, then the PDF's two pages.
    assert.equal(pdf.numPages, base + 3);
    const texts = await pageTexts(pdf);
    texts.forEach((text, i) => {
      assert.ok(
        text.includes(`Page ${i + 1} of ${pdf.numPages}`),
        `page ${i + 1}: ${text.slice(-80)}`,
      );
    });
    const imagePage = texts.findIndex(
      (x) => x.includes('Build instructions') && x.includes('step-one.png'),
    );
    assert.equal(imagePage, base, 'the image page follows the pack’s own pages');
    const ops = await (await pdf.getPage(imagePage + 1)).getOperatorList();
    assert.ok(ops.fnArray.includes(OPS.paintImageXObject), 'the image is drawn');
    assert.ok(texts[base + 1]!.includes('Attached step one'));
    assert.ok(texts[base + 2]!.includes('Attached step two'));
    assert.ok(texts[base + 1]!.includes('steps.pdf · page 1 of 2'));
    await pdf.destroy();

    // The lesson's own pack route prints the same pages.
    const teacher = await browsers(t.app)(TEACHER);
    const own = await getDocument({
      data: new Uint8Array((await download(teacher, `/api/lessons/${lessonId}/pack.pdf`)).body),
    }).promise;
    assert.equal(own.numPages, base + 3);
    await own.destroy();
  });

  it('prints them in the unit pack too, unless left out with ?attachments=none', async () => {
    const teacher = await browsers(t.app)(TEACHER);
    const [lesson] = await t.database.db.select().from(lessons).where(eq(lessons.id, lessonId));
    // A unit of this one lesson keeps the two renders short on a busy test machine.
    await t.database.db
      .delete(lessons)
      .where(and(eq(lessons.unitId, lesson!.unitId), ne(lessons.id, lessonId)));
    const url = `/api/units/${lesson!.unitId}/pack.pdf`;
    const pages = async (suffix: string) => {
      const res = await download(teacher, url + suffix);
      assert.equal(res.status, 200);
      const pdf = await getDocument({ data: new Uint8Array(res.body) }).promise;
      const texts = await pageTexts(pdf);
      texts.forEach((text, i) => assert.ok(text.includes(`Page ${i + 1} of ${pdf.numPages}`)));
      await pdf.destroy();
      return texts;
    };
    const without = await pages('?attachments=none');
    const withThem = await pages('');
    assert.equal(withThem.length, without.length + 3);
    assert.ok(withThem.at(-1)!.includes('Attached step two'), 'PDF pages close the unit pack');
    assert.ok(!without.some((x) => x.includes('step-one.png')));
    assert.equal((await teacher.get(`${url}?attachments=maybe`)).status, 400);
  });
});
