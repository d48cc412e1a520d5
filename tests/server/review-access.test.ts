/**
 * Who may use each review and coverage route, for every kind of person and another school's
 * admin: the answers of API.md, "Review and coverage" (relief 403 on coverage; the queue and
 * summary for leads and admins; a unit's comments and review page for whoever reads the unit,
 * and admins once it has left draft; another school's record a 404), written out by hand as a
 * table, not derived from server/auth/policy.ts. Also: a comment's e-mail is plain text only.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { simpleParser } from 'mailparser';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  BANKSIA_FLAT,
  KESTREL_RIDGE,
  LEAD,
  OTHER_ADMIN,
  OTHER_TEACHER,
  PARTNER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  insertUnit,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  outcomeFrameworks,
  outcomes,
  unitCoauthors,
  unitOutcomes,
} from '../../server/db/schema/index.js';

const COLLEAGUE = 'colleague@kestrel-ridge.example';
type Who =
  'owner' | 'coauthor' | 'colleague' | 'lead' | 'admin' | 'relief' | 'other school' | 'nobody';
const PEOPLE: Record<Exclude<Who, 'nobody'>, string> = {
  owner: TEACHER,
  coauthor: PARTNER,
  colleague: COLLEAGUE,
  lead: LEAD,
  admin: ADMIN,
  relief: RELIEF,
  'other school': OTHER_ADMIN,
};
const EVERYONE = [...(Object.keys(PEOPLE) as Who[]), 'nobody'] as Who[];

let t: TestApp;
let as: SignIn;
/** Units of the demo teacher, co-authored by the partner: in review and shared; in review and private; a shared draft. */
const unit = { shared: '', private: '', draft: '' };
let framework = '';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel } = await schoolIds(db);
  await addTeacher(db, KESTREL_RIDGE, COLLEAGUE, 'Colleague Teacher');
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  const ids = await userIds(db);
  for (const [key, status, visibility] of [
    ['shared', 'in-review', 'school'],
    ['private', 'in-review', 'private'],
    ['draft', 'draft', 'school'],
  ] as const) {
    unit[key] = await insertUnit(db, {
      schoolId: kestrel,
      ownerId: ids[TEACHER]!,
      title: `Access ${key}`,
      yearLevel: 5,
      term: 2,
      status,
      visibility,
      submittedAt: status === 'in-review' ? new Date() : null,
    });
    await db.insert(unitCoauthors).values({ unitId: unit[key], userId: ids[PARTNER]! });
  }
  const [fw] = await db
    .insert(outcomeFrameworks)
    .values({ schoolId: kestrel, name: 'Access test framework' })
    .returning();
  framework = fw!.id;
  await db.insert(outcomes).values({ frameworkId: framework, code: 'AC-1', description: 'One' });
});

after(async () => {
  await t.close();
});

async function client(who: Who): Promise<Browser> {
  return who === 'nobody' ? new Browser(t.app) : as(PEOPLE[who]);
}

/** Codes by person; anyone not named gets `otherwise`. */
function codes(named: Partial<Record<Who, number>>, otherwise: number): Record<Who, number> {
  return Object.fromEntries(EVERYONE.map((w) => [w, named[w] ?? otherwise])) as Record<Who, number>;
}

const ROUTES: [string, () => string, 'get' | 'post', Record<Who, number>][] = [
  [
    'the review queue',
    () => '/api/review/queue',
    'get',
    codes({ lead: 200, admin: 200, 'other school': 200, nobody: 401 }, 403),
  ],
  [
    'the lead’s summary',
    () => '/api/review/summary',
    'get',
    codes({ lead: 200, admin: 200, 'other school': 200, nobody: 401 }, 403),
  ],
  [
    'a shared unit’s review page',
    () => `/api/review/units/${unit.shared}`,
    'get',
    codes({ relief: 404, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'a private unit’s review page',
    () => `/api/review/units/${unit.private}`,
    'get',
    codes({ colleague: 404, relief: 404, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'a draft’s review page (admins see units once sent)',
    () => `/api/review/units/${unit.draft}`,
    'get',
    codes({ admin: 404, relief: 404, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'a shared unit’s comments',
    () => `/api/units/${unit.shared}/comments`,
    'get',
    codes({ relief: 404, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'a private unit’s comments',
    () => `/api/units/${unit.private}/comments`,
    'get',
    codes({ colleague: 404, relief: 404, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'commenting on a shared unit',
    () => `/api/units/${unit.shared}/comments`,
    'post',
    codes({ relief: 404, 'other school': 404, nobody: 401 }, 201),
  ],
  [
    'commenting on a draft (not admins)',
    () => `/api/units/${unit.draft}/comments`,
    'post',
    codes({ admin: 404, relief: 404, 'other school': 404, nobody: 401 }, 201),
  ],
  [
    'the coverage matrix',
    () => `/api/coverage?frameworkId=${framework}`,
    'get',
    codes({ relief: 403, 'other school': 404, nobody: 401 }, 200),
  ],
  [
    'the coverage CSV',
    () => `/api/coverage.csv?frameworkId=${framework}`,
    'get',
    codes({ relief: 403, 'other school': 404, nobody: 401 }, 200),
  ],
];

describe('review and coverage routes: every person, another school and nobody', () => {
  for (const [label, path, method, want] of ROUTES) {
    it(label, async () => {
      const got: Partial<Record<Who, number>> = {};
      for (const who of EVERYONE) {
        const b = await client(who);
        const res =
          method === 'get'
            ? await b.get(path())
            : await b.post(path(), { body: `A comment from ${who}.` });
        got[who] = res.status;
      }
      assert.deepEqual(got, want);
    });
  }

  it('another school’s admin sees none of this school’s units in the queue or the summary', async () => {
    const other = await as(OTHER_ADMIN);
    const queue = await other.get('/api/review/queue');
    assert.deepEqual(queue.body.units, []);
    const summary = await other.get('/api/review/summary');
    assert.equal(summary.body.waiting, 0);
    assert.ok(
      !summary.body.frameworks.some((f: { id: string }) => f.id === framework),
      'no framework of this school',
    );
    // This school's lead sees both units in review.
    const mine = await (await as(LEAD)).get('/api/review/queue');
    const listed = mine.body.units.map((u: { id: string }) => u.id);
    assert.ok(listed.includes(unit.shared) && listed.includes(unit.private));
    assert.ok(!listed.includes(unit.draft));
  });
});

describe('a comment’s e-mail', () => {
  it('is plain text only (no HTML part), so Markdown or script in a comment is never rendered', async () => {
    await t.outbox.drain();
    const from = t.smtp.raw().length;
    const body = 'Check <script>alert(1)</script> **this**';
    const res = await (await as(LEAD)).post(`/api/units/${unit.private}/comments`, { body });
    assert.equal(res.status, 201);
    await t.outbox.drain();
    const mail = await Promise.all(
      t.smtp
        .raw()
        .slice(from)
        .map((r) => simpleParser(r)),
    );
    assert.ok(mail.length > 0);
    for (const m of mail) {
      // RFC 2046: a single text/plain body; mailparser reports `html` false when there is none.
      assert.equal(m.html, false);
      assert.ok(m.text?.includes('<script>alert(1)</script>'), 'quoted as written, as text');
    }
    const to = mail.flatMap((m) =>
      ([] as { value: { address?: string }[] }[]).concat(m.to ?? []).flatMap((a) => a.value),
    );
    // The private unit's authors: nobody else has commented or taken a step on it, and the
    // lead (the school's only one) is the one commenting.
    assert.deepEqual(to.map((a) => a.address).sort(), [PARTNER, TEACHER].sort());
  });
});

describe('the lead’s summary counts the current term’s gaps', () => {
  it('counts an outcome covered only in another term as a gap, and one covered in this term not', async () => {
    const db = t.database.db;
    const { kestrel } = await schoolIds(db);
    const ids = await userIds(db);
    const lead = await as(LEAD);
    const before = await lead.get('/api/review/summary');
    assert.equal(before.status, 200);
    // The demo school has its terms set up, so the summary names the current (or next) one.
    const term = before.body.term as { number: number } | null;
    assert.ok(term, 'a current term');
    const [fw] = await db
      .insert(outcomeFrameworks)
      .values({ schoolId: kestrel, name: 'Summary gaps framework' })
      .returning();
    const rows = await db
      .insert(outcomes)
      .values(
        ['SG-1', 'SG-2', 'SG-3'].map((code) => ({ frameworkId: fw!.id, code, description: code })),
      )
      .returning();
    const otherTerm = term.number === 1 ? 2 : 1;
    for (const [title, unitTerm, outcome] of [
      ['Covers SG-1 this term', term.number, rows[0]!],
      ['Covers SG-2 another term', otherTerm, rows[1]!],
    ] as const) {
      const unitId = await insertUnit(db, {
        schoolId: kestrel,
        ownerId: ids[TEACHER]!,
        title,
        yearLevel: 3,
        term: unitTerm,
        status: 'in-review',
        visibility: 'school',
        submittedAt: new Date(),
      });
      await db.insert(unitOutcomes).values({ unitId, outcomeId: outcome.id });
    }
    const after = await lead.get('/api/review/summary');
    const counted = after.body.frameworks.find((f: { id: string }) => f.id === fw!.id);
    // Worked out by hand: SG-1 is covered in this term; SG-2 (another term) and SG-3 are gaps.
    assert.deepEqual(counted, { id: fw!.id, name: 'Summary gaps framework', outcomes: 3, gaps: 2 });
    assert.equal(after.body.waiting, before.body.waiting + 2);
  });
});
