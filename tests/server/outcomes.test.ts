/**
 * Outcomes frameworks over HTTP against a real PostgreSQL: create, import a CSV (RFC 4180 cases,
 * bad rows refused whole), replace on re-import, browse and search, and who may do each.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  LEAD,
  OTHER_ADMIN,
  RELIEF,
  TEACHER,
  browsers,
  type SignIn,
} from '../support/planning.js';
import { outcomeFrameworks, outcomes } from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;

before(async () => {
  t = await testApp();
  as = browsers(t.app);
});
after(async () => {
  await t.close();
});

async function newFramework(name: string, email = LEAD): Promise<string> {
  const res = await (await as(email)).post('/api/outcomes/frameworks', { name });
  assert.equal(res.status, 201, res.text);
  return res.body.id;
}
async function importCsv(
  email: string,
  frameworkId: string,
  csv: string | Buffer,
  filename = 'outcomes.csv',
) {
  const b = await as(email);
  await b.ensureCsrf();
  return b.agent
    .post(`/api/outcomes/frameworks/${frameworkId}/import`)
    .set('X-XSRF-TOKEN', b.csrf)
    .attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv, 'utf8'), {
      filename,
      contentType: 'text/csv',
    });
}
async function stored(frameworkId: string) {
  const rows = await t.database.db
    .select()
    .from(outcomes)
    .where(eq(outcomes.frameworkId, frameworkId));
  return rows.sort((a, b) => a.code.localeCompare(b.code));
}

describe('POST /api/outcomes/frameworks', () => {
  it('a lead or an admin creates a framework (201); a teacher or relief teacher may not (403)', async () => {
    const res = await (
      await as(LEAD)
    ).post('/api/outcomes/frameworks', { name: '  Digital Technologies (trial)  ' });
    assert.equal(res.status, 201);
    assert.equal(res.body.name, 'Digital Technologies (trial)');
    assert.equal(res.body.outcomeCount, 0);
    assert.equal(
      (await (await as(ADMIN)).post('/api/outcomes/frameworks', { name: 'Admin made' })).status,
      201,
    );
    assert.equal(
      (await (await as(TEACHER)).post('/api/outcomes/frameworks', { name: 'Teacher made' })).status,
      403,
    );
    assert.equal(
      (await (await as(RELIEF)).post('/api/outcomes/frameworks', { name: 'Relief made' })).status,
      403,
    );
    assert.equal(
      (await new Browser(t.app).post('/api/outcomes/frameworks', { name: 'Nobody' })).status,
      401,
    );
  });

  it('refuses a bad name (400) and a duplicate (409), storing nothing', async () => {
    const before = (await t.database.db.select().from(outcomeFrameworks)).length;
    const bad = await (await as(LEAD)).post('/api/outcomes/frameworks', { name: ' ' });
    assert.equal(bad.status, 400);
    assert.deepEqual(
      bad.body.error.details.map((d: { path: string }) => d.path),
      ['name'],
    );
    await newFramework('Only once');
    const dup = await (await as(LEAD)).post('/api/outcomes/frameworks', { name: 'Only once' });
    assert.equal(dup.status, 409);
    assert.equal((await t.database.db.select().from(outcomeFrameworks)).length, before + 1);
  });
});

describe('POST /api/outcomes/frameworks/:id/import', () => {
  it('reads RFC 4180 CSV: BOM, CRLF, any header order and case, quoted commas, doubled quotes, line breaks', async () => {
    const id = await newFramework('RFC 4180 cases');
    // RFC 4180 §2: CRLF line breaks (2.1); fields with commas, quotes or line breaks are quoted
    // (2.6); a quote inside is doubled (2.7). The byte-order mark U+FEFF is EF BB BF in UTF-8
    // (RFC 3629 §6). The header names the columns in another order and case.
    const csv =
      '\uFEFFYear_Band,CODE,Description,strand\r\n' +
      '3-4,TD-01,"Follows, and writes, a sequence of steps",Algorithms\r\n' +
      '3-4,TD-02,"Explains why a ""bug"" stops a rover",Algorithms\r\n' +
      '5-6,TD-03,"Plans a build\r\nthen tests it",Design\r\n' +
      '5-6,TD-04,Uses a sensor to react,"Data, sensing"\r\n';
    const res = await importCsv(LEAD, id, csv);
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(res.body, { imported: 4, added: 4, updated: 0, removed: 0 });
    const rows = await stored(id);
    assert.deepEqual(
      rows.map((r) => [r.code, r.description, r.strand, r.yearBand]),
      [
        ['TD-01', 'Follows, and writes, a sequence of steps', 'Algorithms', '3-4'],
        ['TD-02', 'Explains why a "bug" stops a rover', 'Algorithms', '3-4'],
        // A line break inside quotes is part of the field (stored as LF).
        ['TD-03', 'Plans a build\nthen tests it', 'Design', '5-6'],
        ['TD-04', 'Uses a sensor to react', 'Data, sensing', '5-6'],
      ],
    );
  });

  it('reads LF line ends and optional columns left out', async () => {
    const id = await newFramework('LF only');
    const res = await importCsv(LEAD, id, 'code,description\nLF-1,First\nLF-2,Second\n');
    assert.equal(res.status, 200);
    assert.deepEqual(
      (await stored(id)).map((r) => [r.code, r.strand, r.yearBand]),
      [
        ['LF-1', '', ''],
        ['LF-2', '', ''],
      ],
    );
  });

  it('refuses a file with bad rows (422) listing each with line and column, and imports nothing', async () => {
    const id = await newFramework('Bad rows');
    assert.equal(
      (await importCsv(LEAD, id, 'code,description\nKEEP-1,Kept from before\n')).status,
      200,
    );
    const csv = [
      'code,description,strand,year_band',
      'OK-1,"A fine outcome that spans',
      'two lines",Design,3-4', // lines 2–3: fine
      ',Missing its code,Design,3-4', // line 4
      'OK-2,,Design,3-4', // line 5
      'OK-1,Same code again,Design,3-4', // line 6
      'OK-3,Too many fields,Design,3-4,extra', // line 7
      `OK-4,Long band,Design,${'x'.repeat(41)}`, // line 8
    ].join('\r\n');
    const res = await importCsv(LEAD, id, csv);
    assert.equal(res.status, 422);
    assert.equal(res.body.error.code, 'bad-rows');
    assert.deepEqual(
      res.body.error.details.map((d: { line: number; column?: string }) => [
        d.line,
        d.column ?? null,
      ]),
      [
        [4, 'code'],
        [5, 'description'],
        [6, 'code'],
        [7, null],
        [8, 'year_band'],
      ],
    );
    assert.match(res.body.error.details[2].message, /already on line 2/);
    assert.deepEqual(
      (await stored(id)).map((r) => r.code),
      ['KEEP-1'],
      'nothing imported, nothing removed',
    );
  });

  it('refuses unknown or missing columns, an unclosed quote and an empty file (422)', async () => {
    const id = await newFramework('Bad headers');
    const unknown = await importCsv(LEAD, id, 'code,description,colour\nA,B,red\n');
    assert.equal(unknown.status, 422);
    assert.deepEqual(
      unknown.body.error.details.map((d: { line: number; column: string }) => [d.line, d.column]),
      [[1, 'colour']],
    );
    const missing = await importCsv(LEAD, id, 'code,strand\nA,B\n');
    assert.deepEqual(
      missing.body.error.details.map((d: { column: string }) => d.column),
      ['description'],
    );
    const unclosed = await importCsv(LEAD, id, 'code,description\nA,"never closed\n');
    assert.equal(unclosed.status, 422);
    assert.equal((await importCsv(LEAD, id, '')).status, 422);
    assert.equal(
      (await importCsv(LEAD, id, Buffer.from([0x63, 0x6f, 0x64, 0x65, 0xff, 0xfe, 0x0a]))).status,
      422,
      'not UTF-8',
    );
    assert.equal((await stored(id)).length, 0);
  });

  it('a re-import replaces the list, keeping the ids (and units’ links) of codes it keeps', async () => {
    const id = await newFramework('Replace');
    await importCsv(LEAD, id, 'code,description\nR-1,One\nR-2,Two\nR-3,Three\n');
    const before = await stored(id);
    const unit = await (await as(TEACHER)).post('/api/units', { title: 'Cites R-1', yearLevel: 4 });
    const linked = await (
      await as(TEACHER)
    ).patch(`/api/units/${unit.body.id}`, {
      version: 1,
      outcomeIds: [before[0]!.id, before[2]!.id],
    });
    assert.equal(linked.status, 200);
    const res = await importCsv(
      LEAD,
      id,
      'code,description\nR-1,One (reworded)\nR-2,Two\nR-4,Four\n',
    );
    assert.deepEqual(res.body, { imported: 3, added: 1, updated: 1, removed: 1 });
    const after = await stored(id);
    assert.deepEqual(
      after.map((r) => [r.code, r.description]),
      [
        ['R-1', 'One (reworded)'],
        ['R-2', 'Two'],
        ['R-4', 'Four'],
      ],
    );
    assert.equal(after[0]!.id, before[0]!.id);
    const unitNow = await (await as(TEACHER)).get(`/api/units/${unit.body.id}`);
    assert.deepEqual(
      unitNow.body.outcomes.map((o: { code: string; description: string }) => [
        o.code,
        o.description,
      ]),
      [['R-1', 'One (reworded)']],
    );
  });

  it('refuses a binary file (415), a file over 2 MB (413) and no file (400)', async () => {
    const id = await newFramework('Uploads');
    // ISO 32000-1 §7.5.2: a PDF begins with `%PDF-1.n`.
    const pdf = await importCsv(
      LEAD,
      id,
      Buffer.from('%PDF-1.4\n1 0 obj << >> endobj\n%%EOF\n'),
      'outcomes.csv',
    );
    assert.equal(pdf.status, 415);
    const big = 'code,description\n' + 'X,' + 'y'.repeat(2 * 1024 * 1024) + '\n';
    assert.equal((await importCsv(LEAD, id, big)).status, 413);
    const b = await as(LEAD);
    const none = await b.agent
      .post(`/api/outcomes/frameworks/${id}/import`)
      .set('X-XSRF-TOKEN', b.csrf)
      .field('x', 'y');
    assert.equal(none.status, 400);
    assert.equal((await stored(id)).length, 0);
  });

  it('who may import: leads and admins of the school (teacher 403, other school 404, anonymous 401)', async () => {
    const id = await newFramework('Guarded');
    const csv = 'code,description\nG-1,Guarded\n';
    assert.equal((await importCsv(TEACHER, id, csv)).status, 403);
    assert.equal((await importCsv(RELIEF, id, csv)).status, 403);
    assert.equal((await importCsv(OTHER_ADMIN, id, csv)).status, 404);
    const anon = new Browser(t.app);
    await anon.ensureCsrf();
    const res = await anon.agent
      .post(`/api/outcomes/frameworks/${id}/import`)
      .set('X-XSRF-TOKEN', anon.csrf)
      .attach('file', Buffer.from(csv), { filename: 'o.csv', contentType: 'text/csv' });
    assert.equal(res.status, 401);
    assert.equal((await stored(id)).length, 0);
    assert.equal((await importCsv(ADMIN, id, csv)).status, 200);
  });
});

describe('GET /api/outcomes and /api/outcomes/frameworks', () => {
  let fw = '';
  before(async () => {
    fw = await newFramework('Browse me');
    await importCsv(
      LEAD,
      fw,
      [
        'code,description,strand,year_band',
        'B-01,Designs an algorithm with branches,Algorithms,Years 3-4',
        'B-02,Collects data with a light sensor,Data,Years 3-4',
        'B-03,Evaluates a design against criteria,Design,Years 5-6',
        'B-04,100% of steps are checked,Design,Years 5-6',
      ].join('\n'),
    );
  });

  it('lists the school’s frameworks with counts and year bands; never another school’s', async () => {
    const res = await (await as(TEACHER)).get('/api/outcomes/frameworks');
    assert.equal(res.status, 200);
    const mine = res.body.frameworks.find((f: { id: string }) => f.id === fw);
    assert.equal(mine.outcomeCount, 4);
    assert.deepEqual(mine.yearBands, ['Years 3-4', 'Years 5-6']);
    const other = await (await as(OTHER_ADMIN)).get('/api/outcomes/frameworks');
    assert.deepEqual(other.body.frameworks, []);
    assert.equal((await (await as(OTHER_ADMIN)).get(`/api/outcomes/frameworks/${fw}`)).status, 404);
    assert.equal(
      (await (await as(OTHER_ADMIN)).get(`/api/outcomes?frameworkId=${fw}`)).status,
      404,
    );
  });

  it('searches words in code, description and strand, and filters by year band', async () => {
    const teacher = await as(TEACHER);
    const codes = async (query: string) =>
      (await teacher.get(`/api/outcomes?frameworkId=${fw}&${query}`)).body.outcomes.map(
        (o: { code: string }) => o.code,
      );
    assert.deepEqual(await codes('q=sensor'), ['B-02']);
    assert.deepEqual(await codes('q=design%20criteria'), ['B-03']);
    assert.deepEqual(await codes('q=algorithms'), ['B-01'], 'a strand matches');
    assert.deepEqual(await codes('yearBand=years%205-6'), ['B-03', 'B-04']);
    assert.deepEqual(await codes('q=100%25'), ['B-04'], 'a % is looked for literally');
    assert.deepEqual(await codes('q=0%25'), ['B-04']);
    assert.deepEqual(await codes('q=_'), [], 'an underscore is no wildcard');
  });

  it('refuses a bad query (400), relief teachers (403) and anonymous (401)', async () => {
    const bad = await (
      await as(TEACHER)
    ).get(`/api/outcomes?frameworkId=nope&q=${'x'.repeat(201)}`);
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'frameworkId',
      'q',
    ]);
    assert.equal((await (await as(RELIEF)).get('/api/outcomes')).status, 403);
    assert.equal((await (await as(RELIEF)).get('/api/outcomes/frameworks')).status, 403);
    assert.equal((await new Browser(t.app).get('/api/outcomes')).status, 401);
    assert.equal((await new Browser(t.app).get('/api/outcomes/frameworks')).status, 401);
  });
});
