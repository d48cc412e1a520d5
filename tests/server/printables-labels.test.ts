/**
 * Tray labels: every label's QR code is read back by jsQR (a reference QR decoder) from the
 * page as pdfjs-dist renders it to pixels, so what is checked is what prints, not the data fed
 * to the encoder. Also the label text, the sheet layout on A4 and Letter, and the file name.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq } from 'drizzle-orm';
import jsQRModule from 'jsqr';
import { getDocument, type PDFDocumentProxy } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { renderPage, SCALE } from '../support/pdf-pixels.js';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { download } from '../support/planning.js';
import { lessons, schools, units } from '../../server/db/schema/index.js';
import { closePdfPool } from '../../server/pdf/pool.js';
import { labelGrid } from '../../server/pdf/labels.js';
import type { PrepPlan } from '../../shared/prep/index.js';

// jsqr is CommonJS: under NodeNext its default import is module.exports, whose `default` is jsQR.
const jsQR = jsQRModule.default;

async function pageTexts(
  doc: PDFDocumentProxy,
): Promise<{ str: string; x: number; y: number }[][]> {
  const out = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const content = await (await doc.getPage(n)).getTextContent();
    out.push(
      content.items
        .filter((i): i is Extract<typeof i, { str: string }> => 'str' in i && i.str.trim() !== '')
        .map((i) => ({ str: i.str, x: i.transform[4], y: i.transform[5] })),
    );
  }
  return out;
}

let t: TestApp;
let teacher: Browser;
let lessonId = '';
let plan: PrepPlan;

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  const [lesson] = await t.database.db
    .select()
    .from(lessons)
    .where(and(eq(lessons.unitId, unit!.id), eq(lessons.position, 1)));
  lessonId = lesson!.id;
  plan = (await teacher.get(`/api/lessons/${lessonId}/prep`)).body as PrepPlan;
});
after(async () => {
  await closePdfPool();
  await t.close();
});

async function checkSheet(paper: 'A4' | 'Letter', size: [number, number]) {
  const res = await download(teacher, `/api/lessons/${lessonId}/labels.pdf`);
  assert.equal(res.status, 200);
  assert.equal(res.headers['content-type'], 'application/pdf');
  assert.equal(
    res.headers['content-disposition'],
    'attachment; filename="4K-2026-07-28-rescue-rovers-lesson-2-tray-labels.pdf"',
  );
  const doc = await getDocument({ data: new Uint8Array(res.body as Buffer) }).promise;
  const grid = labelGrid(paper);
  assert.equal(doc.numPages, Math.ceil(plan.groups.length / grid.slots.length));
  const texts = await pageTexts(doc);
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    assert.deepEqual(
      page.view.slice(2).map((v) => Math.round(v * 100) / 100),
      size,
    );
    const context = await renderPage(doc, n);
    const seen = new Set<string>();
    const groups = plan.groups.slice((n - 1) * grid.slots.length, n * grid.slots.length);
    groups.forEach((group, i) => {
      const slot = grid.slots[i]!;
      const [x, y, w, h] = [slot.x, slot.y, grid.width, grid.height].map((v) =>
        Math.round(v * SCALE),
      );
      const image = context.getImageData(x!, y!, w!, h!);
      const code = jsQR(image.data, image.width, image.height);
      assert.ok(code, `${paper}: a QR code on group ${group.number}'s label`);
      // That group's tray page (the test app's appUrl is http://127.0.0.1:3999; API.md fixes
      // the path and a base64url token of at least 22 characters).
      assert.match(code.data, /^http:\/\/127\.0\.0\.1:3999\/tray\/[A-Za-z0-9_-]{22,}$/);
      assert.ok(!seen.has(code.data), 'each group has its own code');
      seen.add(code.data);
      // The label's own text lies inside its slot (pdfjs's y runs up from the page's bottom).
      const inside = texts[n - 1]!.filter((it) => it.x >= slot.x && it.x < slot.x + grid.width)
        .filter((it) => size[1] - it.y >= slot.y && size[1] - it.y < slot.y + grid.height)
        .map((it) => it.str)
        .join(' ');
      assert.ok(inside.includes(`Group ${group.number}`), inside);
      assert.ok(inside.includes(`${group.pieces} pieces in the tray`), inside);
      assert.ok(inside.includes(group.homeTub!), inside);
      const short = plan.shortfalls.some((s) => s.group === group.number);
      assert.equal(inside.includes('Short: see the pull sheet'), short, `group ${group.number}`);
      assert.ok(inside.includes(short ? 'none (short)' : group.controllerLabel!), inside);
    });
  }
  await doc.destroy();
}

describe('GET /api/lessons/:id/labels.pdf', () => {
  it('prints one label per group tray, each QR code decoding to that group’s pull list (A4, ISO 216)', async () => {
    await checkSheet('A4', [595.28, 841.89]);
  });

  it('lays the labels out on a Letter sheet when the school uses Letter (ANSI/ASME Y14.1)', async () => {
    const db = t.database.db;
    await db
      .update(schools)
      .set({ paperSize: 'Letter' })
      .where(eq(schools.name, 'Kestrel Ridge Primary School'));
    try {
      await checkSheet('Letter', [612, 792]);
    } finally {
      await db
        .update(schools)
        .set({ paperSize: 'A4' })
        .where(eq(schools.name, 'Kestrel Ridge Primary School'));
    }
  });

  it('places ten labels on the sheet without overlap, inside the page', () => {
    for (const [paper, page] of [
      ['A4', [595.28, 841.89]],
      ['Letter', [612, 792]],
    ] as const) {
      const g = labelGrid(paper);
      assert.equal(g.slots.length, 10);
      for (const s of g.slots) {
        assert.ok(
          s.x >= 0 &&
            s.y >= 0 &&
            s.x + g.width <= page[0] + 1e-6 &&
            s.y + g.height <= page[1] + 1e-6,
        );
      }
      for (const a of g.slots) {
        for (const b of g.slots) {
          if (a === b) continue;
          const apart =
            a.x + g.width <= b.x + 1e-6 ||
            b.x + g.width <= a.x + 1e-6 ||
            a.y + g.height <= b.y + 1e-6 ||
            b.y + g.height <= a.y + 1e-6;
          assert.ok(apart, `${paper}: labels overlap`);
        }
      }
    }
    // 4 × 2 in labels on Letter, 2 × 5: 8.5 in wide sheet, 0.5 in top margin (from memory).
    assert.deepEqual(
      [labelGrid('Letter').width, labelGrid('Letter').height, labelGrid('Letter').slots[0]!.y],
      [288, 144, 36],
    );
  });
});
