/**
 * The prep calendar (RFC 5545, made with ical-generator): one event per prep task, from its
 * start-by to its done-by time in the school's timezone (TZID with a VTIMEZONE), with a display
 * alarm at the start-by time so a teacher's calendar says when to plug the controllers in.
 * Pure: the caller passes `generatedAt` (DTSTAMP) and the data.
 */
import ical, { ICalAlarmType, ICalEventTransparency } from 'ical-generator';
import { DateTime } from 'luxon';
import type { LessonPackModel } from '../pdf/model.js';
import { clockTime, localClockTime, shortDate } from '../pdf/format.js';
import { vtimezone } from './vtimezone.js';
import { calendarText, escapeCalendarText } from './text.js';

export interface PrepCalendarInput {
  /** Calendar name, e.g. `Trayplan prep: Rescue Rovers, lesson 2`. */
  name: string;
  timezone: string;
  /** DTSTAMP of every event (ISO 8601): when the file was made. */
  generatedAt: string;
  /** Lessons whose plans' tasks become events; unplannable lessons add none. */
  lessons: readonly LessonPackModel[];
  /** The app's address of a lesson's prep page, linked from each event. */
  lessonUrl: (lessonId: string) => string;
}

/** The iCalendar text of the lessons' prep tasks. */
export function prepCalendar(input: PrepCalendarInput): string {
  const { timezone } = input;
  const zoned = (iso: string) => DateTime.fromISO(iso, { setZone: true }).setZone(timezone);
  const instants = input.lessons.flatMap(
    (l) => l.plan?.tasks.flatMap((t) => [t.startBy, t.doneBy]) ?? [],
  );
  const times = instants.map((i) => zoned(i).toMillis());
  const from = times.length ? Math.min(...times) : Date.parse(input.generatedAt);
  const to = times.length ? Math.max(...times) : from;
  const calendar = ical({
    // ical-generator writes NAME and X-WR-CALNAME as given; every other text value it escapes.
    name: escapeCalendarText(input.name),
    prodId: { company: 'Trayplan', product: 'Prep calendar', language: 'EN' },
    // No calendar-wide zone name: each event carries its TZID, DTSTAMP stays in UTC (RFC 5545
    // 3.8.7.2); the generator still writes the VTIMEZONE of every zone the events use.
    timezone: { name: null, generator: (zone) => vtimezone(zone, from, to) },
  });
  for (const lesson of input.lessons) {
    if (!lesson.plan) continue;
    const when = `${lesson.className}, ${shortDate(lesson.startsAt, timezone)} at ${localClockTime(lesson.startsAt, timezone)}`;
    lesson.plan.tasks.forEach((task, i) => {
      const start = zoned(task.startBy);
      const done = zoned(task.doneBy);
      const description =
        `For lesson ${lesson.number} of ${lesson.unitTitle}, “${lesson.title}” (${when}). ` +
        `Takes ${task.minutes} min; done by ${clockTime(task.doneBy, timezone)}.`;
      const event = calendar.createEvent({
        // Stable ids: importing the calendar again updates these events instead of doubling them.
        id: `${lesson.id}-${i}-${task.kind}@trayplan`,
        start,
        end: done,
        timezone,
        stamp: new Date(input.generatedAt),
        summary: calendarText(task.label),
        description: calendarText(description),
        location: lesson.room ? calendarText(lesson.room) : null,
        url: input.lessonUrl(lesson.id),
        transparency: ICalEventTransparency.OPAQUE,
      });
      event.createAlarm({
        type: ICalAlarmType.display,
        trigger: 0,
        description: calendarText(`Start now: ${task.label}`),
      });
    });
  }
  // RFC 5545 §3.4: the object ends with END:VCALENDAR CRLF; the generator leaves the CRLF off.
  const text = calendar.toString();
  return text.endsWith('\r\n') ? text : `${text}\r\n`;
}
