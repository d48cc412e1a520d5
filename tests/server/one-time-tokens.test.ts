/**
 * One-time links are claimed atomically: of 8 parallel uses of one token exactly one wins
 * (OWASP Forgot Password Cheat Sheet: reset tokens are single use).
 */
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

const PARALLEL = 8;

/** The link of the one message sent to an address (each test uses its own address). */
async function linkSentTo(address: string): Promise<string> {
  await t.outbox.drain();
  for (let i = 0; i < 100; i++) {
    const mail = t.smtp.messages().find((m) => m.to.includes(address));
    if (mail) return mail.links[0]!;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No message reached ${address}`);
}

/** Browsers with their CSRF token already fetched, so the uses start together. */
async function browsers(n: number): Promise<Browser[]> {
  const list = Array.from({ length: n }, () => new Browser(t.app));
  await Promise.all(list.map((b) => b.ensureCsrf()));
  return list;
}

describe('password-reset token', () => {
  it('of 8 parallel uses exactly one sets the password', async () => {
    const email = 'partner@kestrel-ridge.example';
    await new Browser(t.app).post('/api/auth/password-reset', { email });
    const token = new URL(await linkSentTo(email)).pathname.split('/').pop()!;
    const passwords = Array.from({ length: PARALLEL }, (_, i) => `racing tubs number ${i} go`);
    const results = await Promise.all(
      (await browsers(PARALLEL)).map((b, i) =>
        b.post('/api/auth/password-reset/complete', { token, password: passwords[i] }),
      ),
    );
    const statuses = results.map((r) => r.status);
    assert.equal(statuses.filter((s) => s === 204).length, 1, `answers: ${statuses.join(' ')}`);
    assert.equal(statuses.filter((s) => s === 400).length, PARALLEL - 1);
    // The password that won is the one stored.
    const winner = passwords[statuses.indexOf(204)]!;
    assert.equal((await new Browser(t.app).signIn(email, winner)).status, 200);
  });
});

describe('invitation token', () => {
  it('of 8 parallel acceptances exactly one makes the account', async () => {
    const email = 'racer@kestrel-ridge.example';
    const admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
    assert.equal(
      (await admin.post('/api/members/invitations', { email, role: 'teacher' })).status,
      201,
    );
    const token = new URL(await linkSentTo(email)).pathname.split('/').pop()!;
    const results = await Promise.all(
      (await browsers(PARALLEL)).map((b, i) =>
        b.post(`/api/invitations/${token}/accept`, {
          name: `Racer ${i}`,
          password: `racing tubs number ${i} go`,
        }),
      ),
    );
    const statuses = results.map((r) => r.status);
    assert.equal(statuses.filter((s) => s === 200).length, 1, `answers: ${statuses.join(' ')}`);
    assert.equal(statuses.filter((s) => s === 404).length, PARALLEL - 1);
    const i = statuses.indexOf(200);
    const me = await new Browser(t.app).signIn(email, `racing tubs number ${i} go`);
    assert.equal(me.status, 200);
    assert.equal(me.body.user.name, `Racer ${i}`);
  });
});
