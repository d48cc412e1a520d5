import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq } from 'drizzle-orm';
import { Browser, signedIn, testApp, type TestApp } from '../support/app.js';
import { invitations, outbox, users } from '../../server/db/schema/index.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

const ADMIN = 'admin@kestrel-ridge.example';
const OTHER_ADMIN = 'admin@banksia-flat.example';

/** Waits for the next message to `to` and returns the first link in it. */
async function linkSentTo(to: string): Promise<string> {
  await t.outbox.drain();
  for (let i = 0; i < 50; i++) {
    const m = t.smtp.messages().find((x) => x.to.includes(to));
    if (m) return m.links[0]!;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no message to ${to}`);
}

describe('roles are enforced on the server, route by route', () => {
  const cases: [string, 'get' | 'post', string, unknown][] = [
    ['list members', 'get', '/api/members', undefined],
    [
      'invite',
      'post',
      '/api/members/invitations',
      { email: 'x@kestrel-ridge.example', role: 'teacher' },
    ],
    ['read the mail outbox', 'get', '/api/dev/mail', undefined],
  ];
  for (const [what, method, url, body] of cases) {
    for (const email of [
      'lead@kestrel-ridge.example',
      'teacher@kestrel-ridge.example',
      'relief@kestrel-ridge.example',
    ]) {
      it(`${email.split('@')[0]} may not ${what} (403)`, async () => {
        const b = await signedIn(t.app, email);
        const res = method === 'get' ? await b.get(url) : await b.post(url, body);
        assert.equal(res.status, 403);
      });
    }
    it(`anonymous may not ${what} (401)`, async () => {
      const b = new Browser(t.app);
      const res = method === 'get' ? await b.get(url) : await b.post(url, body);
      assert.equal(res.status, 401);
    });
  }
  it('an admin may list members, only of their own school', async () => {
    const b = await signedIn(t.app, ADMIN);
    const res = await b.get('/api/members');
    assert.equal(res.status, 200);
    const emails = res.body.members.map((m: { email: string }) => m.email);
    assert.ok(emails.includes('teacher@kestrel-ridge.example'));
    assert.ok(!emails.includes(OTHER_ADMIN));
  });
});

describe('schools are isolated', () => {
  it("another school's admin sees none of the first school's members and cannot change them (404)", async () => {
    const other = await signedIn(t.app, OTHER_ADMIN);
    const list = await other.get('/api/members');
    assert.deepEqual(
      list.body.members.map((m: { email: string }) => m.email),
      [OTHER_ADMIN],
    );
    const [teacher] = await t.database.db
      .select()
      .from(users)
      .where(eq(users.email, 'teacher@kestrel-ridge.example'));
    const patch = await other.patch(`/api/members/${teacher!.id}`, { role: 'admin' });
    assert.equal(patch.status, 404);
    const resend = await other.post(`/api/members/${teacher!.id}/resend`);
    assert.equal(resend.status, 404);
    const [after] = await t.database.db.select().from(users).where(eq(users.id, teacher!.id));
    assert.equal(after!.role, 'teacher');
  });

  it('the mail outbox page shows only mail to the admin’s own school', async () => {
    await new Browser(t.app).post('/api/auth/password-reset', {
      email: 'teacher@kestrel-ridge.example',
    });
    await linkSentTo('teacher@kestrel-ridge.example');
    const other = await signedIn(t.app, OTHER_ADMIN);
    const res = await other.get('/api/dev/mail');
    assert.equal(res.status, 200);
    assert.equal(res.body.messages.length, 0);
  });
});

describe('invitations', () => {
  it('invites by e-mail, the link shows the invitation, accepting signs the person in', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const res = await admin.post('/api/members/invitations', {
      email: 'New.Teacher@Kestrel-Ridge.example',
      role: 'teacher',
    });
    assert.equal(res.status, 201);
    assert.equal(res.body.member.status, 'invited');
    assert.equal(res.body.member.email, 'new.teacher@kestrel-ridge.example');
    const link = await linkSentTo('new.teacher@kestrel-ridge.example');
    const token = new URL(link).pathname.split('/').pop()!;
    assert.equal(new URL(link).pathname, `/invitation/${token}`);
    // Only the hash is stored.
    const stored = await t.database.db.select().from(invitations);
    assert.ok(stored.every((i) => i.tokenHash !== token));
    const expires = new Date(res.body.member.invitationExpiresAt).getTime();
    assert.ok(Math.abs(expires - (Date.now() + 7 * 86_400_000)) < 60_000, 'expires in 7 days');

    const invitee = new Browser(t.app);
    const info = await invitee.get(`/api/invitations/${token}`);
    assert.equal(info.status, 200);
    assert.equal(info.body.schoolName, 'Kestrel Ridge Primary School');
    assert.equal(info.body.role, 'teacher');

    const weak = await invitee.post(`/api/invitations/${token}/accept`, {
      name: 'Riley',
      password: 'password1',
    });
    assert.equal(weak.status, 400, 'a common password is refused');

    const ok = await invitee.post(`/api/invitations/${token}/accept`, {
      name: 'Riley Ash',
      password: 'tubs of gears 42',
    });
    assert.equal(ok.status, 200);
    assert.equal(ok.body.user.name, 'Riley Ash');
    assert.equal((await invitee.get('/api/auth/me')).body.user.role, 'teacher');

    const again = await new Browser(t.app).post(`/api/invitations/${token}/accept`, {
      name: 'Z',
      password: 'another long one 9',
    });
    assert.equal(again.status, 404, 'the link works once');
  });

  it('refuses a member of this school (409) and bad input (400, nothing stored)', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const member = await admin.post('/api/members/invitations', {
      email: 'teacher@kestrel-ridge.example',
      role: 'teacher',
    });
    assert.equal(member.status, 409);
    assert.equal(member.body.error.code, 'already-member');
    const before = (await t.database.db.select().from(users)).length;
    const bad = await admin.post('/api/members/invitations', { email: 'nope', role: 'owner' });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'email',
      'role',
    ]);
    assert.equal((await t.database.db.select().from(users)).length, before);
  });

  // OWASP Authentication Cheat Sheet, "Authentication and Error Messages": a response must not
  // tell whether an account exists. The admin of one school must not learn that an address
  // belongs to another school: its invitation is answered exactly like a fresh address's.
  it("does not tell an admin that an address belongs to another school; the invitee's link does", async () => {
    const admin = await signedIn(t.app, ADMIN);
    const fresh = await admin.post('/api/members/invitations', {
      email: 'fresh.person@elsewhere.example',
      role: 'teacher',
    });
    const taken = await admin.post('/api/members/invitations', {
      email: OTHER_ADMIN,
      role: 'teacher',
    });
    assert.equal(taken.status, fresh.status);
    assert.equal(taken.status, 201);
    assert.deepEqual(Object.keys(taken.body.member).sort(), Object.keys(fresh.body.member).sort());
    assert.equal(taken.body.member.status, fresh.body.member.status);

    // The person who owns the address learns it from the link, and nothing of theirs changes.
    const link = await linkSentTo(OTHER_ADMIN);
    const token = new URL(link).pathname.split('/').pop()!;
    const invitee = new Browser(t.app);
    const info = await invitee.get(`/api/invitations/${token}`);
    assert.equal(info.status, 409);
    assert.equal(info.body.error.code, 'invitation-address-taken');
    const accept = await invitee.post(`/api/invitations/${token}/accept`, {
      name: 'Someone',
      password: 'a brand new passphrase 7',
    });
    assert.equal(accept.status, 409);
    const [own] = await t.database.db
      .select()
      .from(users)
      .where(and(eq(users.email, OTHER_ADMIN), eq(users.status, 'active')));
    assert.ok(own, 'the account at the other school is untouched');
    const other = await signedIn(t.app, OTHER_ADMIN);
    assert.equal((await other.get('/api/auth/me')).body.user.email, OTHER_ADMIN);
  });

  it('of two schools inviting one address, only one invitation can be accepted, even at once', async () => {
    const first = await signedIn(t.app, ADMIN);
    const second = await signedIn(t.app, OTHER_ADMIN);
    const email = 'two.schools@elsewhere.example';
    assert.equal(
      (await first.post('/api/members/invitations', { email, role: 'teacher' })).status,
      201,
    );
    await t.outbox.drain();
    assert.equal(
      (await second.post('/api/members/invitations', { email, role: 'lead' })).status,
      201,
    );
    await t.outbox.drain();
    const links: string[] = [];
    for (let i = 0; i < 50 && links.length < 2; i++) {
      links.splice(
        0,
        links.length,
        ...t.smtp
          .messages()
          .filter((m) => m.to.includes(email))
          .map((m) => m.links[0]!),
      );
      if (links.length < 2) await new Promise((r) => setTimeout(r, 50));
    }
    assert.equal(links.length, 2);
    const answers = await Promise.all(
      links.map((l) =>
        new Browser(t.app).post(`/api/invitations/${new URL(l).pathname.split('/').pop()}/accept`, {
          name: 'Sam Two',
          password: 'one school only please 5',
        }),
      ),
    );
    assert.deepEqual(answers.map((a) => a.status).sort(), [200, 409]);
    const joined = await t.database.db
      .select()
      .from(users)
      .where(and(eq(users.email, email), eq(users.status, 'active')));
    assert.equal(joined.length, 1);
  });

  it('resend makes the old link stop working', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const res = await admin.post('/api/members/invitations', {
      email: 'resend@kestrel-ridge.example',
      role: 'relief',
    });
    const first = await linkSentTo('resend@kestrel-ridge.example');
    const count = t.smtp.messages().length;
    assert.equal((await admin.post(`/api/members/${res.body.member.id}/resend`)).status, 202);
    await t.outbox.drain();
    await t.smtp.waitFor(count + 1);
    const second = t.smtp
      .messages()
      .find((m) => m.to.includes('resend@kestrel-ridge.example') && m.links[0] !== first)!;
    const oldToken = new URL(first).pathname.split('/').pop();
    const newToken = new URL(second.links[0]!).pathname.split('/').pop();
    assert.equal((await new Browser(t.app).get(`/api/invitations/${oldToken}`)).status, 404);
    assert.equal((await new Browser(t.app).get(`/api/invitations/${newToken}`)).status, 200);
  });

  it('an expired invitation is refused', async () => {
    const admin = await signedIn(t.app, ADMIN);
    await admin.post('/api/members/invitations', {
      email: 'late@kestrel-ridge.example',
      role: 'teacher',
    });
    const link = await linkSentTo('late@kestrel-ridge.example');
    await t.database.db.update(invitations).set({ expiresAt: new Date(Date.now() - 1000) });
    const token = new URL(link).pathname.split('/').pop();
    assert.equal((await new Browser(t.app).get(`/api/invitations/${token}`)).status, 404);
  });
});

describe('member changes', () => {
  it('changes a role and deactivates, which ends that person’s sessions', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const partner = await signedIn(t.app, 'partner@kestrel-ridge.example');
    const [row] = await t.database.db
      .select()
      .from(users)
      .where(eq(users.email, 'partner@kestrel-ridge.example'));
    const role = await admin.patch(`/api/members/${row!.id}`, { role: 'lead' });
    assert.equal(role.status, 200);
    assert.equal(role.body.member.role, 'lead');
    assert.equal(
      (await partner.get('/api/auth/me')).body.user.role,
      'lead',
      'the new role applies at once',
    );
    const off = await admin.patch(`/api/members/${row!.id}`, { status: 'deactivated' });
    assert.equal(off.body.member.status, 'deactivated');
    assert.equal((await partner.get('/api/auth/me')).status, 401);
    await admin.patch(`/api/members/${row!.id}`, { status: 'active', role: 'teacher' });
  });

  it('never leaves a school without an active admin', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const me = (await admin.get('/api/auth/me')).body.user;
    const res = await admin.patch(`/api/members/${me.id}`, { role: 'teacher' });
    assert.equal(res.status, 400);
    assert.equal(res.body.error.code, 'last-admin');
  });
});

describe('password reset', () => {
  it('answers the same whether or not the address exists, and mails only a real one', async () => {
    const before = (await t.database.db.select().from(outbox)).length;
    const a = await new Browser(t.app).post('/api/auth/password-reset', {
      email: 'nobody@kestrel-ridge.example',
    });
    const b = await new Browser(t.app).post('/api/auth/password-reset', {
      email: 'lead@kestrel-ridge.example',
    });
    assert.equal(a.status, 202);
    assert.equal(b.status, 202);
    assert.deepEqual(a.body, b.body);
    assert.equal((await t.database.db.select().from(outbox)).length, before + 1);
  });

  it('sets a new password once, and ends every session of that user', async () => {
    const email = 'lead@kestrel-ridge.example';
    const elsewhere = await signedIn(t.app, email);
    const count = t.smtp.messages().length;
    await new Browser(t.app).post('/api/auth/password-reset', { email });
    await t.outbox.drain();
    await t.smtp.waitFor(count + 1);
    const link = t.smtp.messages().find((m) => m.to.includes(email))!.links[0]!;
    const token = new URL(link).pathname.split('/').pop()!;
    const res = await new Browser(t.app).post('/api/auth/password-reset/complete', {
      token,
      password: 'kits packed by three',
    });
    assert.equal(res.status, 204);
    assert.equal((await elsewhere.get('/api/auth/me')).status, 401, 'other sessions ended');
    assert.equal((await new Browser(t.app).signIn(email, 'kits packed by three')).status, 200);
    const again = await new Browser(t.app).post('/api/auth/password-reset/complete', {
      token,
      password: 'yet another phrase',
    });
    assert.equal(again.status, 400);
    assert.equal(again.body.error.code, 'token-invalid');
  });
});

describe('account', () => {
  it('renames and changes the password with the current one', async () => {
    const b = await signedIn(t.app, 'relief@kestrel-ridge.example');
    assert.equal(
      (await b.patch('/api/account', { name: '  Robin T.  ' })).body.user.name,
      'Robin T.',
    );
    const wrong = await b.post('/api/account/password', {
      currentPassword: 'nope',
      newPassword: 'relief packs ready',
    });
    assert.equal(wrong.status, 400);
    assert.equal(wrong.body.error.code, 'wrong-password');
    const ok = await b.post('/api/account/password', {
      currentPassword: 'trayplan-demo',
      newPassword: 'relief packs ready',
    });
    assert.equal(ok.status, 204);
    assert.equal((await b.get('/api/auth/me')).status, 200, 'this session stays signed in');
  });
});

describe('outbox survives an SMTP outage', () => {
  it('keeps the message pending while SMTP refuses, and delivers it once SMTP is back', async () => {
    t.smtp.setRefusing(true);
    const admin = await signedIn(t.app, ADMIN);
    await admin.post('/api/members/invitations', {
      email: 'outage@kestrel-ridge.example',
      role: 'teacher',
    });
    await t.outbox.drain();
    const [row] = await t.database.db
      .select()
      .from(outbox)
      .where(eq(outbox.toAddress, 'outage@kestrel-ridge.example'));
    assert.equal(row!.status, 'pending');
    assert.ok(row!.attempts >= 1);
    assert.ok(row!.lastError);
    t.smtp.setRefusing(false);
    // Retry is due after the backoff; make it due now rather than waiting 5 s.
    await t.database.db
      .update(outbox)
      .set({ nextAttemptAt: new Date() })
      .where(eq(outbox.id, row!.id));
    await t.outbox.drain();
    const [sent] = await t.database.db.select().from(outbox).where(eq(outbox.id, row!.id));
    assert.equal(sent!.status, 'sent');
    assert.ok(t.smtp.messages().some((m) => m.to.includes('outage@kestrel-ridge.example')));
  });
});
