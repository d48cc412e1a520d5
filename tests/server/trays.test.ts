/**
 * The group's tray (API.md, "The group's tray and pack-away"): codes on the printed labels read
 * back from the pixels, the tray page's answer against the plan, ticks saved without an account,
 * the token rules (404 unknown, 410 revoked or past the lesson's day, one group per token, never
 * logged) and the teacher's board.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq } from 'drizzle-orm';
import supertest from 'supertest';
import { randomBytes } from 'node:crypto';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { OTHER_ADMIN, RELIEF, TEACHER } from '../support/planning.js';
import { demoLessonId, moveLesson, readLabels, type PrintedLabel } from '../support/trays.js';
import { attemptCounters, trayLines, trayTokens } from '../../server/db/schema/index.js';
import { trayViewSchema, type TrayView } from '../../shared/schemas/trays.js';
import type { PrepPlan } from '../../shared/prep/index.js';

let t: TestApp;
let teacher: Browser;
let lessonId = '';
let plan: PrepPlan;
let labels: PrintedLabel[] = [];
const tokenOf = (label: PrintedLabel) => label.qr!.split('/tray/')[1]!;
/** A client with no cookies at all: the token alone is the credential. */
const anyone = () => supertest(t.app);

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, TEACHER);
  lessonId = await demoLessonId(t.database.db);
  await moveLesson(t.database.db, lessonId, 1);
  plan = (await teacher.get(`/api/lessons/${lessonId}/prep`)).body as PrepPlan;
  labels = await readLabels(teacher, lessonId);
});
after(async () => {
  await t.close();
});

describe('tray labels', () => {
  it('print one QR code per group that opens {APP_URL}/tray/{token}, a token of 22+ base64url characters', () => {
    assert.equal(labels.length, plan.groups.length);
    for (const label of labels) {
      // The test app's appUrl is http://127.0.0.1:3999; API.md fixes the path and the token shape.
      assert.match(label.qr ?? '', /^http:\/\/127\.0\.0\.1:3999\/tray\/[A-Za-z0-9_-]{22,}$/);
    }
    assert.equal(new Set(labels.map(tokenOf)).size, labels.length);
  });

  it('the page the QR opens shows the same quantities as the plan, group by group', async () => {
    for (const [i, group] of plan.groups.entries()) {
      assert.ok(labels[i]!.text.includes(`Group ${group.number}`), labels[i]!.text);
      const res = await anyone().get(`/api/trays/${tokenOf(labels[i]!)}`);
      assert.equal(res.status, 200);
      const view: TrayView = trayViewSchema.parse(res.body);
      assert.equal(view.group.number, group.number);
      assert.equal(view.group.homeTub, group.homeTub);
      assert.equal(view.group.controllerLabel, group.controllerLabel);
      assert.deepEqual(
        view.group.lines.map((l) => [l.partCode, l.qty]),
        group.lines.map((l) => [l.partCode, l.allocated]),
      );
    }
  });

  it('print the short code under each QR code; typed at /tray it gives the same token', async () => {
    for (const label of labels) {
      const code = /\b([0-9A-Z]{4}-[0-9A-Z]{4})\b/.exec(label.text)?.[1];
      assert.ok(code, label.text);
      const res = await anyone().get(`/api/trays/by-code/${code.toLowerCase().replace('-', ' ')}`);
      assert.equal(res.status, 200);
      assert.deepEqual(res.body, { token: tokenOf(label) });
    }
    assert.equal((await anyone().get('/api/trays/by-code/ZZZZ-ZZZZ')).status, 404);
  });

  it('printed again, carry the same codes (labels already stuck on trays keep working)', async () => {
    const again = await readLabels(teacher, lessonId);
    assert.deepEqual(
      again.map((l) => l.qr),
      labels.map((l) => l.qr),
    );
  });
});

describe('PUT /api/trays/:token/lines/:partCode', () => {
  it('saves out, back and missing without a session or CSRF cookie, and the page shows them', async () => {
    const token = tokenOf(labels[0]!);
    const line = plan.groups[0]!.lines[0]!;
    const res = await anyone()
      .put(`/api/trays/${token}/lines/${line.partCode}`)
      .send({ out: true, missing: line.allocated });
    assert.equal(res.status, 200);
    assert.equal(res.body.partCode, line.partCode);
    assert.equal(res.body.out, true);
    assert.equal(res.body.back, false);
    assert.equal(res.body.missing, line.allocated);
    const view = (await anyone().get(`/api/trays/${token}`)).body as TrayView;
    const shown = view.group.lines.find((l) => l.partCode === line.partCode)!;
    assert.deepEqual([shown.out, shown.back, shown.missing], [true, false, line.allocated]);
    const back = await anyone()
      .put(`/api/trays/${token}/lines/${line.partCode}`)
      .send({ back: true, missing: 0 });
    assert.deepEqual([back.body.out, back.body.back, back.body.missing], [true, true, 0]);
  });

  it('answers 400 for missing outside 0…qty or a wrong field, and changes nothing', async () => {
    const token = tokenOf(labels[0]!);
    const line = plan.groups[0]!.lines[1]!;
    const url = `/api/trays/${token}/lines/${line.partCode}`;
    await anyone().put(url).send({ missing: 1 });
    const before = await t.database.db.select().from(trayLines);
    for (const body of [
      { missing: line.allocated + 1 },
      { missing: -1 },
      { missing: 1.5 },
      { out: 'yes' },
      {},
      { out: true, extra: 1 },
    ]) {
      const res = await anyone().put(url).send(body);
      assert.equal(res.status, 400, JSON.stringify(body));
      assert.equal(res.body.error.code, 'invalid-input');
    }
    assert.deepEqual(await t.database.db.select().from(trayLines), before);
  });

  it('lets one group’s token touch only that group’s lines', async () => {
    const [g1, g2] = [plan.groups[0]!, plan.groups[1]!];
    const other = g2.lines.find((l) => !g1.lines.some((m) => m.partCode === l.partCode));
    if (other) {
      const res = await anyone()
        .put(`/api/trays/${tokenOf(labels[0]!)}/lines/${other.partCode}`)
        .send({ out: true });
      assert.equal(res.status, 404);
    }
    const shared = g2.lines[2]!;
    await anyone()
      .put(`/api/trays/${tokenOf(labels[0]!)}/lines/${shared.partCode}`)
      .send({ back: true });
    const rows = await t.database.db
      .select()
      .from(trayLines)
      .where(and(eq(trayLines.lessonId, lessonId), eq(trayLines.groupNumber, g2.number)));
    assert.deepEqual(rows, []);
    const view = (await anyone().get(`/api/trays/${tokenOf(labels[1]!)}`)).body as TrayView;
    assert.ok(view.group.lines.every((l) => !l.out && !l.back && l.missing === 0));
  });
});

describe('tray token rules', () => {
  it('answers 404 for an unknown or malformed token', async () => {
    for (const token of [randomBytes(18).toString('base64url'), 'short', 'a'.repeat(300)]) {
      const res = await anyone().get(`/api/trays/${token}`);
      assert.equal(res.status, 404, token);
      assert.ok(!JSON.stringify(res.body).includes(token));
    }
  });

  it('compares the derived token, not only the stored hash (a row whose nonce changed opens nothing)', async () => {
    const token = tokenOf(labels[3]!);
    const [row] = await t.database.db
      .select()
      .from(trayTokens)
      .where(and(eq(trayTokens.lessonId, lessonId), eq(trayTokens.groupNumber, 4)));
    await t.database.db
      .update(trayTokens)
      .set({ nonce: 'tampered' })
      .where(eq(trayTokens.id, row!.id));
    assert.equal((await anyone().get(`/api/trays/${token}`)).status, 404);
    await t.database.db
      .update(trayTokens)
      .set({ nonce: row!.nonce })
      .where(eq(trayTokens.id, row!.id));
    assert.equal((await anyone().get(`/api/trays/${token}`)).status, 200);
  });

  it('never writes a token or code to the logs', async () => {
    const seen: string[] = [];
    const originals = {
      log: console.log,
      error: console.error,
      warn: console.warn,
      info: console.info,
    };
    for (const k of Object.keys(originals) as (keyof typeof originals)[]) {
      console[k] = (...args: unknown[]) => void seen.push(args.map(String).join(' '));
    }
    try {
      const token = tokenOf(labels[0]!);
      await anyone().get(`/api/trays/${token}`);
      await anyone().put(`/api/trays/${token}/lines/NOPE`).send({ out: true });
      await anyone()
        .put(`/api/trays/${token}/lines/${plan.groups[0]!.lines[0]!.partCode}`)
        .send({ missing: 9999 });
      await anyone().get(`/api/trays/by-code/AAAA-AAAA`);
    } finally {
      Object.assign(console, originals);
    }
    const token = tokenOf(labels[0]!);
    assert.ok(
      seen.every((line) => !line.includes(token) && !line.includes('AAAA')),
      seen.join('\n'),
    );
  });

  it('answers 410 once the lesson’s school day is over (school timezone)', async () => {
    const token = tokenOf(labels[0]!);
    await moveLesson(t.database.db, lessonId, -1);
    try {
      const res = await anyone().get(`/api/trays/${token}`);
      assert.equal(res.status, 410);
      assert.equal(res.body.error.code, 'tray-expired');
      assert.equal(
        (await anyone().put(`/api/trays/${token}/lines/x`).send({ out: true })).status,
        410,
      );
    } finally {
      await moveLesson(t.database.db, lessonId, 0);
    }
    // Today the code still works: it lives until the end of the lesson's day.
    assert.equal((await anyone().get(`/api/trays/${token}`)).status, 200);
  });
});

describe('GET /api/lessons/:id/trays', () => {
  it('counts every group’s lines out, back and missing for whoever reads the lesson', async () => {
    const token = tokenOf(labels[2]!);
    const g3 = plan.groups[2]!;
    await anyone()
      .put(`/api/trays/${token}/lines/${g3.lines[0]!.partCode}`)
      .send({ out: true, back: true });
    await anyone()
      .put(`/api/trays/${token}/lines/${g3.lines[1]!.partCode}`)
      .send({ out: true, missing: 1 });
    const res = await teacher.get(`/api/lessons/${lessonId}/trays`);
    assert.equal(res.status, 200);
    const board = res.body.groups.find((g: { number: number }) => g.number === 3);
    assert.deepEqual(board, {
      number: 3,
      lines: g3.lines.length,
      linesOut: 2,
      linesBack: 1,
      missing: [{ partCode: g3.lines[1]!.partCode, count: 1 }],
    });
    assert.equal(res.body.groups.length, plan.groups.length);
  });

  it('is 401 anonymous, 404 for another school and for a relief teacher not on the lesson', async () => {
    assert.equal((await anyone().get(`/api/lessons/${lessonId}/trays`)).status, 401);
    const other = await signedIn(t.app, OTHER_ADMIN);
    assert.equal((await other.get(`/api/lessons/${lessonId}/trays`)).status, 404);
    const relief = await signedIn(t.app, RELIEF);
    const assigned = (await relief.get(`/api/lessons/${lessonId}/trays`)).status;
    assert.ok([200, 404].includes(assigned));
  });
});

describe('revoking a lesson’s tray codes', () => {
  it('makes every printed code answer 410, and labels printed afterwards carry new codes that work', async () => {
    const relief = await signedIn(t.app, RELIEF);
    const refused = await relief.post(`/api/lessons/${lessonId}/trays/revoke`);
    assert.ok([403, 404].includes(refused.status));
    const res = await teacher.post(`/api/lessons/${lessonId}/trays/revoke`);
    assert.equal(res.status, 200);
    assert.equal(res.body.revoked, plan.groups.length);
    for (const label of labels) {
      const old = await anyone().get(`/api/trays/${tokenOf(label)}`);
      assert.equal(old.status, 410);
      assert.equal(old.body.error.code, 'tray-revoked');
    }
    const fresh = await readLabels(teacher, lessonId);
    assert.equal(fresh.length, labels.length);
    for (const [i, label] of fresh.entries()) {
      assert.notEqual(label.qr, labels[i]!.qr);
      assert.equal((await anyone().get(`/api/trays/${tokenOf(label)}`)).status, 200);
    }
  });
});

describe('GET /api/trays/by-code/:code throttling', () => {
  it('answers 429 with Retry-After after 100 wrong codes from one address in 15 minutes (as sign-in)', async () => {
    // Earlier tests typed wrong codes too: start this address's window afresh.
    await t.database.db.delete(attemptCounters);
    let status = 0;
    for (let i = 0; i < 100; i++) {
      status = (await anyone().get(`/api/trays/by-code/0000-${String(i).padStart(4, '0')}`)).status;
      assert.equal(status, 404);
    }
    const res = await anyone().get('/api/trays/by-code/0000-9999');
    assert.equal(res.status, 429);
    assert.ok(Number(res.headers['retry-after']) > 0);
    await t.database.db.delete(attemptCounters);
  });
});
