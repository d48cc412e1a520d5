/**
 * The printables' pure parts, without a database: Markdown printed with its CommonMark
 * structure, download file names, VTIMEZONE offsets against the IANA database (read through
 * Intl, independently of the Luxon code under test), and the PREP-RULES.md worked example
 * printed as a lesson pack, byte for byte the same each time it is rendered.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { markdownToContent } from '../../server/pdf/markdown.js';
import type { Content, ContentNode } from '../../server/pdf/content.js';
import { attachment, lessonFileStem, slug, unitFileStem } from '../../server/downloads.js';
import { formatOffset, offsetChanges, vtimezone } from '../../server/calendar/vtimezone.js';
import { renderPdf } from '../../server/pdf/document.js';
import type { LessonPackModel, RenderJob } from '../../server/pdf/model.js';
import { computePrepPlan } from '../../shared/prep/index.js';
import { workedExample } from '../shared/prep-fixtures.js';

/** The plain text of pdfmake runs, with each run's bold/italics flags. */
function runs(content: Content): { text: string; bold: boolean; italics: boolean }[] {
  if (typeof content === 'string') return [{ text: content, bold: false, italics: false }];
  if (Array.isArray(content)) return content.flatMap(runs);
  const node = content as ContentNode & { text?: Content };
  if (typeof node.text === 'string')
    return [{ text: node.text, bold: node.bold === true, italics: node.italics === true }];
  if (node.text !== undefined) {
    return runs(node.text).map((r) => ({
      ...r,
      bold: r.bold || node.bold === true,
      italics: r.italics || node.italics === true,
    }));
  }
  return [];
}
const plain = (content: Content) =>
  runs(content)
    .map((r) => r.text)
    .join('');

describe('Markdown printed with its structure (CommonMark 0.31.2)', () => {
  it('prints emphasis in italics and strong emphasis in bold (6.2)', () => {
    const [p] = markdownToContent('*foo bar* and **baz**');
    const r = runs(p!);
    assert.deepEqual(
      r.find((x) => x.text === 'foo bar'),
      { text: 'foo bar', bold: false, italics: true },
    );
    assert.deepEqual(
      r.find((x) => x.text === 'baz'),
      { text: 'baz', bold: true, italics: false },
    );
  });

  it('prints an ATX heading in bold, larger than the text (4.2)', () => {
    const [h, p] = markdownToContent('# foo\n\nbar') as ContentNode[];
    assert.equal(plain(h!), 'foo');
    assert.equal(h!.bold, true);
    assert.ok((h!.fontSize as number) > 11);
    assert.equal(plain(p!), 'bar');
  });

  it('keeps an ordered list’s start number (5.3) and nests a sub-list under its item (5.2)', () => {
    const [ol] = markdownToContent('3. foo\n4. bar\n   - baz') as ContentNode[];
    assert.equal(ol!.start, 3);
    const items = ol!.ol as Content[];
    assert.equal(items.length, 2);
    assert.equal(plain(items[0]!), 'foo');
    const second = items[1] as ContentNode;
    const inner = (second.stack as ContentNode[]).find((n) => 'ul' in n)!;
    assert.deepEqual((inner.ul as Content[]).map(plain), ['baz']);
  });

  it('prints a soft line break as a space (6.7) and a hard one as a new line (6.6)', () => {
    assert.equal(plain(markdownToContent('foo\nbaz')[0]!), 'foo baz');
    assert.equal(plain(markdownToContent('foo  \nbaz')[0]!), 'foo\nbaz');
    assert.equal(plain(markdownToContent('foo\\\nbaz')[0]!), 'foo\nbaz');
  });

  it('decodes entity and numeric character references; code point 0 becomes U+FFFD (2.5)', () => {
    assert.equal(plain(markdownToContent('&amp; &copy; &#35; &#x22; &#0;')[0]!), '& © # " \ufffd');
  });

  it('prints a link as its text followed by its address (6.3), an image as its description (6.4)', () => {
    assert.equal(plain(markdownToContent('[link](/uri "title")')[0]!), 'link (/uri)');
    assert.equal(plain(markdownToContent('<https://example.com/x>')[0]!), 'https://example.com/x');
    assert.equal(plain(markdownToContent('![a tub](/tub.png)')[0]!), '[picture: a tub]');
  });

  it('prints backslash escapes literally (2.4) and raw HTML as its text (6.10)', () => {
    assert.equal(plain(markdownToContent('\\*not emphasised\\*')[0]!), '*not emphasised*');
    assert.equal(plain(markdownToContent('a <b>bold</b> word')[0]!), 'a bold word');
  });

  it('prints task list items (a GitHub Flavored Markdown extension) with their own boxes', () => {
    const [list] = markdownToContent('- [ ] pull parts\n- [x] charge') as ContentNode[];
    const items = list!.stack as ContentNode[];
    const boxes = items.map((i) => plain((i.columns as Content[])[0]!));
    assert.deepEqual(boxes, ['\u2610', '\u2611']);
  });

  it('gives nothing for blank input', () => {
    assert.deepEqual(markdownToContent('  \n\n'), []);
  });
});

describe('download names', () => {
  it('names a lesson file class-date-unit-lesson N, as in the issue’s example', () => {
    const stem = lessonFileStem({
      className: '4K',
      startsAt: '2026-07-28T11:10',
      unitTitle: 'Rescue Rovers',
      number: 3,
    });
    assert.equal(`${stem}.pdf`, '4K-2026-07-28-rescue-rovers-lesson-3.pdf');
  });

  it('makes ASCII slugs, keeps a unit’s one class and quotes safely', () => {
    assert.equal(slug('Rescue Rovers (4M)'), 'rescue-rovers-4m');
    assert.equal(slug('Crème brûlée: part 2'), 'creme-brulee-part-2');
    assert.equal(slug('¿?'), 'untitled');
    assert.equal(unitFileStem('Rescue Rovers', ['4K', '4K']), '4K-rescue-rovers');
    assert.equal(unitFileStem('Rescue Rovers', ['4K', '4M']), 'rescue-rovers');
    assert.equal(attachment('a"b.pdf'), 'attachment; filename="ab.pdf"');
  });
});

/** The UTC offset (minutes) at an instant, from Intl's copy of the IANA database. */
function intlOffset(zone: string, ms: number): number {
  const name = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'longOffset' })
    .formatToParts(ms)
    .find((p) => p.type === 'timeZoneName')!.value;
  const m = /GMT([+-])(\d\d):(\d\d)/.exec(name);
  return m ? (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3])) : 0;
}

describe('VTIMEZONE from the IANA time zone database', () => {
  it('finds Adelaide’s 2026 changes: back to +09:30 on 5 April, forward to +10:30 on 4 October', () => {
    const changes = offsetChanges(
      'Australia/Adelaide',
      Date.parse('2026-01-01T00:00Z'),
      Date.parse('2027-01-01T00:00Z'),
    );
    // South Australia: daylight time ends 03:00 ACDT on the first Sunday of April (16:30 UTC the
    // Saturday) and begins 02:00 ACST on the first Sunday of October (IANA tz database).
    assert.deepEqual(
      changes.map((c) => new Date(c).toISOString()),
      ['2026-04-04T16:30:00.000Z', '2026-10-03T16:30:00.000Z'],
    );
    for (const c of changes) {
      assert.notEqual(
        intlOffset('Australia/Adelaide', c - 60_000),
        intlOffset('Australia/Adelaide', c),
      );
    }
    assert.equal(intlOffset('Australia/Adelaide', Date.parse('2026-07-28T02:00Z')), 570);
    assert.equal(intlOffset('Australia/Adelaide', Date.parse('2026-01-15T02:00Z')), 630);
  });

  it('finds New York’s 2026 changes: second Sunday of March, first Sunday of November', () => {
    const changes = offsetChanges(
      'America/New_York',
      Date.parse('2026-01-01T00:00Z'),
      Date.parse('2027-01-01T00:00Z'),
    );
    // US rules since 2007 (Energy Policy Act of 2005): 2:00 local on those Sundays.
    assert.deepEqual(
      changes.map((c) => new Date(c).toISOString()),
      ['2026-03-08T07:00:00.000Z', '2026-11-01T06:00:00.000Z'],
    );
  });

  it('writes onsets in the local time before the change, with the offsets either side', () => {
    const text = vtimezone(
      'Australia/Adelaide',
      Date.parse('2026-07-01T00:00Z'),
      Date.parse('2026-08-01T00:00Z'),
    );
    assert.match(
      text,
      /BEGIN:DAYLIGHT\r\nDTSTART:20261004T020000\r\nTZOFFSETFROM:\+0930\r\nTZOFFSETTO:\+1030\r\n/,
    );
    assert.match(
      text,
      /BEGIN:STANDARD\r\nDTSTART:20260405T030000\r\nTZOFFSETFROM:\+1030\r\nTZOFFSETTO:\+0930\r\n/,
    );
    assert.ok(
      text.startsWith('BEGIN:VTIMEZONE\r\nTZID:Australia/Adelaide\r\n') &&
        text.endsWith('END:VTIMEZONE'),
    );
    // A zone without daylight time has a single STANDARD component (Queensland: UTC+10).
    const brisbane = vtimezone(
      'Australia/Brisbane',
      Date.parse('2026-07-01T00:00Z'),
      Date.parse('2026-08-01T00:00Z'),
    );
    assert.equal(brisbane.match(/BEGIN:(STANDARD|DAYLIGHT)/g)!.length, 1);
    assert.match(brisbane, /TZOFFSETTO:\+1000/);
    assert.deepEqual(
      [formatOffset(570), formatOffset(-300), formatOffset(0)],
      ['+0930', '-0500', '+0000'],
    );
  });
});

describe('the PREP-RULES.md worked example as a lesson pack (no database)', () => {
  const input = workedExample();
  const plan = computePrepPlan(input);
  const lesson: LessonPackModel = {
    id: '00000000-0000-4000-8000-000000000001',
    number: 1,
    lessonCount: 1,
    title: 'Worked example',
    unitTitle: 'Example unit',
    className: 'WX',
    studentCount: input.class.studentCount,
    devices: input.class.devices,
    startsAt: input.lesson.startsAt,
    endsAt: input.lesson.endsAt,
    periodName: null,
    room: '',
    teachers: ['A. Teacher'],
    reliefTeacher: null,
    kitTypeName: 'Example kit',
    learningIntention: 'We are learning to **build**.',
    successCriteria: '- I can build.',
    reliefNotes: '',
    outcomes: [],
    parts: input.parts.map((p) => ({
      code: p.code,
      name: p.name,
      colour: null,
      compartment: null,
      category: p.category,
      small: p.small,
      rechargeable: p.fullChargeMinutes != null,
    })),
    tubs: input.tubs.map((t) => ({ label: t.label, controllerLabel: null, status: t.status })),
    usedUpParts: [],
    plan,
    problems: [],
  };
  const job = (generatedAt: string): RenderJob => ({
    kind: 'lesson-pack',
    print: {
      paper: 'A4',
      timezone: 'Australia/Adelaide',
      schoolName: 'Example school',
      generatedAt,
    },
    lesson,
  });

  it('prints the worked example’s figures: 4 groups, its shortfalls, pack-away at 11:54, charge by 7:55', async () => {
    const bytes = await renderPdf(job('2026-07-27T08:00:00.000Z'));
    const doc = await getDocument({ data: bytes.slice() }).promise;
    const pages: string[] = [];
    for (let n = 1; n <= doc.numPages; n++) {
      const content = await (await doc.getPage(n)).getTextContent();
      pages.push(
        content.items
          .map((i) => ('str' in i ? i.str : ''))
          .join(' ')
          .replace(/\s+/g, ' '),
      );
    }
    await doc.destroy();
    // PREP-RULES.md, worked example: groups of 3, 3, 2, 2.
    assert.equal(pages.length, 4 + 8);
    assert.ok(pages[0]!.includes('Pack-away starts at 11:54 am'));
    assert.ok(pages[0]!.includes('Group 2 is short of 1 × Motor.'));
    assert.ok(pages[0]!.includes('Group 4 is short of 1 × Controller and 2 × Motor.'));
    // Planned 51 of 50 minutes: overrun by 1, and the plan's own warning printed.
    assert.ok(pages[0]!.includes('Planned 51 of 50 minutes: 1 over.'));
    assert.ok(pages[0]!.includes(plan.warnings.find((w) => w.code === 'overrun')!.message));
    assert.ok(pages[2]!.includes('7:55 am'), 'charge 3 × Controller, start by 07:55');
    assert.ok(pages[2]!.includes('11:00 am'), 'pull, start by 11:00');
    assert.ok(pages[2]!.includes('11:06 am'), 'devices, start by 11:06');
    // Group 3 borrows 2 Pin from Tub 2; the return map sends them back.
    assert.ok(pages[5]!.includes('Tub 2: 2 borrowed, back to Tub 2'));
    const packAway = pages[4 + 5]!;
    assert.ok(
      packAway.includes('Return map') && packAway.includes('Group 3: return 2 × Pin to Tub 2.'),
      packAway,
    );
    for (let i = 0; i < pages.length; i++)
      assert.ok(pages[i]!.includes(`Page ${i + 1} of ${pages.length}`));
    assert.ok(
      pages[0]!.includes('Generated Mon 27 Jul 2026, 5:30 pm ACST'),
      '08:00 UTC is 17:30 in Adelaide in July',
    );
  });

  it('renders the same job to the same bytes, and only the stamp differs for another time', async () => {
    const a = Buffer.from(await renderPdf(job('2026-07-27T08:00:00.000Z')));
    const b = Buffer.from(await renderPdf(job('2026-07-27T08:00:00.000Z')));
    assert.equal(Buffer.compare(a, b), 0);
    const c = Buffer.from(await renderPdf(job('2026-07-27T09:00:00.000Z')));
    assert.notEqual(Buffer.compare(a, c), 0);
  });
});
