/**
 * Sign-in throttling as API.md "Sign-in throttling" sets it, after OWASP's Authentication Cheat
 * Sheet ("Login Throttling": throttle per account and source so an attacker cannot lock a user out).
 * Clients connect from different loopback source addresses (Linux accepts any 127.0.0.0/8 source
 * to a server on 127.0.0.1), standing for different machines; `trust proxy` stays off.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { sql } from 'drizzle-orm';
import { createApp } from '../../server/app.js';
import { testApp, type TestApp } from '../support/app.js';
import { listen, LoopbackClient } from '../support/loopback.js';

let t: TestApp;
let server: Awaited<ReturnType<typeof listen>>;
before(async () => {
  t = await testApp();
  server = await listen(t.app);
});
after(async () => {
  await server.close();
  await t.close();
});

const from = (address: string) => new LoopbackClient(server.port, address);

describe('sign-in throttling per account and address', () => {
  it('answers 429 with Retry-After after 5 wrong passwords from one address, not elsewhere', async () => {
    const email = 'lead@kestrel-ridge.example';
    const attacker = from('127.0.0.2');
    for (let i = 0; i < 5; i++) {
      assert.equal((await attacker.signIn(email, `wrong-${i}`)).status, 401);
    }
    const blocked = await attacker.signIn(email, 'wrong-again');
    // RFC 6585 §4: 429 Too Many Requests, with Retry-After (RFC 9110 §10.2.3, delay-seconds).
    assert.equal(blocked.status, 429);
    const retry = Number(blocked.headers['retry-after']);
    assert.ok(retry > 0 && retry <= 900, `Retry-After ${retry} within the 15-minute window`);
    assert.equal(blocked.body.error.code, 'throttled');
    // That pair stays blocked even with the right password…
    assert.equal((await attacker.signIn(email)).status, 429);
    // …but the owner on another machine signs in (OWASP: no lock-out by someone else).
    const owner = await from('127.0.0.3').signIn(email);
    assert.equal(owner.status, 200);
  });

  it('counts only wrong passwords: malformed sign-ins do not add up', async () => {
    const client = from('127.0.0.4');
    for (let i = 0; i < 40; i++) {
      const res = await client.post('/api/auth/sign-in', { email: 'not an address' });
      assert.equal(res.status, 400);
    }
    assert.equal((await client.signIn('teacher@kestrel-ridge.example')).status, 200);
  });

  it('allows 100 failures per address in 15 minutes (a school behind one address), then 429', async () => {
    const school = from('127.0.0.5');
    for (let i = 0; i < 100; i++) {
      // Different accounts, 5 each, so only the per-address limit can stop them.
      const res = await school.signIn(`nobody-${Math.floor(i / 5)}@elsewhere.example`, 'wrong');
      assert.equal(res.status, 401, `failure ${i + 1} is still answered 401`);
    }
    const next = await from('127.0.0.5').signIn('partner@kestrel-ridge.example');
    assert.equal(next.status, 429);
    assert.ok(Number(next.headers['retry-after']) > 0);
    // Another address is not affected.
    assert.equal((await from('127.0.0.6').signIn('partner@kestrel-ridge.example')).status, 200);
  });
});

describe('failures of one account from many addresses', () => {
  it('never block the right password, slow the answers and e-mail the owner once', async () => {
    const email = 'relief@kestrel-ridge.example';
    for (let i = 1; i <= 12; i++) {
      const res = await from(`127.0.1.${i}`).signIn(email, 'wrong');
      assert.equal(res.status, 401, `failure ${i} from its own address is a 401, never a 429`);
    }
    const right = await from('127.0.1.50').signIn(email);
    assert.equal(right.status, 200);
    // Slowed down: at least the first step of the delay (server/auth/throttle.ts).
    assert.ok(right.ms >= 250, `answer took ${Math.round(right.ms)} ms`);
    await t.outbox.drain();
    await new Promise((r) => setTimeout(r, 300));
    const warnings = t.smtp
      .messages()
      .filter((m) => m.to.includes(email) && /sign in/i.test(m.subject));
    assert.equal(warnings.length, 1, 'exactly one warning e-mail to the owner');
  });
});

describe('counts live in PostgreSQL', () => {
  it('a second app on the same database sees the first one’s failures', async () => {
    const email = 'admin@banksia-flat.example';
    for (let i = 0; i < 5; i++) {
      assert.equal((await from('127.0.2.1').signIn(email, 'wrong')).status, 401);
    }
    const second = await listen(createApp(t.ctx, { pruneSessions: false, clientDir: '/none' }));
    try {
      const res = await new LoopbackClient(second.port, '127.0.2.1').signIn(email, 'wrong');
      assert.equal(res.status, 429);
    } finally {
      await second.close();
    }
    const rows = await t.database.db.execute(sql`SELECT count(*)::int AS n FROM attempt_counters`);
    assert.ok(Number(rows.rows[0]!.n) > 0);
  });
});
