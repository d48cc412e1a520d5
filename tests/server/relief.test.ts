import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

describe('relief', () => {
  it('lists the lessons assigned to the relief teacher, and they can read each one’s prep', async () => {
    const relief = await signedIn(t.app, 'relief@kestrel-ridge.example');
    const res = await relief.get('/api/relief/lessons');
    assert.equal(res.status, 200, res.text);
    // The demo seed assigns the relief teacher to the Rescue Rovers lesson of 4 August.
    assert.ok(res.body.lessons.length >= 1);
    assert.ok(
      res.body.lessons.some((l: { startsAt: string }) => l.startsAt.startsWith('2026-08-04')),
    );
    const id = res.body.lessons[0].id;
    assert.equal((await relief.get(`/api/lessons/${id}/prep`)).status, 200);
  });

  it('answers 403 for other roles, 401 anonymous, and lists relief teachers to teachers only', async () => {
    const teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
    assert.equal((await teacher.get('/api/relief/lessons')).status, 403);
    assert.equal((await new Browser(t.app).get('/api/relief/lessons')).status, 401);
    const list = await teacher.get('/api/relief/teachers');
    assert.deepEqual(
      list.body.teachers.map((x: { email: string }) => x.email),
      ['relief@kestrel-ridge.example'],
    );
    const lead = await signedIn(t.app, 'lead@kestrel-ridge.example');
    assert.equal((await lead.get('/api/relief/teachers')).status, 403);
    const other = await signedIn(t.app, 'admin@banksia-flat.example');
    assert.deepEqual((await other.get('/api/relief/teachers')).body.teachers, []);
  });
});
