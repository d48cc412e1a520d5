/**
 * Coverage over HTTP against a real PostgreSQL: the matrix's counts against an independent
 * recount of the same generated units (fast-check), the CSV read back with csv-parse (RFC 4180)
 * with formula-safe cells (OWASP CSV Injection), the landscape PDF in the school's paper size
 * (ISO 216, ANSI/ASME Y14.1, read back with pdfjs-dist), and who may see what.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import fc from 'fast-check';
import { parse as parseCsv } from 'csv-parse/sync';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  LEAD,
  OTHER_ADMIN,
  PARTNER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  download,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  outcomeFrameworks,
  outcomes,
  schools,
  unitCoauthors,
  unitOutcomes,
  units,
} from '../../server/db/schema/index.js';
import type { Coverage } from '../../shared/schemas/review.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let kestrel = '';
let banksia = '';
const COLLEAGUE = 'colleague@kestrel-ridge.example';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  ({ kestrel, banksia } = await schoolIds(t.database.db));
  await addTeacher(t.database.db, 'Kestrel Ridge Primary School', COLLEAGUE, 'Colleague Teacher');
  ids = await userIds(t.database.db);
});

after(async () => {
  await t.close();
});

let frameworkCount = 0;
async function newFramework(codes: string[], schoolId = kestrel) {
  const db = t.database.db;
  const [fw] = await db
    .insert(outcomeFrameworks)
    .values({ schoolId, name: `Coverage test ${++frameworkCount}` })
    .returning();
  const rows = await db
    .insert(outcomes)
    .values(codes.map((code, i) => ({ frameworkId: fw!.id, code, description: `Outcome ${i}` })))
    .returning();
  return { id: fw!.id, outcomeIds: rows.map((r) => r.id) };
}

interface GenUnit {
  yearLevel: number;
  term: number | null;
  status: 'draft' | 'in-review' | 'changes-requested' | 'endorsed';
  visibility: 'private' | 'school';
  owner: 'teacher' | 'colleague';
  partnerCoauthors: boolean;
  /** Indexes into the framework's outcomes. */
  links: number[];
}

const genUnit = (outcomeCount: number) =>
  fc.record<GenUnit>({
    yearLevel: fc.constantFrom(4, 5, 6),
    term: fc.option(fc.integer({ min: 1, max: 4 }), { nil: null }),
    status: fc.constantFrom('draft', 'in-review', 'changes-requested', 'endorsed'),
    visibility: fc.constantFrom('private', 'school'),
    owner: fc.constantFrom('teacher', 'colleague'),
    partnerCoauthors: fc.boolean(),
    links: fc.uniqueArray(fc.integer({ min: 0, max: outcomeCount - 1 }), {
      maxLength: outcomeCount,
    }),
  });

/**
 * Who sees a unit, restated from API.md and the policy's comments rather than imported: leads
 * see every unit of the school; a teacher their own, co-authored or shared ones; an admin those
 * sent for review (not drafts).
 */
function sees(asker: string, u: GenUnit): boolean {
  if (asker === LEAD) return true;
  if (asker === ADMIN) return u.status !== 'draft';
  if (asker === TEACHER) return u.owner === 'teacher' || u.visibility === 'school';
  if (asker === PARTNER) return u.partnerCoauthors || u.visibility === 'school';
  throw new Error(`No rule for ${asker}`);
}

async function insertGenerated(gen: GenUnit[], outcomeIds: string[]): Promise<string[]> {
  const db = t.database.db;
  const out: string[] = [];
  for (const [i, u] of gen.entries()) {
    const [row] = await db
      .insert(units)
      .values({
        schoolId: kestrel,
        ownerId: ids[u.owner === 'teacher' ? TEACHER : COLLEAGUE]!,
        title: `Generated ${i}`,
        yearLevel: u.yearLevel,
        term: u.term,
        status: u.status,
        visibility: u.visibility,
      })
      .returning();
    if (u.partnerCoauthors)
      await db.insert(unitCoauthors).values({ unitId: row!.id, userId: ids[PARTNER]! });
    if (u.links.length)
      await db
        .insert(unitOutcomes)
        .values(u.links.map((k) => ({ unitId: row!.id, outcomeId: outcomeIds[k]! })));
    out.push(row!.id);
  }
  return out;
}

describe('GET /api/coverage against an independent recount', () => {
  it('counts, for every asker and both scopes, exactly the units that list each outcome', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc
          .integer({ min: 1, max: 4 })
          .chain((n) => fc.tuple(fc.constant(n), fc.array(genUnit(n), { maxLength: 7 }))),
        async ([n, gen]) => {
          const fw = await newFramework(Array.from({ length: n }, (_, i) => `GEN-${i + 1}`));
          const unitIds = await insertGenerated(gen, fw.outcomeIds);
          for (const asker of [LEAD, TEACHER, PARTNER, ADMIN]) {
            for (const status of ['any', 'endorsed'] as const) {
              const res = await (
                await as(asker)
              ).get(`/api/coverage?frameworkId=${fw.id}&status=${status}`);
              assert.equal(res.status, 200, res.text);
              const m = res.body as Coverage;
              assert.deepEqual(
                m.outcomes.map((o) => o.id),
                fw.outcomeIds,
                'every outcome, covered or not, in code order',
              );
              let shown = 0;
              for (const [k, o] of m.outcomes.entries()) {
                for (const cell of o.cells) {
                  const want = gen
                    .map((u, i) => ({ u, id: unitIds[i]! }))
                    .filter(
                      ({ u }) =>
                        sees(asker, u) &&
                        (status === 'any' || u.status === 'endorsed') &&
                        u.yearLevel === cell.yearLevel &&
                        u.term === cell.term &&
                        u.links.includes(k),
                    )
                    .map(({ id }) => id)
                    .sort();
                  assert.deepEqual(cell.units.map((x) => x.id).sort(), want);
                  shown += cell.units.length;
                }
              }
              // No unit with a term falls outside the columns.
              const placed = gen
                .filter(
                  (u) =>
                    sees(asker, u) &&
                    u.term !== null &&
                    (status === 'any' || u.status === 'endorsed'),
                )
                .reduce((sum, u) => sum + u.links.length, 0);
              assert.equal(shown, placed);
            }
          }
        },
      ),
      { numRuns: 12 },
    );
  });

  it('narrows to one year level and one term', async () => {
    const fw = await newFramework(['NW-1']);
    await insertGenerated(
      [
        {
          yearLevel: 5,
          term: 2,
          status: 'endorsed',
          visibility: 'school',
          owner: 'teacher',
          partnerCoauthors: false,
          links: [0],
        },
        {
          yearLevel: 6,
          term: 2,
          status: 'endorsed',
          visibility: 'school',
          owner: 'teacher',
          partnerCoauthors: false,
          links: [0],
        },
      ],
      fw.outcomeIds,
    );
    const res = await (await as(LEAD)).get(`/api/coverage?frameworkId=${fw.id}&yearLevel=5&term=2`);
    assert.equal(res.status, 200);
    assert.deepEqual(res.body.columns, [{ yearLevel: 5, term: 2 }]);
    assert.equal(res.body.outcomes[0].cells[0].units.length, 1);
  });

  it('refuses relief (403), bad queries (400), another school’s framework (404) and nobody (401)', async () => {
    const fw = await newFramework(['AZ-1']);
    const other = await newFramework(['AZ-2'], banksia);
    assert.equal((await (await as(RELIEF)).get(`/api/coverage?frameworkId=${fw.id}`)).status, 403);
    const bad = await (await as(LEAD)).get('/api/coverage?yearLevel=13&status=draft');
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'frameworkId',
      'status',
      'yearLevel',
    ]);
    assert.equal((await (await as(LEAD)).get(`/api/coverage?frameworkId=${other.id}`)).status, 404);
    assert.equal(
      (await (await as(OTHER_ADMIN)).get(`/api/coverage.csv?frameworkId=${fw.id}`)).status,
      404,
    );
    assert.equal((await new Browser(t.app).get(`/api/coverage?frameworkId=${fw.id}`)).status, 401);
  });
});

describe('coverage paths', () => {
  it('answers its three formats and nothing else under the name (JSON 404 for the rest)', async () => {
    const fw = await newFramework(['AZ-3']);
    const lead = await as(LEAD);
    for (const suffix of ['.txt', '.csv.pdf', '/extra', '.pdfx']) {
      const res = await lead.get(`/api/coverage${suffix}?frameworkId=${fw.id}`);
      assert.equal(res.status, 404, suffix);
      assert.match(String(res.headers['content-type']), /json/, suffix);
    }
    const pdf = await lead.get(`/api/coverage.pdf?frameworkId=${fw.id}`);
    assert.equal(pdf.status, 200);
    assert.match(String(pdf.headers['content-type']), /application\/pdf/);
  });
});

describe('GET /api/coverage.csv', () => {
  it('reads back with csv-parse (RFC 4180): header, one row per outcome, counts; formulas made text', async () => {
    // OWASP CSV Injection: cells starting with = + - @ tab or CR are prefixed with an apostrophe.
    const codes = ['=SUM(A1:A2)', '+1', '-2', '@cmd', '\tTAB', 'Plain, "quoted"\r\nline'];
    const fw = await newFramework(codes);
    await insertGenerated(
      [
        {
          yearLevel: 5,
          term: 3,
          status: 'in-review',
          visibility: 'school',
          owner: 'teacher',
          partnerCoauthors: false,
          links: [0, 5],
        },
        {
          yearLevel: 5,
          term: 3,
          status: 'draft',
          visibility: 'school',
          owner: 'colleague',
          partnerCoauthors: false,
          links: [5],
        },
      ],
      fw.outcomeIds,
    );
    const res = await download(
      await as(LEAD),
      `/api/coverage.csv?frameworkId=${fw.id}&yearLevel=5`,
    );
    assert.equal(res.status, 200);
    assert.match(res.headers['content-type'] ?? '', /^text\/csv/);
    const text = (res.body as Buffer).toString('utf8');
    // RFC 4180 §2.1: records end with CRLF.
    assert.ok(text.includes('\r\n'));
    const rows = parseCsv(text, { bom: true, relax_column_count: false }) as string[][];
    assert.deepEqual(rows[0], [
      'Outcome',
      'Year 5 term 1',
      'Year 5 term 2',
      'Year 5 term 3',
      'Year 5 term 4',
    ]);
    const byCode = new Map(rows.slice(1).map((r) => [r[0], r.slice(1)]));
    assert.equal(rows.length, 1 + codes.length);
    assert.deepEqual(byCode.get("'=SUM(A1:A2)"), ['0', '0', '1', '0']);
    assert.ok(
      byCode.has("'+1") && byCode.has("'-2") && byCode.has("'@cmd") && byCode.has("'\tTAB"),
    );
    // A code holding a comma, quotes and a line break survives whole (RFC 4180 §2.6, §2.7).
    assert.deepEqual(byCode.get('Plain, "quoted"\r\nline'), ['0', '0', '2', '0']);
  });
});

describe('GET /api/coverage.pdf', () => {
  async function pageSize(b: Browser, url: string) {
    const res = await download(b, url);
    assert.equal(res.status, 200);
    assert.equal(res.headers['content-type'], 'application/pdf');
    const doc = await getDocument({ data: new Uint8Array(res.body as Buffer) }).promise;
    const page = await doc.getPage(1);
    const [x0, y0, x1, y1] = page.view;
    const text = (await page.getTextContent()).items
      .map((i) => ('str' in i ? i.str : ''))
      .join(' ');
    await doc.destroy();
    return { width: x1! - x0!, height: y1! - y0!, text };
  }

  it('prints landscape in the school’s paper: A4 then Letter', async () => {
    const fw = await newFramework(['PDF-1', 'PDF-2']);
    await insertGenerated(
      [
        {
          yearLevel: 4,
          term: 1,
          status: 'endorsed',
          visibility: 'school',
          owner: 'teacher',
          partnerCoauthors: false,
          links: [0],
        },
      ],
      fw.outcomeIds,
    );
    const lead = await as(LEAD);
    const a4 = await pageSize(lead, `/api/coverage.pdf?frameworkId=${fw.id}`);
    // ISO 216: A4 is 210 × 297 mm = 595.28 × 841.89 pt; landscape puts the long side across.
    assert.ok(Math.abs(a4.width - 841.89) < 0.5 && Math.abs(a4.height - 595.28) < 0.5);
    assert.ok(a4.text.includes('PDF-1') && a4.text.includes('gap'));
    await t.database.db.update(schools).set({ paperSize: 'Letter' }).where(eq(schools.id, kestrel));
    try {
      const letter = await pageSize(lead, `/api/coverage.pdf?frameworkId=${fw.id}`);
      // ANSI/ASME Y14.1: US Letter is 8.5 × 11 in = 612 × 792 pt.
      assert.ok(Math.abs(letter.width - 792) < 0.5 && Math.abs(letter.height - 612) < 0.5);
    } finally {
      await t.database.db.update(schools).set({ paperSize: 'A4' }).where(eq(schools.id, kestrel));
    }
    assert.equal(
      (await (await as(RELIEF)).get(`/api/coverage.pdf?frameworkId=${fw.id}`)).status,
      403,
    );
  });
});
