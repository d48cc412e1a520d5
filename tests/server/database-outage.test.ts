/**
 * While PostgreSQL is unreachable every API route answers 503 with Retry-After and one clear
 * message (RFC 9110 §15.6.4: 503 "may send a Retry-After header field"), never a 500; when it is
 * back, the same session works again without a restart. The outage is a TCP proxy that resets
 * every connection and refuses new ones.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import supertest from 'supertest';
import { createApp } from '../../server/app.js';
import { openDatabase, type Database } from '../../server/db/client.js';
import { Browser } from '../support/app.js';
import { testApp, type TestApp } from '../support/app.js';
import { tcpProxy, type TcpProxy } from '../support/tcp-proxy.js';

let t: TestApp;
let proxy: TcpProxy;
let database: Database;
let app: ReturnType<typeof createApp>;

before(async () => {
  t = await testApp();
  const url = new URL(t.database.url);
  proxy = await tcpProxy(url.hostname, Number(url.port));
  url.port = String(proxy.port);
  database = openDatabase(url.toString(), 4);
  app = createApp(
    { ...t.ctx, db: database.db, pool: database.pool },
    { pruneSessions: false, clientDir: '/nonexistent' },
  );
});
after(async () => {
  await database.pool.end();
  await proxy.close();
  await t.close();
});

describe('a database outage', () => {
  it('answers 503 with Retry-After on every kind of route, then recovers by itself', async () => {
    const teacher = new Browser(app);
    assert.equal((await teacher.signIn('teacher@kestrel-ridge.example')).status, 200);
    const units = await teacher.get('/api/units');
    assert.equal(units.status, 200);
    const unit = units.body.units[0];

    proxy.cut();
    const answers = [
      await teacher.get('/api/auth/me'),
      await teacher.get('/api/units'),
      await teacher.get(`/api/units/${unit.id}`),
      await teacher.patch(`/api/units/${unit.id}`, { version: unit.version, title: 'Changed' }),
      await new Browser(app).post('/api/auth/sign-in', {
        email: 'lead@kestrel-ridge.example',
        password: 'whatever-it-is',
      }),
    ];
    for (const [i, res] of answers.entries()) {
      assert.equal(res.status, 503, `request ${i + 1}: ${res.status}`);
      const retry = Number(res.headers['retry-after']);
      assert.ok(Number.isInteger(retry) && retry > 0, 'Retry-After in seconds');
      assert.equal(res.body.error.code, 'database-unavailable');
      assert.match(res.body.error.message, /database/i);
    }
    assert.equal((await supertest(app).get('/api/health')).status, 503);

    proxy.restore();
    const me = await teacher.get('/api/auth/me');
    assert.equal(me.status, 200, 'the same session works again');
    assert.equal((await supertest(app).get('/api/health')).status, 200);
    const still = await teacher.get(`/api/units/${unit.id}`);
    assert.equal(still.body.title, unit.title, 'the refused edit changed nothing');
  });
});
