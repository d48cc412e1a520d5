/**
 * Smaller sign-in and CSRF defects: anonymous CSRF tokens store nothing (OWASP CSRF Prevention
 * Cheat Sheet, "Signed Double-Submit Cookie"), a token is bound to the signed-in session, exactly
 * the configured proxy hops are trusted for the client address, and an invited-but-not-joined
 * address costs the same password hash as any other (OWASP Authentication Cheat Sheet,
 * "Authentication and Error Messages": response times must not tell accounts apart).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import supertest from 'supertest';
import { sql } from 'drizzle-orm';
import { createApp } from '../../server/app.js';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const sessionRows = async () =>
  Number((await t.database.db.execute(sql`SELECT count(*)::int AS n FROM "session"`)).rows[0]!.n);

function cookieValue(res: supertest.Response, name: string): string | undefined {
  const all = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  return all
    .find((c) => c.startsWith(`${name}=`))
    ?.split(';')[0]!
    .slice(name.length + 1);
}

describe('GET /api/auth/csrf without a session', () => {
  it('sets the token cookie and stores no session', async () => {
    const before = await sessionRows();
    for (let i = 0; i < 5; i++) {
      const res = await supertest(t.app).get('/api/auth/csrf');
      assert.equal(res.status, 204);
      assert.ok(cookieValue(res, 'XSRF-TOKEN'));
      assert.equal(cookieValue(res, 'trayplan.sid'), undefined, 'no session cookie');
    }
    assert.equal(await sessionRows(), before);
  });

  it('refuses a made-up token pair and a token from before sign-in', async () => {
    const forged = await supertest(t.app)
      .post('/api/auth/sign-in')
      .set('Cookie', 'XSRF-TOKEN=made.up')
      .set('X-XSRF-TOKEN', 'made.up')
      .send({ email: 'teacher@kestrel-ridge.example', password: 'trayplan-demo' });
    assert.equal(forged.status, 403);

    const b = new Browser(t.app);
    await b.ensureCsrf();
    const anonymous = b.csrf;
    assert.equal((await b.signIn('teacher@kestrel-ridge.example')).status, 200);
    assert.notEqual(b.csrf, anonymous, 'sign-in gives a new token');
    const stale = await b.agent
      .patch('/api/account')
      .set('Cookie', `XSRF-TOKEN=${encodeURIComponent(anonymous)}`)
      .set('X-XSRF-TOKEN', anonymous)
      .send({ name: 'Stale Token' });
    assert.equal(stale.status, 403);
    assert.equal((await b.patch('/api/account', { name: 'Sam Kowhai' })).status, 200);
  });
});

describe('trust proxy', () => {
  it('trusts exactly the configured hops, so a forged X-Forwarded-For cannot dodge the limit', async () => {
    const app = createApp(
      { ...t.ctx, config: { ...t.ctx.config, trustProxyHops: 2 } },
      { pruneSessions: false, clientDir: '/nonexistent' },
    );
    const b = new Browser(app);
    await b.ensureCsrf();
    const attempt = (forwardedFor: string, password = 'wrong') =>
      b.agent
        .post('/api/auth/sign-in')
        .set('X-XSRF-TOKEN', b.csrf)
        .set('X-Forwarded-For', forwardedFor)
        .send({ email: 'partner@kestrel-ridge.example', password });
    // Two proxies: the second appends 10.0.0.1's view, the first appends the real client.
    for (let i = 0; i < 5; i++) {
      assert.equal((await attempt(`192.0.2.${i}, 198.51.100.7, 10.0.0.1`)).status, 401);
    }
    assert.equal((await attempt('192.0.2.99, 198.51.100.7, 10.0.0.1')).status, 429);
    // Another real client behind the same proxies is not blocked.
    const other = await attempt('198.51.100.8, 10.0.0.1', 'trayplan-demo');
    assert.equal(other.status, 200);
  });
});

describe('sign-in timing', () => {
  it('an invited address that has not joined costs a full password hash', async () => {
    const admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
    const email = 'not-joined@kestrel-ridge.example';
    assert.equal(
      (await admin.post('/api/members/invitations', { email, role: 'teacher' })).status,
      201,
    );
    const time = async (address: string) => {
      const b = new Browser(t.app);
      await b.ensureCsrf();
      const start = performance.now();
      const res = await b.signIn(address, 'some wrong password');
      assert.equal(res.status, 401);
      return performance.now() - start;
    };
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
    const invited: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 5; i++) {
      invited.push(await time(email));
      unknown.push(await time(`nobody-${i}@kestrel-ridge.example`));
    }
    // An argon2id verification (m = 19456 KiB, t = 2) dominates both answers; without it the
    // invited answer would take a small fraction of the unknown one.
    assert.ok(
      median(invited) >= 0.6 * median(unknown),
      `invited ${median(invited).toFixed(1)} ms vs unknown ${median(unknown).toFixed(1)} ms`,
    );
  });
});
