import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { ADMIN, TEACHER } from '../support/planning.js';
import { parts } from '../../server/db/schema/index.js';
import { readPartsCsv, writePartsCsv } from '../../server/csv/index.js';
import { MAX_LISTED_PROBLEMS } from '../../server/csv/parts-reader.js';
import { SINGLE_LINE_MESSAGE } from '../../shared/schemas/text.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const BOM = '\uFEFF';

async function newKit(b: Browser, name: string): Promise<string> {
  const res = await b.post('/api/kit-types', { name });
  assert.equal(res.status, 201, res.text);
  return res.body.kitType.id;
}

async function importCsv(
  b: Browser,
  kitId: string,
  body: string | Buffer,
  filename = 'parts.csv',
  type = 'text/csv',
) {
  await b.ensureCsrf();
  const bytes = typeof body === 'string' ? Buffer.from(body, 'utf8') : body;
  return b.agent
    .post(`/api/kit-types/${kitId}/parts/import`)
    .set('X-XSRF-TOKEN', b.csrf)
    .attach('file', bytes, { filename, contentType: type });
}

const partsOf = async (b: Browser, kitId: string) =>
  (await b.get(`/api/kit-types/${kitId}`)).body.kitType.parts.map(
    ({ id: _id, hasPhoto: _p, ...p }: Record<string, unknown>) => p,
  );

describe('reading the parts-list CSV: RFC 4180 §2', () => {
  const read = async (text: string) => {
    const result = await readPartsCsv(text);
    assert.deepEqual(result.errors, []);
    return result.parts;
  };

  it('rule 1: records end with CRLF; rule 2: the last record may have none', async () => {
    const list = await read('code,name,qty\r\nA,Axle,2\r\nB,Spacer ring,3');
    assert.deepEqual(
      list.map((p) => [p.code, p.name, p.qty]),
      [
        ['A', 'Axle', 2],
        ['B', 'Spacer ring', 3],
      ],
    );
  });

  it('LF line ends are read the same (common practice, no published source: files saved on Unix-like systems)', async () => {
    assert.deepEqual(
      await read('code,name,qty\nA,Axle,2\nB,Spacer ring,3\n'),
      await read('code,name,qty\r\nA,Axle,2\r\nB,Spacer ring,3\r\n'),
    );
  });

  it('rule 6: a field holding a comma is enclosed in double quotes', async () => {
    assert.equal((await read('code,name,qty\r\nA,"Strut, 96 mm",4\r\n'))[0]!.name, 'Strut, 96 mm');
  });

  it('rule 7: a double quote inside a quoted field is doubled', async () => {
    assert.equal(
      (await read('code,name,qty\r\nA,"Plate ""wide"" 2x4",4\r\n'))[0]!.name,
      'Plate "wide" 2x4',
    );
  });

  it('rule 6: a field holding line breaks is enclosed in quotes; the line numbers of later rows stay right', async () => {
    const text = 'code,name,qty\r\nA,"Two\r\nlines",1\r\nB,"Three\nshort\nlines",x\r\n';
    // Read as one field of one record (RFC 4180), then refused: a part name is one line
    // (shared/schemas/text.ts singleLine), reported on the line where the record starts.
    const one = await readPartsCsv('code,name,qty\r\nA,"Two\r\nlines",1\r\n');
    assert.deepEqual(
      one.errors.map((e) => [e.line, e.column, e.message]),
      [[2, 'name', SINGLE_LINE_MESSAGE]],
    );
    const bad = await readPartsCsv(text);
    // Line 1 header, lines 2–3 part A, part B starts on line 4.
    assert.deepEqual(
      bad.errors.map((e) => [e.line, e.column]),
      [
        [2, 'name'],
        [4, 'qty'],
        [4, 'name'],
      ],
    );
  });

  it('rule 3: the header names the columns; here in any order and any capitals (API.md)', async () => {
    const list = await read(
      'QTY,Small,Name,CODE,Charge_Minutes,category,Colour,compartment\r\n2,yes,Hub,H1,180,Controller,blue,B2\r\n',
    );
    assert.deepEqual(list, [
      {
        code: 'H1',
        name: 'Hub',
        colour: 'blue',
        category: 'controller',
        qty: 2,
        compartment: 'B2',
        small: true,
        chargeMinutes: 180,
      },
    ]);
  });

  it('rule 5: fields may be quoted or not, with the same value', async () => {
    assert.deepEqual(
      await read('"code","name","qty"\r\n"A","Axle","2"\r\n'),
      await read('code,name,qty\r\nA,Axle,2\r\n'),
    );
  });

  it('a UTF-8 byte-order mark (EF BB BF, RFC 3629 §6) before the header is ignored', async () => {
    assert.deepEqual(
      await read(`${BOM}code,name,qty\r\nA,Axle,2\r\n`),
      await read('code,name,qty\r\nA,Axle,2\r\n'),
    );
  });

  it('small is yes/no, true/false, 1/0 or empty; empty charge_minutes is not rechargeable (API.md)', async () => {
    const list = await read(
      'code,name,qty,small,charge_minutes\n' +
        ['a,yes', 'b,No', 'c,TRUE', 'd,false', 'e,1', 'f,0', 'g,']
          .map((x) => `${x.split(',')[0]},n,1,${x.split(',')[1]},`)
          .join('\n'),
    );
    assert.deepEqual(
      list.map((p) => p.small),
      [true, false, true, false, true, false, false],
    );
    assert.ok(list.every((p) => p.chargeMinutes === null));
    assert.equal(
      (await read('code,name,qty\nA,n,1\n'))[0]!.category,
      'other',
      'no category column: other',
    );
  });

  it('every bad row is reported with its line and column, and no parts are returned', async () => {
    const text = [
      'code,name,qty,category,small,charge_minutes,shelf',
      'A,Axle,2,axle,no,,',
      'A,Again,1,axle,,,',
      'B,Bush,-3,motors,maybe,,',
      'C,Cog,2.5,gear,,90.5,',
      ',,,,,,',
      'D,,7,gear,,0,',
    ].join('\r\n');
    const result = await readPartsCsv(text);
    assert.deepEqual(result.parts, []);
    assert.deepEqual(
      result.errors.map((e) => [e.line, e.column]),
      [
        [1, 'shelf'],
        [3, 'code'],
        [4, 'qty'],
        [4, 'category'],
        [4, 'small'],
        [5, 'qty'],
        [5, 'charge_minutes'],
        [7, 'name'],
        [7, 'charge_minutes'],
      ],
    );
    assert.ok(result.errors.every((e) => e.path === '' && e.message.length > 0));
    assert.match(result.errors[1]!.message, /already used on line 2/);
    assert.match(result.errors[2]!.message, /negative/);
    assert.match(result.errors[5]!.message, /whole number/);
  });

  it('a required column missing is one problem on the header', async () => {
    const result = await readPartsCsv('code,name\r\nA,Axle\r\n');
    assert.deepEqual(
      result.errors.map((e) => [e.line, e.column]),
      [[1, 'qty']],
    );
  });
});

describe('writing the parts-list CSV', () => {
  const list = [
    {
      code: 'W-1',
      name: 'Wheel, "large"',
      colour: 'black',
      category: 'wheel' as const,
      qty: 4,
      compartment: 'C1',
      small: false,
      chargeMinutes: null,
    },
    {
      code: 'W-2',
      name: 'Cable\nwith a break',
      colour: null,
      category: 'cable' as const,
      qty: 2,
      compartment: null,
      small: true,
      chargeMinutes: 45,
    },
    {
      code: '-W3',
      name: '=HYPERLINK("x")',
      colour: '@red',
      category: 'other' as const,
      qty: 1,
      compartment: "'=A1",
      small: false,
      chargeMinutes: null,
    },
  ];

  it('writes RFC 4180 §2 records (CRLF, quotes doubled), read back the same by csv-parse', async () => {
    const text = writePartsCsv(list);
    assert.ok(text.startsWith(BOM));
    assert.ok(text.includes('\r\nW-1,"Wheel, ""large""",black,wheel,4,C1,no,\r\n'));
    const rows = parse(text, { bom: true }) as string[][];
    assert.deepEqual(rows[0], [
      'code',
      'name',
      'colour',
      'category',
      'qty',
      'compartment',
      'small',
      'charge_minutes',
    ]);
    assert.deepEqual(rows[2], ['W-2', 'Cable\nwith a break', '', 'cable', '2', '', 'yes', '45']);
  });

  it('puts an apostrophe before text a spreadsheet would run as a formula (OWASP, "CSV Injection")', async () => {
    const rows = parse(writePartsCsv(list), { bom: true }) as string[][];
    assert.deepEqual(rows[3]!.slice(0, 6), [
      "'-W3",
      `'=HYPERLINK("x")`,
      "'@red",
      'other',
      '1',
      "''=A1",
    ]);
  });

  it('reads back exactly what it wrote (names of one line)', async () => {
    const oneLine = list.map((p) => ({ ...p, name: p.name.replace(/\n/g, ' ') }));
    assert.deepEqual(await readPartsCsv(writePartsCsv(oneLine)), {
      parts: oneLine,
      errors: [],
      problemCount: 0,
      problemLines: 0,
    });
  });
});

describe('POST /api/kit-types/:id/parts/import', () => {
  it('imports a file, replacing the list in one go (200 { imported })', async () => {
    const teacher = await signedIn(t.app, TEACHER);
    const kit = await newKit(teacher, 'Import Kit');
    const text = `${BOM}code,name,colour,category,qty,compartment,small,charge_minutes\r\nIM-1,"Hub, smart",white,controller,1,A,no,150\r\nIM-2,Peg,red,connector,30,B,yes,\r\n`;
    const res = await importCsv(teacher, kit, text);
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(res.body, { imported: 2 });
    assert.deepEqual(await partsOf(teacher, kit), [
      {
        code: 'IM-1',
        name: 'Hub, smart',
        colour: 'white',
        category: 'controller',
        qty: 1,
        compartment: 'A',
        small: false,
        chargeMinutes: 150,
      },
      {
        code: 'IM-2',
        name: 'Peg',
        colour: 'red',
        category: 'connector',
        qty: 30,
        compartment: 'B',
        small: true,
        chargeMinutes: null,
      },
    ]);
    const again = await importCsv(teacher, kit, 'code,name,qty\nIM-3,Gear,6\n');
    assert.deepEqual(again.body, { imported: 1 });
    assert.deepEqual(
      (await partsOf(teacher, kit)).map((p: { code: string }) => p.code),
      ['IM-3'],
    );
  });

  it('a file with bad rows is 422 with every row’s line and column (RFC 9110 §15.5.21), and nothing is imported', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Bad Rows Kit');
    await importCsv(admin, kit, 'code,name,qty\nOK-1,Kept,3\n');
    const before = await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit));
    const res = await importCsv(
      admin,
      kit,
      'code,name,qty,category\r\nN-1,New,4,gear\r\nN-1,Dup,2,gear\r\nN-2,"Neg,\r\native",-1,wings\r\n',
    );
    assert.equal(res.status, 422);
    assert.equal(res.body.error.code, 'csv-rows');
    assert.deepEqual(
      res.body.error.details.map((d: { line: number; column: string; path: string }) => [
        d.line,
        d.column,
        d.path,
      ]),
      [
        [3, 'code', ''],
        [4, 'qty', ''],
        [4, 'category', ''],
        // "Neg,\r\native" is one quoted field (RFC 4180) holding a line break: not one line.
        [4, 'name', ''],
      ],
    );
    assert.deepEqual(
      await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit)),
      before,
    );
  });

  it('broken quoting is 422 with the line', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Broken Quote Kit');
    const res = await importCsv(admin, kit, 'code,name,qty\nA,"never closed,1\n');
    assert.equal(res.status, 422);
    assert.equal(res.body.error.details[0].line, 2);
  });

  it('a PDF, a PNG or bytes that are not UTF-8 posted as CSV are 415; an empty file is 422', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Not CSV Kit');
    // ISO 32000-1 §7.5.2 PDF header; ISO/IEC 15948 §5.2 PNG signature.
    const pdf = Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\n%%EOF\n', 'latin1');
    const png = Buffer.from([
      0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52,
    ]);
    // 0xE9 is "é" in ISO 8859-1; alone it is not valid UTF-8 (RFC 3629 §4).
    const latin1 = Buffer.from('code,name,qty\nA,Caf\xe9,1\n', 'latin1');
    for (const bytes of [pdf, png, latin1]) {
      assert.equal((await importCsv(admin, kit, bytes)).status, 415);
    }
    assert.equal((await importCsv(admin, kit, '')).status, 422);
    assert.equal(
      (await importCsv(admin, kit, 'code,name,qty\n')).status,
      422,
      'a header alone imports nothing',
    );
  });

  it('more than 5,000 rows or 2 MB is 413 (RFC 9110 §15.5.14), nothing imported', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Big Kit');
    const rows = Array.from({ length: 5001 }, (_, i) => `P-${i},Part ${i},1`);
    const many = await importCsv(admin, kit, `code,name,qty\n${rows.join('\n')}\n`);
    assert.equal(many.status, 413);
    const exactly = await importCsv(
      admin,
      kit,
      `code,name,qty\n${rows.slice(0, 5000).join('\n')}\n`,
    );
    assert.deepEqual(exactly.body, { imported: 5000 }, 'exactly 5,000 rows is allowed');
    const big = await importCsv(admin, kit, `code,name,qty\nA,${'x'.repeat(2 * 1024 * 1024)},1\n`);
    assert.equal(big.status, 413);
    assert.equal(
      (await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit))).length,
      5000,
    );
  });

  it('a hostile file gets a short answer: 100,000 columns, thousands of problems, one endless line', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Hostile Kit');
    const wide = await importCsv(
      admin,
      kit,
      `${Array.from({ length: 100_000 }, (_, i) => `c${i}`).join(',')}\nA\n`,
    );
    assert.equal(wide.status, 422);
    assert.equal(wide.body.error.details.length, 1);
    assert.ok(wide.text.length < 4_000, `answer of ${wide.text.length} characters`);
    const thousand = await importCsv(
      admin,
      kit,
      `${Array.from({ length: 1000 }, (_, i) => `c${i}`).join(',')}\nA\n`,
    );
    assert.equal(thousand.status, 422);
    assert.deepEqual(
      thousand.body.error.details.map((d: { message: string }) => /1,000 columns/.test(d.message)),
      [true],
    );

    // 5,000 rows with 12 problems each: the first 100 are listed, the count tells the rest.
    const badRow = (i: number) => `P-${i % 7},n,-1,gizmo,maybe,-3,,`;
    const rows = Array.from({ length: 5000 }, (_, i) => badRow(i));
    const many = await importCsv(
      admin,
      kit,
      `code,name,qty,category,small,charge_minutes,colour,compartment\n${rows.join('\n')}\n`,
    );
    assert.equal(many.status, 422);
    assert.equal(many.body.error.details.length, MAX_LISTED_PROBLEMS);
    assert.match(many.body.error.message, /^5,000 lines need attention\./);
    assert.match(many.body.error.message, /The first 100 of its [\d,]+ problems are listed\./);

    const endless = await importCsv(admin, kit, `code,name,qty\nA,${'y'.repeat(200_000)},1\n`);
    assert.equal(endless.status, 422);
    assert.equal(endless.body.error.code, 'csv-invalid');
    assert.equal(
      (await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit))).length,
      0,
      'nothing imported',
    );
  });

  // A reader that never yields would run a timer queued before it only after it finished
  // (Node.js event loop: setImmediate callbacks run in the check phase between macrotasks).
  it('reading a large file gives the event loop back while it parses', async () => {
    const rows = Array.from({ length: 5000 }, (_, i) => `P-${i},Part ${i},1`);
    let ranDuring = false;
    let finished = false;
    setImmediate(() => {
      ranDuring = !finished;
    });
    const read = await readPartsCsv(`code,name,qty\n${rows.join('\n')}\n`);
    finished = true;
    assert.equal(read.parts.length, 5000);
    assert.ok(ranDuring, 'a callback queued before the read ran while it was reading');
  });

  it('no file is 400; a relief teacher is 403; anonymous 401; another school 404', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Guard Kit');
    await admin.ensureCsrf();
    const none = await admin.agent
      .post(`/api/kit-types/${kit}/parts/import`)
      .set('X-XSRF-TOKEN', admin.csrf)
      .field('x', '1');
    assert.equal(none.status, 400);
    const text = 'code,name,qty\nA,Axle,1\n';
    assert.equal(
      (await importCsv(await signedIn(t.app, 'relief@kestrel-ridge.example'), kit, text)).status,
      403,
    );
    assert.equal((await importCsv(new Browser(t.app), kit, text)).status, 401);
    assert.equal(
      (await importCsv(await signedIn(t.app, 'admin@banksia-flat.example'), kit, text)).status,
      404,
    );
    assert.equal(
      (await t.database.db.select().from(parts).where(eq(parts.kitTypeId, kit))).length,
      0,
    );
  });
});

describe('GET /api/kit-types/:id/parts.csv', () => {
  it('exports text/csv (RFC 4180 §3) that the import reads back unchanged (round trip)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const kit = await newKit(admin, 'Round Trip Kit');
    const source = [
      'charge_minutes,code,name,colour,category,qty,compartment,small',
      '180,RT-1,"Hub, ""smart""",white,controller,1,A1,no',
      ',RT-2,"Cable, 20 cm",,cable,2,,yes',
      ",RT-3,=1+2,@blue,other,5,'=B2,true",
      ',RT-4,Rim,,wheel,0,,',
    ].join('\r\n');
    assert.equal((await importCsv(admin, kit, source)).status, 200);
    const first = await partsOf(admin, kit);
    const exported = await admin.get(`/api/kit-types/${kit}/parts.csv`);
    assert.equal(exported.status, 200);
    assert.match(exported.headers['content-type'], /^text\/csv; charset=utf-8/);
    assert.match(
      exported.headers['content-disposition'],
      /attachment; filename="round-trip-kit-parts\.csv"/,
    );
    const csv = exported.text;
    assert.equal((await importCsv(admin, kit, csv)).status, 200);
    assert.deepEqual(await partsOf(admin, kit), first);
    assert.equal(
      (await admin.get(`/api/kit-types/${kit}/parts.csv`)).text,
      csv,
      'a second export is the same file',
    );
    assert.equal(first[1].name, 'Cable, 20 cm');
    assert.equal(first[2].name, '=1+2');
  });
});
