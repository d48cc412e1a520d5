/**
 * The personal calendar feed (API.md, "calendars"), parsed back with ical.js (RFC 5545): the
 * person's prep tasks from today to eight weeks ahead with their alarms, at the right instants in
 * the school's timezone (IANA time zone database through Luxon), text escaped as RFC 5545 §3.3.11
 * says; a secret address that works without a cookie, is stored only hashed, and stops when
 * replaced.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { createHash } from 'node:crypto';
import { asc, eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import supertest from 'supertest';
import ICAL from 'ical.js';
import { Browser, testApp, type TestApp } from '../support/app.js';
import { RELIEF, TEACHER, browsers, type SignIn } from '../support/planning.js';
import { calendarFeeds, lessons, units, users } from '../../server/db/schema/index.js';
import type { PrepPlan } from '../../shared/prep/index.js';

const ZONE = 'Australia/Adelaide';
let t: TestApp;
let as: SignIn;
/** Rescue Rovers lessons: [0] tomorrow, [1] nine weeks ahead (outside), [2] (relief's) in 3 days. */
let ids: string[] = [];
const UNIT_TITLE = 'Rescue Rovers; round 2, with a back\\slash';

const localDay = (days: number) => DateTime.now().setZone(ZONE).plus({ days }).toISODate()!;
const pathOf = (url: string) => new URL(url).pathname;

function parse(text: string) {
  const calendar = new ICAL.Component(ICAL.parse(text));
  for (const z of calendar.getAllSubcomponents('vtimezone'))
    ICAL.TimezoneService.register(new ICAL.Timezone(z));
  return calendar.getAllSubcomponents('vevent').map((v) => new ICAL.Event(v));
}

async function feedText(url: string) {
  const res = await supertest(t.app).get(pathOf(url)).buffer(true);
  return res;
}

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  await db.update(units).set({ title: UNIT_TITLE }).where(eq(units.id, unit!.id));
  const rows = await db
    .select()
    .from(lessons)
    .where(eq(lessons.unitId, unit!.id))
    .orderBy(asc(lessons.position));
  ids = rows.map((r) => r.id);
  const move = (id: string, day: string) =>
    db
      .update(lessons)
      .set({ startsAt: `${day} 11:10:00`, endsAt: `${day} 12:00:00` })
      .where(eq(lessons.id, id));
  await move(ids[0]!, localDay(1));
  await move(ids[1]!, localDay(63));
  await move(ids[2]!, localDay(3));
});
after(async () => {
  ICAL.TimezoneService.reset();
  await t.close();
});

describe('calendar feed', () => {
  it('serves the teacher’s prep tasks of the next eight weeks, with alarms, to a cookie-less client', async () => {
    const teacher = await as(TEACHER);
    const made = await teacher.post('/api/account/calendar-feed');
    assert.equal(made.status, 201, made.text);
    assert.match(
      made.body.url,
      /^http:\/\/127\.0\.0\.1:3999\/api\/calendar\/[A-Za-z0-9_-]{22,}\.ics$/,
    );
    const res = await feedText(made.body.url);
    assert.equal(res.status, 200);
    assert.match(String(res.headers['content-type']), /^text\/calendar/);
    assert.equal(res.headers['set-cookie'], undefined);
    const events = parse(res.text);
    const plans: PrepPlan[] = [];
    for (const id of [ids[0]!, ids[2]!])
      plans.push((await teacher.get(`/api/lessons/${id}/prep`)).body);
    const tasks = plans.flatMap((p) => p.tasks);
    assert.ok(tasks.length > 0);
    assert.equal(events.length, tasks.length, 'every task of the two lessons, nothing else');
    for (const task of tasks) {
      const event = events.find(
        (e) =>
          e.summary === task.label && e.startDate.toJSDate().getTime() === Date.parse(task.startBy),
      );
      assert.ok(event, `an event for ${task.label} at ${task.startBy}`);
      assert.equal(event.endDate.toJSDate().getTime(), Date.parse(task.doneBy));
      // The wall clock in the school's zone, from the IANA database through Luxon.
      const local = DateTime.fromISO(task.startBy).setZone(ZONE);
      assert.equal(event.startDate.zone?.tzid, ZONE);
      assert.equal(event.startDate.hour, local.hour);
      assert.equal(event.startDate.minute, local.minute);
      assert.equal(event.startDate.day, local.day);
      const alarm = event.component.getFirstSubcomponent('valarm');
      assert.equal(alarm?.getFirstPropertyValue('action'), 'DISPLAY');
    }
  });

  it('escapes text as RFC 5545 §3.3.11 says (backslash, semicolon, comma)', async () => {
    const made = await (await as(TEACHER)).post('/api/account/calendar-feed');
    const res = await feedText(made.body.url);
    const unfolded = res.text.replace(/\r\n[ \t]/g, '');
    assert.ok(unfolded.includes('Rescue Rovers\\; round 2\\, with a back\\\\slash'), unfolded);
    const events = parse(res.text);
    assert.ok(events.every((e) => e.description.includes(UNIT_TITLE)));
  });

  it('gives the relief teacher the lessons they cover', async () => {
    const made = await (await as(RELIEF)).post('/api/account/calendar-feed');
    const events = parse((await feedText(made.body.url)).text);
    assert.ok(events.length > 0);
    assert.ok(events.every((e) => e.uid.startsWith(ids[2]!)));
  });

  it('keeps only a hash, and stops the old address when a new one is made', async () => {
    const teacher = await as(TEACHER);
    const first = (await teacher.post('/api/account/calendar-feed')).body.url as string;
    const second = (await teacher.post('/api/account/calendar-feed')).body.url as string;
    assert.notEqual(first, second);
    assert.equal((await feedText(first)).status, 404);
    assert.equal((await feedText(second)).status, 200);
    const token = /calendar\/([^.]+)\.ics$/.exec(second)![1]!;
    const [me] = await t.database.db.select().from(users).where(eq(users.email, TEACHER));
    const [row] = await t.database.db
      .select()
      .from(calendarFeeds)
      .where(eq(calendarFeeds.userId, me!.id));
    // FIPS 180-4 SHA-256 of the token is all that is kept.
    assert.equal(row!.tokenHash, createHash('sha256').update(token).digest('hex'));
    assert.equal((await supertest(t.app).get(`/api/calendar/${'A'.repeat(43)}.ics`)).status, 404);
    assert.equal((await supertest(t.app).get('/api/calendar/short.ics')).status, 404);
    assert.equal((await new Browser(t.app).post('/api/account/calendar-feed')).status, 401);
  });
});
