/**
 * The lesson pack and unit pack, parsed back with pdfjs-dist (a general-purpose PDF reader):
 * paper sizes, page count by section, each group's quantities against the prep plan served by
 * the API, embedded fonts, "Page N of M" on every page, the shortfall warning, Markdown printed
 * with its structure, and a pack always matching the lesson as stored.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, asc, eq } from 'drizzle-orm';
import { getDocument, OPS } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { download, insertLesson, insertUnit, userByEmail } from '../support/planning.js';
import { lessons, schools, units } from '../../server/db/schema/index.js';
import { closePdfPool } from '../../server/pdf/pool.js';
import type { PrepPlan } from '../../shared/prep/index.js';

interface Item {
  str: string;
  x: number;
  y: number;
  width: number;
  /** Font size in points (the text matrix's scale). */
  size: number;
  /** The embedded font's PostScript name, e.g. `BZZZZZ+SourceSans3-Bold`. */
  font: string;
}
interface Page {
  width: number;
  height: number;
  items: Item[];
  /** The page's text, one line per baseline, in reading order. */
  text: string;
}

async function readPdf(
  bytes: Buffer,
): Promise<{ pages: Page[]; embeddedFonts: Set<string>; missing: string[] }> {
  const doc = await getDocument({ data: new Uint8Array(bytes) }).promise;
  const pages: Page[] = [];
  const embeddedFonts = new Set<string>();
  const missing: string[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    const [, , width, height] = page.view as [number, number, number, number];
    // The operator list loads the page's fonts into commonObjs.
    const ops = await page.getOperatorList();
    ops.fnArray.forEach((fn, i) => {
      if (fn !== OPS.setFont) return;
      const font = page.commonObjs.get(ops.argsArray[i][0]) as {
        name: string;
        missingFile: boolean;
      };
      embeddedFonts.add(font.name);
      if (font.missingFile) missing.push(font.name);
    });
    const content = await page.getTextContent();
    const items: Item[] = [];
    for (const raw of content.items) {
      if (!('str' in raw) || !raw.str.trim()) continue;
      const font = page.commonObjs.get(raw.fontName) as { name: string };
      items.push({
        str: raw.str,
        x: raw.transform[4],
        y: raw.transform[5],
        width: raw.width,
        size: raw.transform[0],
        font: font.name,
      });
    }
    const lines = new Map<number, Item[]>();
    for (const it of items) {
      const key = [...lines.keys()].find((y) => Math.abs(y - it.y) < 1.5) ?? it.y;
      lines.set(key, [...(lines.get(key) ?? []), it]);
    }
    const text = [...lines.entries()]
      .sort((a, b) => b[0] - a[0])
      .map(([, l]) =>
        l
          .sort((a, b) => a.x - b.x)
          .map((i) => i.str)
          .join(' ')
          .replace(/\s+/g, ' '),
      )
      .join('\n');
    pages.push({ width, height, items, text });
  }
  await doc.destroy();
  return { pages, embeddedFonts, missing };
}

/** `2026-07-28T11:53:00+09:30` → `11:53 am`, read off the ISO string itself (its local time). */
function clock12(iso: string): string {
  const [h, m] = iso.slice(11, 16).split(':').map(Number) as [number, number];
  return `${h % 12 === 0 ? 12 : h % 12}:${String(m).padStart(2, '0')} ${h < 12 ? 'am' : 'pm'}`;
}

let t: TestApp;
let teacher: Browser;
let lessonId = '';
let unitId = '';
let plan: PrepPlan;
let pack: Awaited<ReturnType<typeof readPdf>>;
let packBytes: Buffer;

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  unitId = unit!.id;
  const [lesson] = await t.database.db
    .select()
    .from(lessons)
    .where(and(eq(lessons.unitId, unitId), eq(lessons.position, 1)));
  lessonId = lesson!.id;
  plan = (await teacher.get(`/api/lessons/${lessonId}/prep`)).body as PrepPlan;
  const res = await download(teacher, `/api/lessons/${lessonId}/pack.pdf`);
  assert.equal(res.status, 200);
  packBytes = res.body as Buffer;
  pack = await readPdf(packBytes);
});
after(async () => {
  await closePdfPool();
  await t.close();
});

describe('GET /api/lessons/:id/pack.pdf (demo lesson 2, with a shortfall)', () => {
  it('downloads as a PDF named class-date-unit-lesson', async () => {
    const res = await download(teacher, `/api/lessons/${lessonId}/pack.pdf`);
    assert.equal(res.headers['content-type'], 'application/pdf');
    // The file name the issue gives as the example.
    assert.equal(
      res.headers['content-disposition'],
      'attachment; filename="4K-2026-07-28-rescue-rovers-lesson-2.pdf"',
    );
    assert.equal((res.body as Buffer).subarray(0, 5).toString(), '%PDF-');
  });

  it('is on A4: 595.28 × 841.89 pt on every page (ISO 216: 210 × 297 mm)', () => {
    for (const p of pack.pages) {
      assert.ok(
        Math.abs(p.width - 595.28) < 0.01 && Math.abs(p.height - 841.89) < 0.01,
        `${p.width} × ${p.height}`,
      );
    }
  });

  it('has the pages its sections imply: 2 cover, checklist, one per group, trays, devices, 2 pack-away, cautions', () => {
    const n = plan.groups.length;
    assert.equal(n, 9, 'the demo lesson 2 has nine groups of three');
    assert.equal(pack.pages.length, n + 8);
    const expected = [
      'Pack-away starts at',
      'Outcomes and relief notes',
      'Prep checklist',
      ...plan.groups.map((g) => `Group ${g.number} pull sheet`),
      'Class tray and spares tray',
      'Device pairing',
      'Pack-away',
      'Missing-parts log',
      'Cautions',
    ];
    expected.forEach((heading, i) => {
      // Line 1 is the page header; the section's title is the first line of the page body.
      const lines = pack.pages[i]!.text.split('\n');
      const where = i === 0 ? lines.join('\n') : lines[1]!;
      assert.ok(
        where.includes(heading),
        `page ${i + 1} should start "${heading}", has "${lines[1]}"`,
      );
    });
  });

  it('prints "Page N of M", the product, the lesson and the school-time generation stamp on every page', () => {
    const m = pack.pages.length;
    // Today in the school's zone, from Intl's copy of the IANA database (independent of Luxon).
    const parts = new Intl.DateTimeFormat('en-AU', {
      timeZone: 'Australia/Adelaide',
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      year: 'numeric',
      timeZoneName: 'short',
    }).formatToParts(new Date());
    const part = (type: string) => parts.find((p) => p.type === type)!.value;
    const today = `${part('weekday')} ${part('day')} ${part('month')} ${part('year')}`;
    pack.pages.forEach((p, i) => {
      assert.ok(p.text.includes(`Page ${i + 1} of ${m}`), `page ${i + 1}`);
      const lines = p.text.split('\n');
      assert.match(lines[0]!, /^Trayplan Lesson 2 of 8: Drive straight: everyone codes$/);
      assert.ok(lines.at(-1)!.startsWith(`Generated ${today}, `), lines.at(-1));
      assert.ok(lines.at(-1)!.includes(` ${part('timeZoneName')} `), lines.at(-1));
    });
  });

  it('embeds its fonts (Source Sans 3 and Noto Sans Symbols 2), none missing', () => {
    assert.deepEqual(pack.missing, []);
    const names = [...pack.embeddedFonts].map((f) => f.replace(/^[A-Z]{6}\+/, '')).sort();
    assert.deepEqual(names, [
      'NotoSansSymbols2-Regular',
      'SourceSans3-Bold',
      'SourceSans3-Italic',
      'SourceSans3-Regular',
    ]);
    // Embedded TrueType font programs (PDF 32000-1, 9.9: /FontFile2), one per font.
    const fontFiles = packBytes.toString('latin1').match(/\/FontFile2 /g) ?? [];
    assert.equal(fontFiles.length, 4);
  });

  it('prints every group’s quantities exactly as the prep plan has them', () => {
    for (const group of plan.groups) {
      const page = pack.pages[2 + group.number]!;
      assert.ok(page.text.includes(`Group ${group.number} pull sheet`));
      const head = (s: string) => page.items.find((i) => i.str === s && i.font.includes('Bold'))!;
      const [tray, qtyHead] = [head('Compartment'), head('Qty')];
      const codes = page.items.filter((i) => /^RB-\d{3}$/.test(i.str) && i.x < tray.x);
      assert.deepEqual(
        codes.map((c) => c.str),
        group.lines.map((l) => l.partCode),
        `group ${group.number}: lines in order`,
      );
      for (const line of group.lines) {
        const code = codes.find((c) => c.str === line.partCode)!;
        // The Qty column is right-aligned: the value ends where its header ends.
        const qty = page.items.find(
          (i) =>
            Math.abs(i.y - code.y) < 4 &&
            Math.abs(i.x + i.width - (qtyHead.x + qtyHead.width)) < 1.5,
        );
        assert.ok(qty, `group ${group.number} ${line.partCode}: a quantity`);
        const expected =
          line.allocated === line.needed
            ? String(line.allocated)
            : `${line.allocated} of ${line.needed}`;
        assert.equal(qty.str, expected, `group ${group.number} ${line.partCode}`);
      }
      assert.ok(page.text.includes(`${group.pieces} pieces`));
      for (const c of group.consumables)
        assert.ok(page.text.includes(`${c.qty} × ${c.name}`), c.name);
    }
  });

  it('gives each part line an Out and a Back tick box, printed as boxes in the symbol font', () => {
    const group = plan.groups[0]!;
    const page = pack.pages[3]!;
    const boxes = page.items.filter((i) => i.str === '\u2610');
    assert.ok(boxes.every((b) => b.font.endsWith('NotoSansSymbols2-Regular')));
    // Two per part line, one per consumable, one per borrowed line to return.
    const borrows = plan.borrows.filter((b) => b.group === group.number).length;
    assert.equal(boxes.length, 2 * group.lines.length + group.consumables.length + borrows);
  });

  it('warns of the shortfall on the cover and on the short groups’ sheets, not on the others', () => {
    const cover = pack.pages[0]!.text.replace(/\n/g, ' ');
    assert.ok(cover.includes('Not enough parts'));
    const short = [...new Set(plan.shortfalls.map((s) => s.group))];
    assert.deepEqual(short, [8, 9], 'the demo lesson 2 is short for groups 8 and 9');
    // Groups short of the same parts share one sentence on the cover.
    assert.ok(cover.includes('Groups 8 and 9 are each short of'), cover);
    for (const s of plan.shortfalls) {
      // The plan's message names the missing count and part: "… short of 2 × Drive motor (…".
      const what = /short of (\d+ × .+?) \(/.exec(s.message)![1]!;
      assert.ok(cover.includes(what), what);
      const sheet = pack.pages[2 + s.group!]!.text.replace(/\n/g, ' ');
      assert.ok(sheet.includes(`Group ${s.group} is short of parts`));
      assert.ok(sheet.includes(what), `group ${s.group}'s sheet: ${what}`);
      assert.ok(sheet.includes('controller none (short)'));
    }
    for (const g of [1, 2, 3, 4, 5, 6, 7])
      assert.ok(!pack.pages[2 + g]!.text.includes('short of parts'), `group ${g}`);
  });

  it('makes the pack-away start prominent on the cover and prints the timeline with clock times', () => {
    const cover = pack.pages[0]!;
    const start = clock12(plan.timeline.packAwayStartsAt);
    const banner = cover.items.find((i) => i.str === `Pack-away starts at ${start}`);
    assert.ok(banner, 'the banner');
    assert.ok(banner.font.includes('Bold'));
    // Larger than any other text of the page but the lesson's title.
    const others = cover.items.filter((i) => i !== banner && !i.str.includes('Drive straight'));
    assert.ok(
      others.every((i) => i.size < banner.size),
      'the largest text after the title',
    );
    for (const seg of plan.timeline.segments) {
      assert.ok(cover.text.includes(`${clock12(seg.startsAt)} ${seg.label}`), seg.label);
    }
  });

  it('prints the Markdown with its structure: bold runs in the bold face, one line per criterion', () => {
    const cover = pack.pages[0]!;
    // "We are learning to **write a sequence of steps** …" (the seed's learning intention).
    const strong = cover.items.find((i) => i.str.includes('write a sequence of steps'))!;
    assert.ok(strong.font.endsWith('SourceSans3-Bold'), strong.font);
    const lead = cover.items.find((i) => i.str.startsWith('We are learning to'))!;
    assert.ok(lead.font.endsWith('SourceSans3-Regular'));
    const ys = ['I can put drive', 'I can change one number', 'I can measure how far'].map(
      (s) => cover.items.find((i) => i.str.startsWith(s))!.y,
    );
    assert.ok(ys[0]! > ys[1]! && ys[1]! > ys[2]!, 'each list item on a line of its own, in order');
    const outcomes = pack.pages[1]!.text;
    for (const code of ['KRDT-4.1', 'KRDT-4.3', 'KRDT-4.4', 'KRDT-4.5', 'KRDT-4.6'])
      assert.ok(outcomes.includes(code), code);
    assert.ok(outcomes.includes('Tape a start line for each group'), 'relief notes');
  });

  it('prints the cautions, deferring to the school’s policies and local regulations', () => {
    const text = pack.pages.at(-1)!.text.replace(/\n/g, ' ');
    for (const heading of [
      'Small parts',
      'Batteries and charging',
      'Devices that overheat',
      'Chargers and power boards',
      'Walkways',
    ]) {
      assert.ok(text.includes(heading), heading);
    }
    assert.match(text, /choking hazard/);
    assert.match(text, /hard surface that does not burn/);
    assert.match(text, /unattended or overnight unless your school’s policy allows it/);
    assert.match(text, /swollen, hot/);
    // About a quarter of an hour to cool: common practice, no published source.
    assert.match(text, /about fifteen minutes/);
    assert.match(text, /testing and tagging/);
    assert.match(text, /walkways/);
    assert.match(text, /school’s policies and local regulations come first/);
  });

  it('lists the return map and counts back into each tub what left it', () => {
    const page = pack.pages[plan.groups.length + 5]!;
    for (const b of plan.borrows) assert.ok(page.text.includes(b.message), b.message);
    // Tub 1 gave every part of groups 1 and 8 (its home groups) except what group 8 could not get.
    const tub1 = page.items.find((i) => i.str === 'Tub 1')!;
    const pin = page.items.find((i) => i.str === 'RB-027' && i.y < tub1.y)!;
    const cell = page.items.find(
      (i) => Math.abs(i.y - pin.y) < 4 && Math.abs(i.x - tub1.x) < 12 && /^\d+$/.test(i.str),
    )!;
    const expected = [
      ...plan.groups,
      { lines: plan.classTray.lines },
      { lines: plan.sparesTray.lines },
    ]
      .flatMap((g) => g.lines)
      .filter((l) => l.partCode === 'RB-027')
      .flatMap((l) => l.sources)
      .filter((s) => s.tub === 'Tub 1')
      .reduce((n, s) => n + s.qty, 0);
    assert.equal(Number(cell.str), expected);
  });
});

describe('the pack follows the school and the lesson as stored', () => {
  it('prints on US Letter, 612 × 792 pt (ANSI/ASME Y14.1: 8.5 × 11 in), when the school uses Letter', async () => {
    const db = t.database.db;
    await db
      .update(schools)
      .set({ paperSize: 'Letter' })
      .where(eq(schools.name, 'Kestrel Ridge Primary School'));
    try {
      const res = await download(teacher, `/api/lessons/${lessonId}/pack.pdf`);
      const letter = await readPdf(res.body as Buffer);
      assert.equal(letter.pages.length, plan.groups.length + 8);
      for (const p of letter.pages) assert.deepEqual([p.width, p.height], [612, 792]);
      letter.pages.forEach((p, i) =>
        assert.ok(p.text.includes(`Page ${i + 1} of ${letter.pages.length}`)),
      );
    } finally {
      await db
        .update(schools)
        .set({ paperSize: 'A4' })
        .where(eq(schools.name, 'Kestrel Ridge Primary School'));
    }
  });

  it('is made fresh on each request: a renamed lesson prints its new title', async () => {
    const db = t.database.db;
    const [before] = await db.select().from(lessons).where(eq(lessons.id, lessonId));
    await db
      .update(lessons)
      .set({ title: 'Drive straight, take two' })
      .where(eq(lessons.id, lessonId));
    try {
      const fresh = await readPdf(
        (await download(teacher, `/api/lessons/${lessonId}/pack.pdf`)).body as Buffer,
      );
      assert.ok(fresh.pages[0]!.text.includes('Drive straight, take two'));
      assert.match(
        fresh.pages[5]!.text.split('\n')[0]!,
        /Lesson 2 of 8: Drive straight, take two$/,
      );
    } finally {
      await db.update(lessons).set({ title: before!.title }).where(eq(lessons.id, lessonId));
    }
  });
});

describe('lesson numbers in packs', () => {
  it('numbers a lesson by its place in the unit, whatever its stored position (gaps, 1-based)', async () => {
    const db = t.database.db;
    const [demo] = await db.select().from(lessons).where(eq(lessons.id, lessonId));
    const unit = await insertUnit(db, {
      schoolId: demo!.schoolId,
      ownerId: (await userByEmail(db, 'teacher@kestrel-ridge.example')).id,
      title: 'Numbering check',
      yearLevel: 4,
    });
    const base = {
      unitId: unit,
      schoolId: demo!.schoolId,
      classId: demo!.classId,
      kitTypeId: demo!.kitTypeId,
      startsAt: demo!.startsAt,
      endsAt: demo!.endsAt,
      groupSize: 3,
    };
    // Positions as the API gives them (from 1) with a gap where a lesson was deleted.
    await insertLesson(db, { ...base, title: 'First of two', position: 1 });
    const second = await insertLesson(db, { ...base, title: 'Second of two', position: 3 });
    const res = await download(teacher, `/api/lessons/${second}/pack.pdf`);
    assert.equal(res.status, 200);
    const text = (await readPdf(res.body as Buffer)).pages.map((p) => p.text).join('\n');
    assert.ok(text.includes('Lesson 2 of 2'), 'numbered 2 of 2');
    assert.ok(!/Lesson (3|4) of/.test(text), 'never past the count');
  });
});

describe('GET /api/units/:id/pack.pdf', () => {
  it('prints the unit overview, then every lesson’s pack with its own header, numbered as one file', async () => {
    const res = await download(teacher, `/api/units/${unitId}/pack.pdf`);
    assert.equal(res.status, 200);
    assert.equal(
      res.headers['content-disposition'],
      'attachment; filename="4K-rescue-rovers-unit-pack.pdf"',
    );
    const unitPack = await readPdf(res.body as Buffer);
    const ids = await t.database.db
      .select({ id: lessons.id, title: lessons.title })
      .from(lessons)
      .where(eq(lessons.unitId, unitId))
      .orderBy(asc(lessons.position));
    const plans = await Promise.all(
      ids.map(async (l) => (await teacher.get(`/api/lessons/${l.id}/prep`)).body as PrepPlan),
    );
    const overview = unitPack.pages[0]!.text;
    assert.ok(overview.includes('UNIT PACK') && overview.includes('Rescue Rovers'));
    for (const l of ids) assert.ok(overview.replace(/\n/g, ' ').includes(l.title), l.title);
    for (const code of ['KRDT-4.1', 'KRDT-4.6']) assert.ok(overview.includes(code));
    // One overview page, then each lesson's n + 8 pages.
    const total = 1 + plans.reduce((n, p) => n + p.groups.length + 8, 0);
    assert.equal(unitPack.pages.length, total);
    let page = 1;
    ids.forEach((l, i) => {
      const header = unitPack.pages[page]!.text.split('\n')[0]!;
      assert.equal(header, `Trayplan Lesson ${i + 1} of 8: ${l.title}`);
      page += plans[i]!.groups.length + 8;
    });
    unitPack.pages.forEach((p, i) => {
      assert.ok(p.text.includes(`Page ${i + 1} of ${total}`), `page ${i + 1}`);
      assert.ok(Math.abs(p.width - 595.28) < 0.01, 'A4 (ISO 216)');
    });
  });
});
