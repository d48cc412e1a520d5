/**
 * Generated payloads over every write route: fast-check builds bodies (and `?version=` queries)
 * from the field names of the API's own zod schemas (shared/schemas) filled with hostile values —
 * NUL and other control characters (PostgreSQL text cannot hold U+0000), numbers beyond
 * PostgreSQL's integer range (PostgreSQL docs §8.1.1), impossible dates, deep nesting, wrong types
 * — and mutates a valid-looking sample of each route. Every answer must be below 500, and an
 * answer that refuses (4xx) must leave every row as it was (a digest of each table compared).
 * The seed is fixed per route so a run is repeatable; FUZZ_SEED changes it, FUZZ_RUNS the count.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync } from 'node:fs';
import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { and, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { schoolIds } from '../support/planning.js';
import {
  activities,
  attachments,
  classes,
  kitTypes,
  lessons,
  outcomeFrameworks,
  parts,
  shareLinks,
  tubs,
  units,
  users,
} from '../../server/db/schema/index.js';

const RUNS = Number(process.env['FUZZ_RUNS'] ?? 12);
const SEED = Number(process.env['FUZZ_SEED'] ?? 20261202);

let t: TestApp;
let teacher: Browser;
let admin: Browser;
let anonymous: Browser;
const ids: Record<string, string> = {};

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
  anonymous = new Browser(t.app);
  await anonymous.ensureCsrf();
  const db = t.database.db;
  const { kestrel } = await schoolIds(db);
  const [owner] = await db
    .select()
    .from(users)
    .where(eq(users.email, 'teacher@kestrel-ridge.example'));
  const [row] = await db
    .select({ unit: units.id, lesson: lessons.id, activity: activities.id })
    .from(units)
    .innerJoin(lessons, eq(lessons.unitId, units.id))
    .innerJoin(activities, eq(activities.lessonId, lessons.id))
    .where(eq(units.ownerId, owner!.id))
    .limit(1);
  ids['unit'] = row!.unit;
  ids['lesson'] = row!.lesson;
  ids['activity'] = row!.activity;
  const first = async <T extends { id: string }>(rows: Promise<T[]>) => (await rows)[0]?.id;
  ids['class'] = (await first(db.select().from(classes).where(eq(classes.schoolId, kestrel))))!;
  ids['kit'] = (await first(db.select().from(kitTypes).where(eq(kitTypes.schoolId, kestrel))))!;
  const [part] = await db.select().from(parts).where(eq(parts.kitTypeId, ids['kit']!)).limit(1);
  ids['part'] = part!.id;
  ids['code'] = part!.code;
  ids['tub'] = (await first(db.select().from(tubs).where(eq(tubs.schoolId, kestrel))))!;
  ids['member'] = (await first(
    db
      .select()
      .from(users)
      .where(and(eq(users.schoolId, kestrel), eq(users.email, 'relief@kestrel-ridge.example'))),
  ))!;
  ids['framework'] =
    (await first(db.select().from(outcomeFrameworks).limit(1))) ?? crypto.randomUUID();
  ids['attachment'] = (await first(db.select().from(attachments).limit(1))) ?? crypto.randomUUID();
  ids['shareLink'] = (await first(db.select().from(shareLinks).limit(1))) ?? crypto.randomUUID();
});
after(async () => {
  await t.close();
});

/** Every field name the API's zod schemas know, so generated objects reach real validation. */
const KEYS: string[] = [];
before(async () => {
  const dir = new URL('../../shared/schemas/', import.meta.url);
  for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
    const mod = (await import(new URL(file, dir).href)) as Record<string, unknown>;
    const found = new Set<string>();
    const seen = new Set<unknown>();
    const walk = (schema: unknown): void => {
      if (!(schema instanceof z.ZodType) || seen.has(schema)) return;
      seen.add(schema);
      const def = (schema as unknown as { _zod: { def: Record<string, unknown> } })._zod.def;
      const shape = def['shape'] as Record<string, unknown> | undefined;
      for (const [k, v] of Object.entries(shape ?? {})) {
        found.add(k);
        walk(v);
      }
      for (const k of ['element', 'innerType', 'in', 'out', 'valueType', 'left', 'right'])
        walk(def[k]);
      for (const o of (def['options'] as unknown[]) ?? []) walk(o);
    };
    Object.values(mod).forEach(walk);
    for (const k of found) if (!KEYS.includes(k)) KEYS.push(k);
  }
  KEYS.sort();
  assert.ok(KEYS.length > 40, `field names found in shared/schemas: ${KEYS.length}`);
});

const hostileString = fc.oneof(
  fc.constantFrom(
    '\u0000',
    'a\u0000b',
    'bell\u0007',
    'Title\r\nBEGIN:VEVENT',
    '=HYPERLINK("x")',
    '',
    '   ',
    'x'.repeat(10_001),
    '2026-02-31',
    '0000-01-01',
    '2026-13-01T25:61',
    '<script>alert(1)</script>',
    '\uD800',
    '__proto__',
    'NaN',
    '1e400',
  ),
  fc.string({ unit: 'binary', maxLength: 30 }),
  fc.string({ maxLength: 20 }),
);
const hostileNumber = fc.oneof(
  fc.constantFrom(0, -1, 1, 2_147_483_647, 2_147_483_648, -2_147_483_649, 1e308, 0.5, 2 ** 53 + 2),
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
);
const leaf = fc.oneof(
  hostileString,
  hostileNumber,
  fc.boolean(),
  fc.constant(null),
  fc.uuid(),
  fc.constantFrom('teacher', 'admin', 'endorse', 'submit', 'draft', 'private', 'school'),
);
const { value } = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    leaf,
    fc.array(tie('value'), { maxLength: 3 }),
    fc.dictionary(fc.constantFrom(...['a', 'title', 'qty', 'version']), tie('value'), {
      maxKeys: 3,
    }),
  ),
}));

/** A body: the route's sample with some fields made hostile and some added, or anything at all. */
function bodies(sample: Record<string, unknown>) {
  const keys = () => (KEYS.length ? KEYS : ['title']);
  const mutated = fc
    .tuple(
      fc.subarray(Object.keys(sample)),
      fc.array(value, { minLength: 0, maxLength: Object.keys(sample).length }),
      fc.dictionary(fc.constantFrom(...keys()), value, { maxKeys: 4 }),
    )
    .map(([chosen, values, extra]) => {
      const body: Record<string, unknown> = { ...extra, ...sample };
      chosen.forEach((k, i) => (body[k] = i < values.length ? values[i] : undefined));
      return body;
    });
  return fc.oneof(
    { weight: 6, arbitrary: mutated },
    { weight: 2, arbitrary: fc.dictionary(fc.constantFrom(...keys()), value, { maxKeys: 8 }) },
    { weight: 1, arbitrary: value },
  );
}

/** A digest of every row of every table a refused request must not touch. */
let tableNames: string[] | undefined;
async function databaseDigest(): Promise<string> {
  const db = t.database.db;
  // The tables do not change during the run: listed once, not before every request.
  const tables = (tableNames ??= (
    await db.execute<{ name: string }>(sql`
      select table_name as name from information_schema.tables
      where table_schema = 'public' and table_type = 'BASE TABLE'
        -- sessions are touched by every request; counters count failed sign-ins by design; the
        -- outbox's worker marks mail sent in the background.
        and table_name not in ('session', 'attempt_counters', 'outbox')
      order by table_name`)
  ).rows.map((r) => r.name));
  const parts = tables.map(
    (name) =>
      sql`select ${name} || ':' || coalesce(md5(string_agg(md5(x::text), '' order by md5(x::text))), '') as d from ${sql.identifier(name)} x`,
  );
  const rows = (await db.execute<{ d: string }>(sql.join(parts, sql` union all `))).rows;
  return createHash('sha256')
    .update(rows.map((r) => r.d).join('\n'))
    .digest('hex');
}

type Who = 'teacher' | 'admin' | 'anonymous';
interface Route {
  /** `file METHOD path` as declared in server/routes (the completeness check reads them). */
  declared: string;
  method: 'post' | 'put' | 'patch' | 'delete';
  url: () => string;
  who: Who;
  sample: Record<string, unknown>;
  /** DELETE routes take their version as a query. */
  query?: boolean;
}

const r = (
  declared: string,
  who: Who,
  url: () => string,
  sample: Record<string, unknown> = {},
  query = false,
): Route => {
  const method = declared.split(' ')[1]!.toLowerCase() as Route['method'];
  return { declared, method, url, who, sample, query };
};

const TOKEN = 'A'.repeat(43);
// Writes first, removals last (a removal that succeeds leaves later routes with a 404).
const ROUTES: Route[] = [
  r('auth.ts POST /sign-in', 'anonymous', () => '/api/auth/sign-in', {
    email: 'a@b.example',
    password: 'x',
  }),
  r('auth.ts POST /password-reset', 'anonymous', () => '/api/auth/password-reset', {
    email: 'a@b.example',
  }),
  r(
    'auth.ts POST /password-reset/complete',
    'anonymous',
    () => '/api/auth/password-reset/complete',
    { token: TOKEN, password: 'long enough pass 1' },
  ),
  r('invitations.ts POST /:token/accept', 'anonymous', () => `/api/invitations/${TOKEN}/accept`, {
    name: 'N',
    password: 'long enough pass 1',
  }),
  r(
    'trays.ts PUT /:token/lines/:partCode',
    'anonymous',
    () => `/api/trays/${TOKEN}/lines/${ids['code']}`,
    { out: true, back: false, missing: 0 },
  ),
  r('account.ts PATCH /', 'teacher', () => '/api/account', { name: 'Teacher' }),
  r('account.ts POST /password', 'teacher', () => '/api/account/password', {
    currentPassword: 'x',
    newPassword: 'y',
  }),
  r('account.ts PATCH /reminders', 'teacher', () => '/api/account/reminders', {
    version: 0,
    chargeReminders: true,
    leadMinutes: 30,
    morningSummary: true,
    summaryTime: '07:00',
  }),
  r('calendar-feed.ts POST /', 'teacher', () => '/api/account/calendar-feed', {}),
  r('members.ts POST /invitations', 'admin', () => '/api/members/invitations', {
    email: 'new@kestrel-ridge.example',
    role: 'teacher',
  }),
  r('members.ts PATCH /:id', 'admin', () => `/api/members/${ids['member']}`, {
    role: 'relief',
    status: 'active',
  }),
  r('members.ts POST /:id/resend', 'admin', () => `/api/members/${ids['member']}/resend`, {}),
  r('school.ts PUT /', 'admin', () => '/api/school', {
    version: 1,
    name: 'School',
    timezone: 'Australia/Adelaide',
  }),
  r('classes.ts POST /', 'admin', () => '/api/classes', {
    name: '5X',
    yearLevel: 5,
    studentCount: 24,
    devices: 8,
    teacherIds: [],
  }),
  r('classes.ts PATCH /:id', 'admin', () => `/api/classes/${ids['class']}`, {
    version: 1,
    name: '5Y',
  }),
  r('kit-types.ts POST /', 'admin', () => '/api/kit-types', { name: 'Fuzz kit' }),
  r('kit-types.ts PATCH /:id', 'admin', () => `/api/kit-types/${ids['kit']}`, {
    version: 1,
    name: 'Kit',
  }),
  r('kit-types.ts PUT /:id/parts', 'admin', () => `/api/kit-types/${ids['kit']}/parts`, {
    version: 1,
    parts: [{ code: 'Z-1', name: 'Z', qty: 1 }],
  }),
  r('kit-types.ts POST /:id/parts', 'admin', () => `/api/kit-types/${ids['kit']}/parts`, {
    version: 1,
    part: { code: 'Z-2', name: 'Z', qty: 1, category: 'other' },
  }),
  r(
    'kit-types.ts PATCH /:id/parts/:partId',
    'admin',
    () => `/api/kit-types/${ids['kit']}/parts/${ids['part']}`,
    { version: 1, name: 'P', qty: 2 },
  ),
  r(
    'kit-types.ts POST /:id/parts/import',
    'admin',
    () => `/api/kit-types/${ids['kit']}/parts/import`,
    { file: 'code,name,qty' },
  ),
  r(
    'kit-types.ts PUT /:id/parts/:code/photo',
    'admin',
    () => `/api/kit-types/${ids['kit']}/parts/${ids['code']}/photo`,
    { file: 'x' },
  ),
  r('tubs.ts POST /', 'admin', () => '/api/tubs', { kitTypeId: ids['kit'], label: 'Tub Z' }),
  r('tubs.ts PATCH /:id', 'admin', () => `/api/tubs/${ids['tub']}`, {
    version: 1,
    label: 'Tub',
    status: 'ready',
  }),
  r('tubs.ts POST /:id/audits', 'admin', () => `/api/tubs/${ids['tub']}/audits`, {
    version: 1,
    missing: [{ partCode: ids['code'], count: 1 }],
  }),
  r('outcomes.ts POST /frameworks', 'admin', () => '/api/outcomes/frameworks', {
    name: 'F',
    outcomes: [],
  }),
  r(
    'outcomes.ts POST /frameworks/:id/import',
    'admin',
    () => `/api/outcomes/frameworks/${ids['framework']}/import`,
    { file: 'x' },
  ),
  r('units.ts POST /', 'teacher', () => '/api/units', {
    title: 'Fuzz unit',
    yearLevel: 5,
    overview: '',
  }),
  r('units.ts PATCH /:id', 'teacher', () => `/api/units/${ids['unit']}`, {
    version: 1,
    title: 'Unit',
  }),
  r('units.ts PUT /:id/lesson-order', 'teacher', () => `/api/units/${ids['unit']}/lesson-order`, {
    version: 1,
    lessonIds: [ids['lesson']],
  }),
  r('units.ts POST /:id/lessons', 'teacher', () => `/api/units/${ids['unit']}/lessons`, {
    title: 'L',
    classId: ids['class'],
    kitTypeId: ids['kit'],
    startsAt: '2026-08-03T09:00',
    endsAt: '2026-08-03T10:00',
    groupSize: 3,
    tubIds: [],
  }),
  r('reuse.ts POST /:id/copy', 'teacher', () => `/api/units/${ids['unit']}/copy`, {
    title: 'Copy',
    shiftDays: 7,
  }),
  r('review.ts POST /:id/review', 'teacher', () => `/api/units/${ids['unit']}/review`, {
    action: 'submit',
    version: 1,
    message: 'm',
  }),
  r('review.ts POST /:id/comments', 'teacher', () => `/api/units/${ids['unit']}/comments`, {
    body: 'Text',
    lessonId: null,
  }),
  r('lessons.ts PATCH /:id', 'teacher', () => `/api/lessons/${ids['lesson']}`, {
    version: 1,
    title: 'L',
  }),
  r(
    'lessons.ts PUT /:id/activity-order',
    'teacher',
    () => `/api/lessons/${ids['lesson']}/activity-order`,
    { version: 1, activityIds: [ids['activity']] },
  ),
  r(
    'lessons.ts POST /:id/activities',
    'teacher',
    () => `/api/lessons/${ids['lesson']}/activities`,
    { title: 'A', kind: 'build', minutes: 10, materials: [] },
  ),
  r('prep.ts PUT /:id/prep/ticks', 'teacher', () => `/api/lessons/${ids['lesson']}/prep/ticks`, {
    taskKey: 'pull',
    done: true,
  }),
  r(
    'lesson-trays.ts POST /:id/trays/revoke',
    'teacher',
    () => `/api/lessons/${ids['lesson']}/trays/revoke`,
    {},
  ),
  r(
    'lesson-trays.ts POST /:id/pack-away',
    'teacher',
    () => `/api/lessons/${ids['lesson']}/pack-away`,
    { tubs: [], found: [] },
  ),
  r('share-links.ts POST /', 'teacher', () => `/api/lessons/${ids['lesson']}/share-links`, {
    email: 'relief.person@example.org',
    days: 2,
  }),
  r('activities.ts PATCH /:id', 'teacher', () => `/api/activities/${ids['activity']}`, {
    version: 1,
    title: 'A',
    minutes: 5,
  }),
  r(
    'activities.ts POST /:id/attachments',
    'teacher',
    () => `/api/activities/${ids['activity']}/attachments`,
    { file: 'x' },
  ),
  r(
    'kit-types.ts DELETE /:id/parts/:partId',
    'admin',
    () => `/api/kit-types/${ids['kit']}/parts/${ids['part']}`,
    { version: 1 },
    true,
  ),
  r(
    'kit-types.ts DELETE /:id/parts/:code/photo',
    'admin',
    () => `/api/kit-types/${ids['kit']}/parts/${ids['code']}/photo`,
  ),
  r(
    'activities.ts DELETE /attachments/:id',
    'teacher',
    () => `/api/activities/attachments/${ids['attachment']}`,
    { version: 1 },
    true,
  ),
  r('share-links.ts DELETE /:id', 'teacher', () => `/api/share-links/${ids['shareLink']}`),
  r(
    'activities.ts DELETE /:id',
    'teacher',
    () => `/api/activities/${ids['activity']}`,
    { version: 1 },
    true,
  ),
  r(
    'lessons.ts DELETE /:id',
    'teacher',
    () => `/api/lessons/${ids['lesson']}`,
    { version: 1 },
    true,
  ),
  r('units.ts DELETE /:id', 'teacher', () => `/api/units/${ids['unit']}`, { version: 1 }, true),
  r('tubs.ts DELETE /:id', 'admin', () => `/api/tubs/${ids['tub']}`, { version: 1 }, true),
  r('classes.ts DELETE /:id', 'admin', () => `/api/classes/${ids['class']}`, { version: 1 }, true),
  r(
    'kit-types.ts DELETE /:id',
    'admin',
    () => `/api/kit-types/${ids['kit']}`,
    { version: 1 },
    true,
  ),
  r('auth.ts POST /sign-out', 'teacher', () => '/api/auth/sign-out', {}),
];

/** `file METHOD path` of every write route declared in server/routes. */
function declaredWriteRoutes(): string[] {
  const dir = new URL('../../server/routes/', import.meta.url);
  const found: string[] = [];
  for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
    const text = readFileSync(new URL(file, dir), 'utf8');
    for (const m of text.matchAll(/router\.(post|put|patch|delete)\(\s*'([^']*)'/g))
      found.push(`${file} ${m[1]!.toUpperCase()} ${m[2]}`);
  }
  return found.sort();
}

const stringSeed = (s: string) =>
  createHash('sha256').update(`${SEED}:${s}`).digest().readInt32LE(0);

async function send(route: Route, body: unknown) {
  const b = route.who === 'teacher' ? teacher : route.who === 'admin' ? admin : anonymous;
  await b.ensureCsrf();
  let url = route.url();
  if (route.query) {
    const version = (body as Record<string, unknown> | null)?.['version'];
    url += `?version=${encodeURIComponent(typeof version === 'string' ? version : JSON.stringify(version ?? ''))}`;
  }
  let req = b.agent[route.method](url).set('X-XSRF-TOKEN', b.csrf);
  if (route.method !== 'delete' || !route.query)
    req = req.set('Content-Type', 'application/json').send(JSON.stringify(body ?? null));
  return req;
}

describe('generated payloads over every write route: never a 500, a refusal changes nothing', () => {
  it('the list below covers every write route declared in server/routes', () => {
    assert.deepEqual(
      ROUTES.map((x) => x.declared).sort(),
      declaredWriteRoutes(),
      'add a generated-payload entry for each new write route',
    );
  });

  for (const route of ROUTES) {
    it(route.declared, async () => {
      let digest = await databaseDigest();
      const seen = new Map<number, number>();
      await fc.assert(
        fc.asyncProperty(bodies(route.sample), async (body) => {
          const res = await send(route, body);
          seen.set(res.status, (seen.get(res.status) ?? 0) + 1);
          assert.ok(
            res.status < 500,
            `${res.status} for ${JSON.stringify(body)?.slice(0, 300)}: ${res.text.slice(0, 300)}`,
          );
          const now = await databaseDigest();
          if (res.status >= 400)
            assert.equal(
              now,
              digest,
              `${res.status} changed rows for ${JSON.stringify(body)?.slice(0, 300)}`,
            );
          digest = now;
        }),
        { numRuns: RUNS, seed: stringSeed(route.declared), endOnFailure: true },
      );
      if (process.env['FUZZ_REPORT'])
        console.log(route.declared, JSON.stringify(Object.fromEntries(seen)));
      // A route that reads a body must have refused some of these (routes without one may not).
      // (Checked at the default count, whose fixed seeds are known to reach a refusal.)
      if (Object.keys(route.sample).length && RUNS >= 12)
        assert.ok(
          [...seen.keys()].some((s) => s >= 400),
          'some payloads were refused',
        );
    });
  }
});
