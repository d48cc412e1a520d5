/**
 * Share links (API.md, "Relief without an account"): who may make, list and withdraw them; the
 * token rules (random, at least 128 bits, base64url, stored only as a SHA-256, never logged); the
 * shared lesson and its pack without a cookie; 404 for an unknown token and 410 once withdrawn or
 * run out; a link to one lesson never shows another; the e-mail read back with mailparser.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { createHash } from 'node:crypto';
import { asc, eq } from 'drizzle-orm';
import supertest from 'supertest';
import { simpleParser } from 'mailparser';
import { DateTime } from 'luxon';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  LEAD,
  OTHER_ADMIN,
  RELIEF,
  TEACHER,
  browsers,
  type SignIn,
} from '../support/planning.js';
import {
  activities,
  attachments,
  lessons,
  shareLinks,
  units,
} from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let lessonA = '';
let lessonB = '';
/** Lesson C is moved to today (school's timezone) for the default end-of-day expiry. */
let lessonC = '';
/** Lesson 3: the demo relief teacher's (they read it but may not share it). */
let lessonR = '';
const ZONE = 'Australia/Adelaide';

const tokenOf = (url: string) => /\/pack\/([^/]+)$/.exec(url)![1]!;
const anonymous = () => supertest(t.app);

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  const rows = await db
    .select()
    .from(lessons)
    .where(eq(lessons.unitId, unit!.id))
    .orderBy(asc(lessons.position));
  [lessonA, lessonB, lessonR, lessonC] = [rows[0]!.id, rows[1]!.id, rows[2]!.id, rows[4]!.id];
  // Tokens tied to a lesson's day: lesson C happens today, at 11:10 in the school's timezone.
  const today = DateTime.now().setZone(ZONE).toISODate();
  await db
    .update(lessons)
    .set({ startsAt: `${today} 11:10:00`, endsAt: `${today} 12:00:00` })
    .where(eq(lessons.id, lessonC));
});
after(async () => {
  await t.close();
});

async function newLink(lessonId: string, body: object = {}) {
  const res = await (await as(TEACHER)).post(`/api/lessons/${lessonId}/share-links`, body);
  assert.equal(res.status, 201, res.text);
  return res.body as { id: string; url: string; expiresAt: string };
}

describe('making share links', () => {
  it('answers a base64url token of at least 128 bits under APP_URL/pack/, stored only hashed', async () => {
    const link = await newLink(lessonA);
    assert.match(link.url, /^http:\/\/127\.0\.0\.1:3999\/pack\/[A-Za-z0-9_-]+$/);
    const token = tokenOf(link.url);
    // RFC 4648 §5 base64url: 22 characters carry 132 bits, the least that holds 128.
    assert.ok(token.length >= 22, token);
    assert.ok(Buffer.from(token, 'base64url').length * 8 >= 128);
    const [row] = await t.database.db.select().from(shareLinks).where(eq(shareLinks.id, link.id));
    // FIPS 180-4 SHA-256 of the token, in hex, is all that is kept.
    assert.equal(row!.tokenHash, createHash('sha256').update(token).digest('hex'));
    const dump = await t.database.pool.query('SELECT row_to_json(s)::text AS j FROM share_links s');
    for (const r of dump.rows) assert.ok(!String(r.j).includes(token));
  });

  it('gives two links to one lesson different tokens', async () => {
    const a = await newLink(lessonA);
    const b = await newLink(lessonA);
    assert.notEqual(tokenOf(a.url), tokenOf(b.url));
  });

  it('runs a link to the end of the lesson’s school day by default (school’s timezone)', async () => {
    const link = await newLink(lessonC);
    // IANA time zone database through Luxon: midnight after today in Australia/Adelaide.
    const dayEnd = DateTime.now().setZone(ZONE).startOf('day').plus({ days: 1 });
    assert.equal(Date.parse(link.expiresAt), dayEnd.toMillis());
  });

  it('gives a link to a lesson whose day is over 24 hours', async () => {
    const before = Date.now();
    const link = await newLink(lessonA); // the demo's lessons are in August 2026, before today
    const at = Date.parse(link.expiresAt);
    assert.ok(at >= before + 24 * 3600_000 && at <= Date.now() + 24 * 3600_000 + 1000);
  });

  it('takes an explicit end within 14 days, and refuses one past or further with a 400', async () => {
    const inThreeDays = new Date(Date.now() + 3 * 24 * 3600_000);
    inThreeDays.setMilliseconds(0);
    const link = await newLink(lessonA, { expiresAt: inThreeDays.toISOString() });
    assert.equal(Date.parse(link.expiresAt), inThreeDays.getTime());
    const teacher = await as(TEACHER);
    const count = async () =>
      (await t.database.db.select().from(shareLinks).where(eq(shareLinks.lessonId, lessonB)))
        .length;
    const before = await count();
    for (const expiresAt of [
      new Date(Date.now() - 60_000).toISOString(),
      new Date(Date.now() + 15 * 24 * 3600_000).toISOString(),
      'next Tuesday',
      '2026-08-04T17:00', // no offset
    ]) {
      const res = await teacher.post(`/api/lessons/${lessonB}/share-links`, { expiresAt });
      assert.equal(res.status, 400, expiresAt);
      assert.equal(res.body.error.details[0].path, 'expiresAt');
    }
    const bad = await teacher.post(`/api/lessons/${lessonB}/share-links`, {
      email: 'not an address',
      extra: 1,
    });
    assert.equal(bad.status, 400);
    assert.equal(await count(), before, 'nothing stored for a refused request');
  });

  it('lets the lesson’s authors and the school’s admins share; others 403, 404 or 401', async () => {
    assert.equal(
      (await (await as(ADMIN)).post(`/api/lessons/${lessonA}/share-links`, {})).status,
      201,
    );
    // The relief teacher and the lead read the lesson but do not edit it.
    assert.equal(
      (await (await as(RELIEF)).post(`/api/lessons/${lessonR}/share-links`)).status,
      403,
    );
    assert.equal((await (await as(LEAD)).post(`/api/lessons/${lessonA}/share-links`)).status, 403);
    assert.equal((await (await as(LEAD)).get(`/api/lessons/${lessonA}/share-links`)).status, 403);
    // Another school's admin cannot tell the lesson exists.
    const other = await as(OTHER_ADMIN);
    assert.equal((await other.post(`/api/lessons/${lessonA}/share-links`)).status, 404);
    assert.equal((await other.get(`/api/lessons/${lessonA}/share-links`)).status, 404);
    const anon = new Browser(t.app);
    assert.equal((await anon.post(`/api/lessons/${lessonA}/share-links`)).status, 401);
    assert.equal((await anon.get(`/api/lessons/${lessonA}/share-links`)).status, 401);
    assert.equal(
      (await (await as(TEACHER)).post(`/api/lessons/not-an-id/share-links`)).status,
      404,
    );
  });
});

describe('opening a link without an account', () => {
  it('shows the lesson as the relief page does, with no cookie sent or set', async () => {
    const link = await newLink(lessonA);
    const res = await anonymous().get(`/api/share/${tokenOf(link.url)}`);
    assert.equal(res.status, 200, res.text);
    assert.equal(res.headers['set-cookie'], undefined);
    const [row] = await t.database.db.select().from(lessons).where(eq(lessons.id, lessonA));
    assert.equal(res.body.lesson.title, row!.title);
    assert.equal(res.body.lesson.reliefNotes, row!.reliefNotes);
    assert.ok(res.body.plan.groups.length > 0, 'groups and pull lists');
    assert.ok(res.body.plan.timeline.segments.length > 0, 'the timeline');
    assert.ok(res.body.cautions.some((c: { title: string }) => c.title === 'Small parts'));
    assert.ok(Array.isArray(res.body.lesson.activities[0].attachments));
    assert.equal(res.body.expiresAt, link.expiresAt);
    // Nothing else of the school: no ids of lessons, units, classes or people.
    assert.ok(!JSON.stringify(res.body).includes(lessonA));
    assert.equal(res.body.lesson.reliefTeacherId, undefined);
  });

  it('downloads the lesson pack as a PDF without a cookie', async () => {
    const link = await newLink(lessonA);
    const res = await anonymous()
      .get(`/api/share/${tokenOf(link.url)}/pack.pdf`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    assert.equal(res.status, 200);
    assert.equal(res.headers['content-type'], 'application/pdf');
    assert.equal(res.headers['set-cookie'], undefined);
    const pdf = await getDocument({ data: new Uint8Array(res.body as Buffer) }).promise;
    assert.ok(pdf.numPages >= 9, `a lesson pack has n + 8 pages, got ${pdf.numPages}`);
    await pdf.destroy();
  });

  it('answers 404 for an unknown or malformed token, in plain words', async () => {
    for (const token of ['A'.repeat(43), 'short', 'x'.repeat(150), '%00']) {
      const res = await anonymous().get(`/api/share/${token}`);
      assert.equal(res.status, 404, token);
      assert.match(res.body.error.message, /not known/);
    }
    assert.equal((await anonymous().get(`/api/share/${'B'.repeat(43)}/pack.pdf`)).status, 404);
  });

  it('answers 410 once withdrawn: listed with its time, and nobody else may withdraw it', async () => {
    const link = await newLink(lessonB, { email: 'cover@relief.example' });
    const token = tokenOf(link.url);
    assert.equal((await anonymous().get(`/api/share/${token}`)).status, 200);
    assert.equal((await (await as(OTHER_ADMIN)).delete(`/api/share-links/${link.id}`)).status, 404);
    assert.equal((await (await as(LEAD)).delete(`/api/share-links/${link.id}`)).status, 403);
    assert.equal((await new Browser(t.app).delete(`/api/share-links/${link.id}`)).status, 401);
    assert.equal((await anonymous().get(`/api/share/${token}`)).status, 200);
    const teacher = await as(TEACHER);
    assert.equal((await teacher.delete(`/api/share-links/${link.id}`)).status, 204);
    for (const url of [`/api/share/${token}`, `/api/share/${token}/pack.pdf`]) {
      const res = await anonymous().get(url);
      assert.equal(res.status, 410, url); // RFC 9110 §15.5.11: gone, and for good
      assert.match(res.body.error.message, /withdrawn/);
    }
    const list = await teacher.get(`/api/lessons/${lessonB}/share-links`);
    assert.equal(list.status, 200);
    const listed = list.body.links.find((l: { id: string }) => l.id === link.id);
    assert.equal(listed.email, 'cover@relief.example');
    assert.ok(listed.revokedAt);
    assert.deepEqual(Object.keys(listed).sort(), ['email', 'expiresAt', 'id', 'revokedAt']);
    assert.ok(!list.text.includes(token), 'the list never carries a token');
    assert.equal((await teacher.delete(`/api/share-links/${link.id}`)).status, 204);
    assert.equal((await teacher.delete(`/api/share-links/not-an-id`)).status, 404);
  });

  it('answers 410 once run out', async () => {
    const link = await newLink(lessonB);
    await t.database.db
      .update(shareLinks)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(shareLinks.id, link.id));
    const res = await anonymous().get(`/api/share/${tokenOf(link.url)}`);
    assert.equal(res.status, 410);
    assert.match(res.body.error.message, /run out/);
  });

  it('never shows another lesson, nor another lesson’s build instructions', async () => {
    const db = t.database.db;
    const [actB] = await db.select().from(activities).where(eq(activities.lessonId, lessonB));
    const [actA] = await db.select().from(activities).where(eq(activities.lessonId, lessonA));
    const png = Buffer.from(
      'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
      'base64',
    );
    const [fileA] = await db
      .insert(attachments)
      .values({
        activityId: actA!.id,
        filename: 'a.png',
        contentType: 'image/png',
        size: png.length,
        bytes: png,
      })
      .returning();
    const [fileB] = await db
      .insert(attachments)
      .values({
        activityId: actB!.id,
        filename: 'b.png',
        contentType: 'image/png',
        size: png.length,
        bytes: png,
      })
      .returning();
    const a = tokenOf((await newLink(lessonA)).url);
    const b = tokenOf((await newLink(lessonB)).url);
    const [rowA] = await db.select().from(lessons).where(eq(lessons.id, lessonA));
    const [rowB] = await db.select().from(lessons).where(eq(lessons.id, lessonB));
    assert.equal((await anonymous().get(`/api/share/${a}`)).body.lesson.title, rowA!.title);
    assert.equal((await anonymous().get(`/api/share/${b}`)).body.lesson.title, rowB!.title);
    const own = await anonymous().get(`/api/share/${a}/attachments/${fileA!.id}`);
    assert.equal(own.status, 200);
    assert.equal(own.headers['content-type'], 'image/png');
    assert.equal((await anonymous().get(`/api/share/${a}/attachments/${fileB!.id}`)).status, 404);
    const listed = (await anonymous().get(`/api/share/${a}`)).body.lesson.activities.flatMap(
      (x: { attachments: { id: string }[] }) => x.attachments.map((f) => f.id),
    );
    assert.ok(listed.includes(fileA!.id) && !listed.includes(fileB!.id));
  });
});

describe('the e-mailed link', () => {
  it('goes out through the outbox, readable as RFC 5322 (mailparser), and opens the lesson', async () => {
    const start = t.smtp.raw().length;
    const link = await newLink(lessonC, { email: 'Cover.Teacher@Relief.example' });
    await t.outbox.drain();
    await t.smtp.waitFor(start + 1);
    const mail = await simpleParser(t.smtp.raw()[start]!);
    const to = Array.isArray(mail.to) ? mail.to[0] : mail.to;
    assert.equal(to?.value[0]?.address, 'cover.teacher@relief.example');
    assert.match(mail.subject ?? '', /Lesson to cover/);
    assert.ok(mail.text?.includes(link.url), 'the link on a line of its own');
    const found = /\/pack\/([A-Za-z0-9_-]+)/.exec(mail.text ?? '')![1]!;
    assert.equal((await anonymous().get(`/api/share/${found}`)).status, 200);
  });
});

describe('tokens are never logged', () => {
  it('writes no token to the console while links are made, opened, refused and withdrawn', async () => {
    const written: string[] = [];
    const methods = ['log', 'info', 'warn', 'error', 'debug'] as const;
    const saved = methods.map((m) => console[m]);
    const out = process.stdout.write.bind(process.stdout);
    const err = process.stderr.write.bind(process.stderr);
    for (const m of methods)
      console[m] = (...args: unknown[]) => void written.push(args.map(String).join(' '));
    process.stdout.write = ((chunk: string | Uint8Array, ...rest: never[]) => {
      written.push(String(chunk));
      return out(chunk, ...rest);
    }) as typeof process.stdout.write;
    process.stderr.write = ((chunk: string | Uint8Array, ...rest: never[]) => {
      written.push(String(chunk));
      return err(chunk, ...rest);
    }) as typeof process.stderr.write;
    let token = '';
    try {
      const link = await newLink(lessonA, { email: 'someone@relief.example' });
      token = tokenOf(link.url);
      await anonymous().get(`/api/share/${token}`);
      await anonymous().get(`/api/share/${token}/pack.pdf`);
      await anonymous().get(`/api/share/${token}/attachments/00000000-0000-4000-8000-000000000000`);
      await (await as(TEACHER)).delete(`/api/share-links/${link.id}`);
      await anonymous().get(`/api/share/${token}`);
      await t.outbox.drain();
    } finally {
      methods.forEach((m, i) => (console[m] = saved[i]!));
      process.stdout.write = out;
      process.stderr.write = err;
    }
    assert.ok(token.length >= 22);
    assert.ok(!written.join('\n').includes(token));
  });
});
