/**
 * Where printed pages break, read back with pdfjs-dist. Widow and orphan control is common
 * practice in print layout (no published source): a heading stays with what follows it, a table
 * that fits on a page is not split, a table that must split repeats its header and leaves at
 * least three rows on each side, and a table's trailer (a pull sheet's consumables) never makes
 * a page of its own.
 *
 * First on built documents, with a block of filler above that moves the break through every
 * place it can fall; then on real packs: a unit of lessons whose one group's parts list grows a
 * line at a time (so one of them leaves the consumables under a full page), and a class whose
 * device pairing table runs over a page.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, asc, eq } from 'drizzle-orm';
import { testApp, signedIn, type Browser, type TestApp } from '../support/app.js';
import { pageLines } from '../support/pdf-text.js';
import {
  download,
  insertClass,
  insertLesson,
  insertUnit,
  userByEmail,
  TEACHER,
} from '../support/planning.js';
import {
  activities,
  lessonTubs,
  lessons,
  materials,
  parts,
  units,
} from '../../server/db/schema/index.js';
import { closePdfPool } from '../../server/pdf/pool.js';
import { preparePdfmake } from '../../server/pdf/fonts.js';
import { dataTable, documentFrame, pageFooter, td, th } from '../../server/pdf/layout.js';
import type { Content } from '../../server/pdf/content.js';

/** Rows a broken table keeps on each side (common practice, no published source). */
const MIN_ROWS = 3;

async function render(content: Content[]): Promise<string[][]> {
  const doc = documentFrame(
    'A4',
    { title: 'Break check', subject: 'Break check', generatedAt: '2026-07-28T01:00:00Z' },
    content,
    { footer: pageFooter('A4', 'Tue 28 Jul 2026') },
  );
  const buffer = await preparePdfmake().createPdf(doc).getBuffer();
  return pageLines(new Uint8Array(buffer));
}

/** A block `height` points tall with no text, to push what follows down the page. */
/** A wall-clock timestamp `days` later at the same time of day. */
function daysLater(stamp: string, days: number): string {
  const day = new Date(`${stamp.slice(0, 10)}T00:00:00Z`);
  day.setUTCDate(day.getUTCDate() + days);
  return day.toISOString().slice(0, 10) + stamp.slice(10);
}

const filler = (height: number): Content => ({
  canvas: [{ type: 'rect', x: 0, y: 0, w: 4, h: height, lineWidth: 0.5 }],
});

/** Pages (from 0) holding each line that matches. */
function pagesOf(pages: string[][], match: (line: string) => boolean): number[] {
  return pages.flatMap((lines, p) => lines.filter(match).map(() => p));
}

function rowsPerPage(pages: string[][], prefix: string): Map<number, number> {
  const counts = new Map<number, number>();
  for (const p of pagesOf(pages, (l) => new RegExp(`^${prefix} \\d+\\b`).test(l)))
    counts.set(p, (counts.get(p) ?? 0) + 1);
  return counts;
}

function sheet(fill: number, rows: number): Content[] {
  return [
    filler(fill),
    { text: 'Parts to pull', style: 'heading' },
    dataTable(
      ['*', 'auto'],
      [th('Item'), th('Qty')],
      Array.from({ length: rows }, (_, i) => [td(`Item ${i + 1}`), td('2')]),
    ),
    {
      // Printed after the table and kept with it, like a pull sheet's consumables.
      keep: 'with-previous',
      stack: [
        { text: 'Trailer list', style: 'subheading' },
        { text: 'Trailer line one' },
        { text: 'Trailer line two' },
      ],
    },
  ];
}

describe('page breaks on built documents (filler moved down the page 25 pt at a time)', () => {
  const fills = Array.from({ length: 28 }, (_, i) => i * 25);

  it('moves a short table whole with its heading and trailer: never split, never apart', async () => {
    for (const fill of fills) {
      const pages = await render(sheet(fill, 8));
      const where = `filler ${fill} pt`;
      const rows = pagesOf(pages, (l) => /^Item \d+ 2$/.test(l));
      assert.equal(rows.length, 8, where);
      // A table of 8 rows fits on any page: all of it on one page.
      assert.equal(new Set(rows).size, 1, `${where}: rows on pages ${rows}`);
      const [heading] = pagesOf(pages, (l) => l === 'Parts to pull');
      const [header] = pagesOf(pages, (l) => l === 'Item Qty');
      const [trailer] = pagesOf(pages, (l) => l === 'Trailer list');
      assert.equal(heading, rows[0], `${where}: heading with its table`);
      assert.equal(header, rows[0], `${where}: header row with its table`);
      assert.equal(trailer, rows[0], `${where}: trailer with its table`);
    }
  });

  it('splits a long table with its header repeated and at least three rows on each page, the trailer never alone', async () => {
    // Past 20 rows or so the table cannot share a page with the filler: every split is tried.
    for (const rows of [34, 41]) {
      for (const fill of fills) {
        const pages = await render(sheet(fill, rows));
        const where = `${rows} rows, filler ${fill} pt`;
        const perPage = rowsPerPage(pages, 'Item');
        assert.equal(
          [...perPage.values()].reduce((a, b) => a + b, 0),
          rows,
          where,
        );
        for (const [page, n] of perPage) {
          assert.ok(n >= MIN_ROWS, `${where}: page ${page + 1} holds ${n} rows`);
          // Header row repeated wherever the table runs (pdfmake's headerRows).
          assert.ok(pages[page]!.includes('Item Qty'), `${where}: header on page ${page + 1}`);
        }
        const [heading] = pagesOf(pages, (l) => l === 'Parts to pull');
        const first = Math.min(...perPage.keys());
        assert.equal(heading, first, `${where}: heading on the page of the first rows`);
        const [trailer] = pagesOf(pages, (l) => l === 'Trailer list');
        const last = pagesOf(pages, (l) => l === `Item ${rows} 2`)[0];
        assert.equal(trailer, last, `${where}: trailer with the last rows`);
        pages.forEach((lines, i) =>
          assert.equal(lines.at(-1), `Generated Tue 28 Jul 2026 Page ${i + 1} of ${pages.length}`),
        );
      }
    }
  });

  it('keeps a heading with the paragraph after it', async () => {
    // Near the foot of the page, 4 pt at a time: somewhere the heading fits and its text not.
    for (let fill = 600; fill < 700; fill += 4) {
      const pages = await render([
        filler(fill),
        { text: 'Body line', margin: [0, 0, 0, 0] },
        { text: 'A heading', style: 'heading' },
        { text: 'What the heading is about.' },
      ]);
      const [heading] = pagesOf(pages, (l) => l === 'A heading');
      const [body] = pagesOf(pages, (l) => l === 'What the heading is about.');
      assert.equal(heading, body, `filler ${fill} pt`);
    }
  });
});

describe('page breaks in real packs', () => {
  let t: TestApp;
  let teacher: Browser;
  let unitPack: string[][];
  let codes: string[];
  /** Parts-list lengths of the test unit's lessons, in order. */
  const lengths = [24, 25, 26, 27, 28, 29, 30, 31, 32];

  before(async () => {
    t = await testApp();
    teacher = await signedIn(t.app, TEACHER);
    const db = t.database.db;
    const [demoUnit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
    const [demo] = await db
      .select()
      .from(lessons)
      .where(and(eq(lessons.unitId, demoUnit!.id), eq(lessons.position, 1)));
    const tubs = await db.select().from(lessonTubs).where(eq(lessonTubs.lessonId, demo!.id));
    codes = (
      await db
        .select({ code: parts.code })
        .from(parts)
        .where(eq(parts.kitTypeId, demo!.kitTypeId))
        .orderBy(asc(parts.position))
    ).map((p) => p.code);
    assert.ok(codes.length >= Math.max(...lengths), 'the demo kit has enough parts');
    const owner = await userByEmail(db, TEACHER);
    const unitId = await insertUnit(db, {
      schoolId: demo!.schoolId,
      ownerId: owner.id,
      title: 'Break check',
      yearLevel: 4,
    });
    const one = await insertClass(db, demo!.schoolId, {
      name: 'Break 1',
      yearLevel: 4,
      studentCount: 3,
      devices: 1,
    });
    const many = await insertClass(db, demo!.schoolId, {
      name: 'Break 2',
      yearLevel: 4,
      studentCount: 60,
      devices: 18,
    });
    const lesson = async (classId: string, position: number, partCount: number) => {
      const id = await insertLesson(
        db,
        {
          unitId,
          schoolId: demo!.schoolId,
          classId,
          kitTypeId: demo!.kitTypeId,
          title: `Break check ${position}`,
          // A day each, so no two lessons book the same tubs at once.
          startsAt: daysLater(demo!.startsAt, position),
          endsAt: daysLater(demo!.endsAt, position),
          groupSize: 3,
          position,
        },
        tubs.map((b) => b.tubId),
      );
      const [activity] = await db
        .insert(activities)
        .values({ lessonId: id, position: 0, title: 'Build', kind: 'build', minutes: 25 })
        .returning();
      await db.insert(materials).values([
        ...codes.slice(0, partCount).map((partCode, i) => ({
          activityId: activity!.id,
          position: i,
          partCode,
          qty: 1,
          per: 'group' as const,
          returnable: true,
        })),
        ...['Sticky notes', 'Masking tape', 'Card strip'].map((consumable, i) => ({
          activityId: activity!.id,
          position: partCount + i,
          consumable,
          qty: 1,
          per: 'group' as const,
          returnable: false,
        })),
      ]);
    };
    for (const [i, n] of lengths.entries()) await lesson(one, i + 1, n);
    // 20 groups (the most a class of 60 makes): the device pairing table runs past a page.
    await lesson(many, lengths.length + 1, 4);
    const res = await download(teacher, `/api/units/${unitId}/pack.pdf`);
    assert.equal(res.status, 200);
    unitPack = await pageLines(new Uint8Array(res.body as Buffer));
  });
  after(async () => {
    await closePdfPool();
    await t.close();
  });

  /** Lines between the page header and the footer. */
  const body = (lines: string[]) => lines.slice(1, -1);
  const codeRow = (line: string) => codes.some((c) => line.split(' ').includes(c));
  const deviceRow = (line: string) => /^Group \d+ (Tub \d+|—)/.test(line);

  it('numbers every page "Page N of M"', () => {
    unitPack.forEach((lines, i) =>
      assert.match(lines.at(-1)!, new RegExp(`Page ${i + 1} of ${unitPack.length}$`)),
    );
  });

  it('never starts a page with a table’s trailer or a lone heading, and a continued table brings at least three rows', () => {
    let continued = 0;
    unitPack.forEach((lines, i) => {
      const [first, ...rest] = body(lines);
      const where = `page ${i + 1}: ${lines[0]}`;
      assert.ok(first !== undefined, `${where}: empty`);
      assert.ok(
        !['Consumables', 'Borrowed: return to their own tub'].includes(first) &&
          !first.startsWith('Start each task by its start-by time'),
        `${where}: starts with "${first}"`,
      );
      // A page whose first line is a table's header row continues that table.
      if (/^Out Code Part/.test(first) || /^Group Home tub Controller/.test(first)) {
        continued++;
        const rows = rest.filter((l) => codeRow(l) || deviceRow(l)).length;
        assert.ok(rows >= MIN_ROWS, `${where}: ${rows} rows continued`);
      }
      // A heading is never the last line of a page.
      const last = body(lines).at(-1)!;
      assert.ok(
        !['Consumables', 'Class consumables', 'Spares tray', 'Tubs booked', 'Also check'].includes(
          last,
        ),
        `${where}: ends with the heading "${last}"`,
      );
    });
    // The longest parts lists and the 20-group pairing table cannot each stay on one page.
    assert.ok(continued >= 2, `${continued} continued tables`);
  });

  it('prints each pull sheet’s consumables on a page with its last part lines', () => {
    const sheets = unitPack
      .map((lines, i) => ({ lines, i }))
      .filter(({ lines }) => body(lines).includes('Consumables'));
    assert.ok(sheets.length >= lengths.length, 'every one-group lesson has a consumables list');
    for (const { lines, i } of sheets) {
      const page = body(lines);
      const rowsAbove = page.slice(0, page.indexOf('Consumables')).filter(codeRow).length;
      assert.ok(rowsAbove >= MIN_ROWS, `page ${i + 1}: ${rowsAbove} part lines above`);
    }
  });
});
