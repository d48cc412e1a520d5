/**
 * The prep calendar (RFC 5545), parsed back with ical.js (a reference iCalendar library): one
 * event per prep task, DTSTART/DTEND at start-by/done-by in the school's zone with the offsets
 * of the IANA time zone database, a display alarm at start-by, and a VTIMEZONE that gets a
 * daylight-saving change right.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, asc, eq } from 'drizzle-orm';
import ICAL from 'ical.js';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { lessons, units } from '../../server/db/schema/index.js';
import type { PrepPlan } from '../../shared/prep/index.js';

let t: TestApp;
let teacher: Browser;
let unitId = '';
let lessonIds: string[] = [];

/** Parses a calendar, registering its VTIMEZONEs so TZID times resolve to instants. */
function parse(text: string) {
  const calendar = new ICAL.Component(ICAL.parse(text));
  const zones = calendar.getAllSubcomponents('vtimezone');
  for (const z of zones) ICAL.TimezoneService.register(new ICAL.Timezone(z));
  const events = calendar.getAllSubcomponents('vevent');
  return { calendar, zones, events };
}

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  unitId = unit!.id;
  const rows = await t.database.db
    .select({ id: lessons.id })
    .from(lessons)
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position));
  lessonIds = rows.map((r) => r.id);
  // Lesson 8 moves to early on Sunday 4 October 2026, the day daylight time begins in
  // Adelaide, so its three-hour controller charge starts in standard time and ends in daylight.
  await t.database.db
    .update(lessons)
    .set({ startsAt: '2026-10-04 04:30:00', endsAt: '2026-10-04 05:20:00' })
    .where(and(eq(lessons.unitId, unitId), eq(lessons.position, 7)));
});
after(async () => {
  ICAL.TimezoneService.reset();
  await t.close();
});

describe('GET /api/lessons/:id/prep.ics', () => {
  it('has one event per prep task from start-by to done-by, at +09:30 in July, with an alarm at start-by', async () => {
    const id = lessonIds[1]!;
    const plan = (await teacher.get(`/api/lessons/${id}/prep`)).body as PrepPlan;
    const res = await teacher.get(`/api/lessons/${id}/prep.ics`);
    assert.equal(res.status, 200);
    assert.equal(res.headers['content-type'], 'text/calendar; charset=utf-8');
    assert.equal(
      res.headers['content-disposition'],
      'attachment; filename="4K-2026-07-28-rescue-rovers-lesson-2-prep.ics"',
    );
    const { zones, events } = parse(res.text);
    assert.equal(zones.length, 1);
    assert.equal(zones[0]!.getFirstPropertyValue('tzid'), 'Australia/Adelaide');
    assert.equal(events.length, plan.tasks.length);
    assert.equal(plan.tasks.length, 4, 'charge, pull, sort and devices');
    events.forEach((vevent, i) => {
      const task = plan.tasks[i]!;
      const event = new ICAL.Event(vevent);
      assert.equal(event.summary, task.label);
      assert.equal(vevent.getFirstProperty('dtstart')!.getParameter('tzid'), 'Australia/Adelaide');
      assert.equal(
        event.startDate.toJSDate().getTime(),
        Date.parse(task.startBy),
        `${task.label}: start`,
      );
      assert.equal(
        event.endDate.toJSDate().getTime(),
        Date.parse(task.doneBy),
        `${task.label}: end`,
      );
      // IANA tz database: Australia/Adelaide keeps standard time, UTC+09:30, in July.
      assert.equal(event.startDate.utcOffset(), (9 * 60 + 30) * 60);
      assert.equal(event.endDate.utcOffset(), (9 * 60 + 30) * 60);
      const alarms = vevent.getAllSubcomponents('valarm');
      assert.equal(alarms.length, 1);
      assert.equal(alarms[0]!.getFirstPropertyValue('action'), 'DISPLAY');
      const trigger = alarms[0]!.getFirstProperty('trigger')!;
      assert.equal((trigger.getFirstValue() as ICAL.Duration).toSeconds(), 0, 'at the start');
      assert.notEqual(trigger.getParameter('related'), 'END');
      assert.ok(String(alarms[0]!.getFirstPropertyValue('description')).includes(task.label));
    });
    // The charge task of the worked-out demo: three hours from empty, done 15 minutes before 11:10.
    const charge = new ICAL.Event(events[0]!);
    assert.equal(charge.startDate.toString(), '2026-07-28T07:55:00');
    // RFC 5545 3.8.7.2: DTSTAMP is in UTC.
    const stamps = res.text.match(/^DTSTAMP:.*$/gm)!;
    assert.equal(stamps.length, events.length);
    for (const s of stamps) {
      assert.match(s, /^DTSTAMP:\d{8}T\d{6}Z\r?$/);
    }
    const stamp = events[0]!.getFirstPropertyValue('dtstamp') as ICAL.Time;
    assert.ok(Math.abs(stamp.toJSDate().getTime() - Date.now()) < 120_000, 'stamped when made');
  });

  it('keeps elapsed time across the start of daylight time: +09:30 before 4 Oct 2026 02:00, +10:30 after', async () => {
    const id = lessonIds[7]!;
    const plan = (await teacher.get(`/api/lessons/${id}/prep`)).body as PrepPlan;
    const { events } = parse((await teacher.get(`/api/lessons/${id}/prep.ics`)).text);
    assert.equal(events.length, plan.tasks.length);
    const charge = new ICAL.Event(
      events.find((e) => String(e.getFirstPropertyValue('summary')).startsWith('Charge'))!,
    );
    // The lesson starts 04:30 ACDT; the charge is done 15 minutes before, three hours long.
    assert.equal(charge.endDate.toString(), '2026-10-04T04:15:00');
    assert.equal(charge.startDate.toString(), '2026-10-04T00:15:00');
    // IANA tz database: daylight time (UTC+10:30) begins on the first Sunday of October at
    // 02:00 standard time; before it, UTC+09:30.
    assert.equal(charge.startDate.utcOffset(), (9 * 60 + 30) * 60);
    assert.equal(charge.endDate.utcOffset(), (10 * 60 + 30) * 60);
    // Four hours on the wall clock, three real hours.
    assert.equal(
      charge.endDate.toJSDate().getTime() - charge.startDate.toJSDate().getTime(),
      3 * 3600_000,
    );
    const later = events.map((e) => new ICAL.Event(e)).filter((e) => e.summary !== charge.summary);
    for (const e of later) assert.equal(e.startDate.utcOffset(), (10 * 60 + 30) * 60, e.summary);
  });
});

describe('GET /api/units/:id/prep.ics', () => {
  it('holds every lesson’s prep tasks, each event once', async () => {
    const plans = await Promise.all(
      lessonIds.map(async (id) => (await teacher.get(`/api/lessons/${id}/prep`)).body as PrepPlan),
    );
    const res = await teacher.get(`/api/units/${unitId}/prep.ics`);
    assert.equal(res.status, 200);
    assert.equal(
      res.headers['content-disposition'],
      'attachment; filename="4K-rescue-rovers-prep.ics"',
    );
    const { events } = parse(res.text);
    assert.equal(
      events.length,
      plans.reduce((n, p) => n + p.tasks.length, 0),
    );
    const uids = events.map((e) => e.getFirstPropertyValue('uid'));
    assert.equal(new Set(uids).size, uids.length);
    const starts = events.map((e) => new ICAL.Event(e).startDate.toJSDate().getTime());
    const expected = plans.flatMap((p) => p.tasks.map((task) => Date.parse(task.startBy)));
    assert.deepEqual(starts, expected);
  });
});
