/**
 * Bad input that used to answer 500 answers 400 naming the field and changes nothing: a version
 * beyond PostgreSQL's integer range (PostgreSQL docs §8.1.1: integer is -2147483648 to
 * +2147483647), impossible or out-of-range dates, and NUL bytes (PostgreSQL text cannot hold
 * U+0000) in bodies and queries.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';

let t: TestApp;
let teacher: Browser;
let admin: Browser;
let unit: { id: string; version: number; title: string; overview: string };
before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
  const list = await teacher.get('/api/units?scope=mine');
  const first = list.body.units[0];
  unit = (await teacher.get(`/api/units/${first.id}`)).body;
});
after(async () => {
  await t.close();
});

const paths = (res: { body: { error: { details?: { path: string }[] } } }) =>
  (res.body.error.details ?? []).map((d) => d.path);

async function unchanged() {
  const now = (await teacher.get(`/api/units/${unit.id}`)).body;
  assert.equal(now.version, unit.version);
  assert.equal(now.title, unit.title);
}

describe('versions beyond PostgreSQL integer', () => {
  for (const version of [2_147_483_648, 1e15]) {
    it(`PATCH a unit with version ${version} is 400 on version`, async () => {
      const res = await teacher.patch(`/api/units/${unit.id}`, { version, title: 'Changed' });
      assert.equal(res.status, 400, res.text);
      assert.deepEqual(paths(res), ['version']);
      await unchanged();
    });
  }

  it('DELETE a unit with ?version=99999999999 is 400, the unit stays', async () => {
    const res = await teacher.delete(`/api/units/${unit.id}?version=99999999999`);
    assert.equal(res.status, 400, res.text);
    assert.deepEqual(paths(res), ['version']);
    await unchanged();
  });

  it('PATCH a kit type with version 2147483648 is 400', async () => {
    const kits = (await admin.get('/api/kit-types')).body;
    const kit = (kits.kitTypes ?? kits)[0];
    const res = await admin.patch(`/api/kit-types/${kit.id}`, {
      version: 2_147_483_648,
      name: 'Changed',
    });
    assert.equal(res.status, 400, res.text);
    assert.deepEqual(paths(res), ['version']);
  });
});

describe('impossible dates in queries', () => {
  it('GET /api/conflicts?from=2026-02-31 is 400 on from', async () => {
    const res = await teacher.get('/api/conflicts?from=2026-02-31&to=2026-03-10');
    assert.equal(res.status, 400, res.text);
    assert.deepEqual(paths(res), ['from']);
  });

  it('GET /api/agenda?week=0000-01-01 is 400 on week (there is no year 0 in PostgreSQL)', async () => {
    const res = await teacher.get('/api/agenda?week=0000-01-01');
    assert.equal(res.status, 400, res.text);
    assert.deepEqual(paths(res), ['week']);
  });
});

describe('NUL bytes', () => {
  it('in a single-line field, a Markdown field and a search query are 400 naming the field', async () => {
    const title = await teacher.patch(`/api/units/${unit.id}`, {
      version: unit.version,
      title: 'Rovers\u0000',
    });
    assert.equal(title.status, 400);
    assert.deepEqual(paths(title), ['title']);
    const overview = await teacher.patch(`/api/units/${unit.id}`, {
      version: unit.version,
      overview: 'Build\u0000day',
    });
    assert.equal(overview.status, 400);
    assert.deepEqual(paths(overview), ['overview']);
    await unchanged();
    const search = await teacher.get('/api/units?scope=library&q=gear%00s');
    assert.equal(search.status, 400, search.text);
    assert.deepEqual(paths(search), ['q']);
  });
});
