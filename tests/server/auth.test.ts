import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import supertest from 'supertest';
import { eq } from 'drizzle-orm';
import { simpleParser } from 'mailparser';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { users } from '../../server/db/schema/index.js';
import { createApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { openDatabase } from '../../server/db/client.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const TEACHER = 'teacher@kestrel-ridge.example';

function sid(res: supertest.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  return cookies.find((c) => c.startsWith('trayplan.sid='))?.split(';')[0];
}

describe('sign-in', () => {
  it('signs in with the right password and answers the user', async () => {
    const b = new Browser(t.app);
    const res = await b.signIn(TEACHER);
    assert.equal(res.status, 200);
    assert.equal(res.body.user.email, TEACHER);
    assert.equal(res.body.user.role, 'teacher');
    assert.equal(res.body.user.schoolName, 'Kestrel Ridge Primary School');
    assert.equal('passwordHash' in res.body.user, false);
    const me = await b.get('/api/auth/me');
    assert.equal(me.status, 200);
    assert.equal(me.body.user.id, res.body.user.id);
  });

  it('GET /api/auth/session answers 200 with null signed out and the user signed in (/me stays 401)', async () => {
    const b = new Browser(t.app);
    const out = await b.get('/api/auth/session');
    assert.equal(out.status, 200);
    assert.deepEqual(out.body, { user: null });
    assert.equal((await b.get('/api/auth/me')).status, 401, 'API.md: /me is 401 signed out');
    await b.signIn(TEACHER);
    const inside = await b.get('/api/auth/session');
    assert.equal(inside.status, 200);
    assert.deepEqual(inside.body, (await b.get('/api/auth/me')).body);
  });

  it('answers the same 401 for a wrong password and an unknown address', async () => {
    const wrong = await new Browser(t.app).signIn(TEACHER, 'not-the-password');
    const unknown = await new Browser(t.app).signIn(
      'nobody@kestrel-ridge.example',
      'not-the-password',
    );
    assert.equal(wrong.status, 401);
    assert.equal(unknown.status, 401);
    assert.deepEqual(wrong.body, unknown.body);
  });

  it('refuses a deactivated account like a wrong password', async () => {
    await t.database.db
      .update(users)
      .set({ status: 'deactivated' })
      .where(eq(users.email, 'partner@kestrel-ridge.example'));
    const res = await new Browser(t.app).signIn('partner@kestrel-ridge.example');
    assert.equal(res.status, 401);
    await t.database.db
      .update(users)
      .set({ status: 'active' })
      .where(eq(users.email, 'partner@kestrel-ridge.example'));
  });

  it('gives a new session id at sign-in (no session fixation)', async () => {
    // The CSRF route stores no session any more (signed double-submit token), so the session
    // that sign-in could inherit comes from an earlier sign-in of the same browser.
    const b = new Browser(t.app);
    const first = sid(await b.signIn(TEACHER));
    assert.ok(first);
    const res = await b.signIn(TEACHER);
    const signedInSid = sid(res);
    assert.ok(signedInSid);
    assert.notEqual(signedInSid, first);
    // The old id no longer names a signed-in session.
    const replay = await supertest(t.app).get('/api/auth/me').set('Cookie', first!);
    assert.equal(replay.status, 401);
  });

  it('sets an httpOnly, SameSite=Lax session cookie and a readable CSRF cookie', async () => {
    const res = await new Browser(t.app).signIn(TEACHER);
    const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    const session = cookies.find((c) => c.startsWith('trayplan.sid='))!;
    assert.match(session, /HttpOnly/i);
    assert.match(session, /SameSite=Lax/i);
    const csrf = cookies.find((c) => c.startsWith('XSRF-TOKEN='))!;
    assert.doesNotMatch(csrf, /HttpOnly/i);
  });

  it('ends the session at sign-out', async () => {
    const b = await signedIn(t.app, TEACHER);
    const cookie = sid(await b.get('/api/auth/me')) ?? '';
    const out = await b.post('/api/auth/sign-out');
    assert.equal(out.status, 204);
    assert.equal((await b.get('/api/auth/me')).status, 401);
    if (cookie)
      assert.equal((await supertest(t.app).get('/api/auth/me').set('Cookie', cookie)).status, 401);
  });

  it('rejects a malformed body with every issue listed', async () => {
    const res = await new Browser(t.app).post('/api/auth/sign-in', { email: 'not-an-address' });
    assert.equal(res.status, 400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    assert.deepEqual(paths, ['email', 'password']);
  });
});

describe('CSRF', () => {
  it('refuses a change without the X-XSRF-TOKEN header with 403', async () => {
    const b = await signedIn(t.app, TEACHER);
    const res = await b.patch('/api/account', { name: 'Changed' }, { csrf: false });
    assert.equal(res.status, 403);
    assert.equal(res.body.error.code, 'csrf');
    const me = await b.get('/api/auth/me');
    assert.notEqual(me.body.user.name, 'Changed');
  });

  it('refuses a wrong token and accepts the right one', async () => {
    const b = await signedIn(t.app, TEACHER);
    const wrong = await b.agent
      .patch('/api/account')
      .set('X-XSRF-TOKEN', 'forged')
      .send({ name: 'X' });
    assert.equal(wrong.status, 403);
    const right = await b.patch('/api/account', { name: 'Sam Kowhai' });
    assert.equal(right.status, 200);
  });
});

describe('throttling failed sign-ins', () => {
  it('answers 429 with Retry-After after 5 failures for one address (RFC 6585 §4)', async () => {
    const b = new Browser(t.app);
    const email = 'lead@kestrel-ridge.example';
    for (let i = 0; i < 5; i++) assert.equal((await b.signIn(email, `wrong-${i}`)).status, 401);
    const blocked = await b.signIn(email, 'wrong-again');
    assert.equal(blocked.status, 429);
    const retry = Number(blocked.headers['retry-after']);
    assert.ok(retry > 0 && retry <= 900, `Retry-After ${retry} within the 15-minute window`);
    assert.equal(blocked.body.error.code, 'throttled');
    // Even the right password waits until the window passes.
    assert.equal((await b.signIn(email)).status, 429);
  });

  it('does not count successful sign-ins', async () => {
    const b = new Browser(t.app);
    for (let i = 0; i < 8; i++)
      assert.equal((await b.signIn('relief@kestrel-ridge.example')).status, 200);
  });
});

describe('health', () => {
  it('answers ok with the database up', async () => {
    const res = await supertest(t.app).get('/api/health');
    assert.equal(res.status, 200);
    assert.deepEqual(res.body, { status: 'ok', db: 'ok' });
  });

  it('answers 503 with db down when PostgreSQL is unreachable', async () => {
    const dead = openDatabase('postgres://trayplan@127.0.0.1:1/none', 1);
    const app = createApp(
      {
        db: dead.db,
        pool: dead.pool,
        config: loadConfig({ databaseUrl: 'x', smtpUrl: 'x' }),
        kickMail: () => {},
      },
      { pruneSessions: false, clientDir: '/nonexistent' },
    );
    const res = await supertest(app).get('/api/health');
    assert.equal(res.status, 503);
    assert.equal(res.body.db, 'down');
    await dead.pool.end();
  });
});

describe('errors', () => {
  it('answers unknown API paths with the JSON error shape', async () => {
    const res = await supertest(t.app).get('/api/no-such-thing');
    assert.equal(res.status, 404);
    assert.equal(res.body.error.code, 'not-found');
  });

  it('answers malformed JSON with 400, not 500', async () => {
    const b = new Browser(t.app);
    await b.ensureCsrf();
    const res = await b.agent
      .post('/api/auth/sign-in')
      .set('X-XSRF-TOKEN', b.csrf)
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    assert.equal(res.status, 400);
    assert.equal(res.body.error.code, 'invalid-json');
  });

  it('sends helmet headers and a strict Content-Security-Policy', async () => {
    const res = await supertest(t.app).get('/api/health');
    const csp = String(res.headers['content-security-policy']);
    assert.match(csp, /default-src 'self'/);
    // CSP Level 3 §6.1.11 (script-src): only the app's own files run; no inline script, no eval.
    assert.match(csp, /script-src 'self'(;|$)/);
    assert.doesNotMatch(/script-src ([^;]*)/.exec(csp)![1]!, /unsafe-inline|nonce-|sha256-/);
    assert.doesNotMatch(csp, /unsafe-eval/);
    assert.equal(res.headers['x-content-type-options'], 'nosniff');
  });
});

describe('mail messages are RFC 5322', () => {
  it('carries Date, From, To, Subject, Message-ID and MIME-Version headers', async () => {
    const start = t.smtp.raw().length;
    await new Browser(t.app).post('/api/auth/password-reset', { email: TEACHER });
    await t.outbox.drain();
    await t.smtp.waitFor(t.smtp.messages().length || 1);
    const raw = t.smtp.raw().slice(start).at(-1)!;
    const mail = await simpleParser(raw);
    // RFC 5322 §3.6: Date and From are required; we also expect To, Subject and Message-ID.
    for (const h of ['date', 'from', 'to', 'subject', 'message-id', 'mime-version']) {
      assert.ok(mail.headers.has(h), `header ${h} present`);
    }
    assert.ok(mail.date instanceof Date && !Number.isNaN(mail.date.getTime()));
  });
});
