/**
 * Reminder e-mails: the person's choices (GET/PATCH /api/account/reminders with a version), and
 * the sweep the job queue runs every minute — "start charging … by …" a lead time before each
 * charge task's start, and a morning summary — timed on the school's clock across a
 * daylight-saving change, claimed once however many sweeps run, read back with mailparser.
 *
 * Clock source: the IANA time zone database (tzdata, file `europe`): Europe/London follows
 * `Rule EU 1981 max - Oct lastSun 1:00u 0 -`, so British Summer Time (UTC+1) ends on the last
 * Sunday of October, 25 October 2026 at 01:00 UTC; from then the clock is GMT (UTC+0).
 * Friday 23 October 2026 09:10 in London is 08:10 UTC; Monday 26 October 09:10 is 09:10 UTC.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq, inArray } from 'drizzle-orm';
import { simpleParser } from 'mailparser';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { PARTNER, TEACHER, userByEmail } from '../support/planning.js';
import { demoLessonId } from '../support/trays.js';
import { openDatabase, type Database } from '../../server/db/client.js';
import { lessons, outbox, schools, sentReminders } from '../../server/db/schema/index.js';
import { loadSchoolSettings } from '../../server/school/settings.js';
import { sweepReminders } from '../../server/reminders/sweep.js';
import type { LessonPrep } from '../../shared/prep/index.js';

const APP = 'http://127.0.0.1:3999';
const MINUTE = 60_000;
let t: TestApp;
let teacher: Browser;
let second: Database;
/** The demo lessons moved to either side of the clock change, and one after it. */
const lesson = { friday: '', monday: '', tuesday: '' };
/** The controller's full charge (R9: a charge task lasts that long) and the charge buffer. */
let chargeMinutes = 0;
let bufferMinutes = 0;

const at = (iso: string) => new Date(iso);
const sweep = (now: Date) => sweepReminders(t.database.db, APP, now);
const mails = () => t.database.db.select().from(outbox).orderBy(outbox.createdAt);

async function move(id: string, day: string) {
  await t.database.db
    .update(lessons)
    .set({ startsAt: `${day} 09:10:00`, endsAt: `${day} 10:00:00` })
    .where(eq(lessons.id, id));
}

/** When the charge reminder is due: lesson start − buffer − full charge − lead, in UTC. */
function chargeDue(lessonStartUtc: string, leadMinutes: number): Date {
  const ms = Date.parse(lessonStartUtc) - (bufferMinutes + chargeMinutes + leadMinutes) * MINUTE;
  return new Date(ms);
}

before(async () => {
  t = await testApp();
  second = openDatabase(t.database.url, 4);
  const db = t.database.db;
  const me = await userByEmail(db, TEACHER);
  await db.update(schools).set({ timezone: 'Europe/London' }).where(eq(schools.id, me.schoolId));
  bufferMinutes = (await loadSchoolSettings(db, me.schoolId)).prep.chargeBufferMinutes;
  lesson.friday = await demoLessonId(db, 1);
  lesson.monday = await demoLessonId(db, 2);
  lesson.tuesday = await demoLessonId(db, 3);
  await move(lesson.friday, '2026-10-23');
  await move(lesson.monday, '2026-10-26');
  await move(lesson.tuesday, '2026-10-27');
  teacher = await signedIn(t.app, TEACHER);
  const prep = (await teacher.get(`/api/lessons/${lesson.friday}/prep`)).body as LessonPrep;
  const charge = prep.tasks.find((x) => x.kind === 'charge');
  assert.ok(charge, 'the demo lesson charges its controllers');
  chargeMinutes = charge.minutes;
  await db.delete(outbox);
});
after(async () => {
  await second.pool.end();
  await t.close();
});

describe('reminder choices (GET/PATCH /api/account/reminders)', () => {
  it('starts off (version 0), saves with a version, and refuses a stale one with 409', async () => {
    const first = await teacher.get('/api/account/reminders');
    assert.equal(first.status, 200);
    assert.deepEqual(first.body.reminders, {
      chargeReminders: false,
      leadMinutes: 30,
      morningSummary: false,
      summaryTime: '07:00',
      version: 0,
    });
    const on = { chargeReminders: true, leadMinutes: 30, morningSummary: true };
    const saved = await teacher.patch('/api/account/reminders', { version: 0, ...on });
    assert.equal(saved.status, 200, saved.text);
    assert.deepEqual(saved.body.reminders, { ...on, summaryTime: '07:00', version: 1 });
    // A second tab still on version 0 (insert) or 1 after this save (update) hears 409.
    const stale0 = await teacher.patch('/api/account/reminders', { version: 0, leadMinutes: 60 });
    assert.equal(stale0.status, 409);
    assert.equal(stale0.body.error.code, 'stale-version');
    assert.equal(stale0.body.error.current.version, 1);
    const next = await teacher.patch('/api/account/reminders', { version: 1, leadMinutes: 30 });
    assert.equal(next.body.reminders.version, 2);
    const stale1 = await teacher.patch('/api/account/reminders', { version: 1, leadMinutes: 60 });
    assert.equal(stale1.status, 409);
    assert.equal((await teacher.get('/api/account/reminders')).body.reminders.leadMinutes, 30);
  });

  it('refuses bad choices with 400 and changes nothing', async () => {
    for (const body of [
      { version: 2, leadMinutes: 4 },
      { version: 2, leadMinutes: 721 },
      { version: 2, leadMinutes: 30.5 },
      { version: 2, summaryTime: '24:00' },
      { version: 2, summaryTime: '7:00' },
      { version: 2, chargeReminders: 'yes' },
      { version: 2, sendTo: 'someone@else.example' },
      { leadMinutes: 30 },
    ]) {
      const res = await teacher.patch('/api/account/reminders', body);
      assert.equal(res.status, 400, JSON.stringify(body));
    }
    assert.equal((await teacher.get('/api/account/reminders')).body.reminders.version, 2);
  });
});

describe('the reminder sweep', () => {
  it('Friday (BST, UTC+1): the charge reminder at start − 30 min, the summary at 07:00 BST', async () => {
    const due = chargeDue('2026-10-23T08:10:00Z', 30);
    assert.equal(await sweep(new Date(due.getTime() - MINUTE)), 0, 'a minute early: nothing');
    assert.equal(await sweep(due), 1);
    assert.equal(await sweep(due), 0, 'the same minute again: already sent');
    const [mail] = await mails();
    assert.match(mail!.subject, /^Start charging \d+ × .+ by \d{1,2}:\d{2} am$/);
    assert.equal(mail!.toAddress, TEACHER);
    // 07:00 BST is 06:00 UTC.
    assert.equal(await sweep(at('2026-10-23T05:59:00Z')), 0);
    assert.equal(await sweep(at('2026-10-23T06:00:00Z')), 1);
    assert.match((await mails())[1]!.subject, /^Today’s prep, Fri 23 Oct 2026: \d+ tasks?$/);
  });

  it('Monday (GMT, UTC+0): the same wall-clock times are an hour later in UTC; a missed minute is caught up', async () => {
    const before = (await mails()).length;
    const due = chargeDue('2026-10-26T09:10:00Z', 30);
    // Where Friday's offset would put it: not yet.
    assert.equal(await sweep(new Date(due.getTime() - 60 * MINUTE)), 0);
    assert.equal(await sweep(new Date(due.getTime() - MINUTE)), 0);
    // No sweep ran at the due minute (a restart): the next one sends it.
    assert.equal(await sweep(new Date(due.getTime() + 15 * MINUTE)), 1);
    assert.equal(await sweep(at('2026-10-26T06:00:00Z')), 0, '07:00 BST would have been now');
    assert.equal(await sweep(at('2026-10-26T06:59:00Z')), 0);
    assert.equal(await sweep(at('2026-10-26T07:00:00Z')), 1, '07:00 GMT is 07:00 UTC');
    assert.equal((await mails()).length, before + 2);
  });

  it('reads back as e-mail (mailparser): wall-clock times of the school, the link, the cautions', async () => {
    await t.outbox.drain();
    const parsed = await Promise.all(t.smtp.raw().map((source) => simpleParser(source)));
    const charges = parsed.filter((m) => m.subject?.startsWith('Start charging'));
    assert.equal(charges.length, 2);
    // Friday 04:55 UTC + 1 h and Monday 05:55 UTC + 0 h are the same 5:55 am on the school's
    // clock when the charge starts 3 h 15 min before a 9:10 lesson (the demo controller's charge).
    const startLocal = (lessonUtc: string, offsetHours: number) => {
      const ms = Date.parse(lessonUtc) - (bufferMinutes + chargeMinutes) * MINUTE;
      const d = new Date(ms + offsetHours * 3_600_000);
      const h = d.getUTCHours();
      const m = String(d.getUTCMinutes()).padStart(2, '0');
      return `${h % 12 || 12}:${m} ${h < 12 ? 'am' : 'pm'}`;
    };
    assert.ok(charges[0]!.subject!.endsWith(`by ${startLocal('2026-10-23T08:10:00Z', 1)}`));
    assert.ok(charges[1]!.subject!.endsWith(`by ${startLocal('2026-10-26T09:10:00Z', 0)}`));
    for (const m of charges) {
      const text = m.text ?? '';
      assert.match(text, /Start charging \d+ × /);
      assert.match(text, /at 9:10 am on (Fri 23 Oct|Mon 26 Oct) 2026/);
      assert.ok(text.includes(`${APP}/lessons/`));
      assert.match(text, /Batteries and charging: .*hard surface/);
      assert.match(text, /Chargers and power boards: /);
      assert.match(text, /school’s own policies and local regulations come first/);
      assert.deepEqual(
        (Array.isArray(m.to) ? m.to : [m.to]).flatMap((a) => a!.value.map((v) => v.address)),
        [TEACHER],
      );
    }
    const summary = parsed.find((m) => m.subject?.startsWith('Today’s prep, Mon 26 Oct'));
    assert.ok(summary, 'the Monday summary arrived');
    assert.match(summary.text ?? '', /Charge \d+ × .+ for “/);
    assert.match(summary.text ?? '', /Small parts: /);
  });

  it('two instances sweeping at once send each reminder once (the claim, not luck)', async () => {
    const db = t.database.db;
    await move(lesson.tuesday, '2026-10-27');
    const due = chargeDue('2026-10-27T09:10:00Z', 30);
    const before = (await mails()).length;
    const runs = await Promise.all([
      sweepReminders(db, APP, due),
      sweepReminders(second.db, APP, due),
      sweepReminders(db, APP, due),
      sweepReminders(second.db, APP, due),
    ]);
    assert.equal(
      runs.reduce((a, b) => a + b, 0),
      1,
    );
    assert.equal((await mails()).length, before + 1);
    const me = await userByEmail(db, TEACHER);
    const claimed = await db
      .select()
      .from(sentReminders)
      .where(and(eq(sentReminders.userId, me.id), eq(sentReminders.lessonId, lesson.tuesday)));
    assert.equal(claimed.length, 1);
    assert.equal(claimed[0]!.dueAt.toISOString(), due.toISOString());
  });

  it('sends nothing for a ticked charge task, nor to someone who did not opt in', async () => {
    const db = t.database.db;
    // A lesson a week later whose charge task the teacher has already ticked.
    await move(lesson.tuesday, '2026-11-03');
    const prep = (await teacher.get(`/api/lessons/${lesson.tuesday}/prep`)).body as LessonPrep;
    const charge = prep.tasks.find((x) => x.kind === 'charge')!;
    const put = await teacher.send('put', `/api/lessons/${lesson.tuesday}/prep/ticks`, {
      taskKey: charge.key,
      done: true,
    });
    assert.equal(put.status, 200);
    const before = (await mails()).length;
    assert.equal(await sweep(chargeDue('2026-11-03T09:10:00Z', 30)), 0);
    assert.equal((await mails()).length, before);
    const partner = await userByEmail(db, PARTNER);
    const toPartner = await db
      .select()
      .from(sentReminders)
      .where(inArray(sentReminders.userId, [partner.id]));
    assert.deepEqual(toPartner, []);
    assert.ok((await mails()).every((m) => m.toAddress === TEACHER));
  });
});
