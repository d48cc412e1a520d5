/**
 * The words of the reminder e-mails. Whatever mentions charging or handling parts carries the
 * usual cautions (the lesson pack's own words) and defers to the school's policies.
 */
import type { OutgoingMail } from '../mail/outbox.js';
import { CAUTIONS } from '../pdf/cautions.js';
import { clockTime, localClockTime, shortDate, taskTime } from '../pdf/format.js';
import type { PrepTask } from '../../shared/prep/index.js';

export const DEFER =
  'These are reminders, not rules: your school’s own policies and local regulations come first.';

function cautionLines(titles: readonly string[]): string[] {
  return CAUTIONS.filter((c) => titles.includes(c.title)).map((c) => `- ${c.title}: ${c.text}`);
}

/** A lesson as a reminder names it. */
export interface ReminderLesson {
  id: string;
  title: string;
  className: string;
  /** Local `2026-07-28T11:10` on the school's clock. */
  startsAt: string;
}

export interface ChargeReminder {
  appUrl: string;
  to: string;
  name: string;
  timezone: string;
  lesson: ReminderLesson;
  task: PrepTask;
  /** When the reminder goes out; after the task's start it says it is late. */
  now: Date;
}

/** `Charge 7 × Rover controller` → `7 × Rover controller` (the engine's label, R9). */
function whatToCharge(task: PrepTask): string {
  return task.label.replace(/^Charge\s+/, '');
}

/** "Start charging 7 × Rover controller by 7:55 am", a lead time before the task's start. */
export function chargeReminderMail(r: ChargeReminder): OutgoingMail {
  const start = taskTime(r.task.startBy, r.lesson.startsAt, r.timezone);
  const what = whatToCharge(r.task);
  const late = r.now.getTime() > Date.parse(r.task.startBy);
  return {
    to: r.to,
    subject: `Start charging ${what} by ${start}`,
    text: [
      `Hello ${r.name || 'there'},`,
      ``,
      `Start charging ${what} by ${start}, so they are full by ` +
        `${clockTime(r.task.doneBy, r.timezone)} for “${r.lesson.title}” with ${r.lesson.className} ` +
        `at ${localClockTime(r.lesson.startsAt, r.timezone)} on ${shortDate(r.lesson.startsAt, r.timezone)}.`,
      ...(late
        ? [
            ``,
            `This reminder is late (Trayplan could not send it earlier): the charge should have started already.`,
          ]
        : []),
      ``,
      `The lesson and its prep tasks:`,
      `${r.appUrl}/lessons/${r.lesson.id}`,
      ``,
      `Charging safely:`,
      ...cautionLines([
        'Batteries and charging',
        'Chargers and power boards',
        'Devices that overheat',
      ]),
      DEFER,
      ``,
      `You get this because you turned on charging reminders on your Account page:`,
      `${r.appUrl}/account`,
    ].join('\n'),
  };
}

export interface SummaryTask {
  task: PrepTask;
  lesson: ReminderLesson;
  /** Whether one of the lesson's teachers has ticked it done. */
  done: boolean;
}

/** The morning summary: every prep task of the person's lessons that starts today. */
export function morningSummaryMail(r: {
  appUrl: string;
  to: string;
  name: string;
  timezone: string;
  /** The school's date, `YYYY-MM-DD`. */
  day: string;
  tasks: readonly SummaryTask[];
}): OutgoingMail {
  const count = r.tasks.length;
  const charging = r.tasks.some((t) => t.task.kind === 'charge');
  const lines = r.tasks.map(
    ({ task, lesson, done }) =>
      `- ${clockTime(task.startBy, r.timezone)}: ${task.label} (${task.minutes} min, done by ` +
      `${clockTime(task.doneBy, r.timezone)}) for “${lesson.title}”, ${lesson.className}` +
      (done ? ' [already ticked done]' : ''),
  );
  const lessons = [...new Map(r.tasks.map((t) => [t.lesson.id, t.lesson])).values()];
  return {
    to: r.to,
    subject: `Today’s prep, ${shortDate(r.day, r.timezone)}: ${count} ${count === 1 ? 'task' : 'tasks'}`,
    text: [
      `Hello ${r.name || 'there'},`,
      ``,
      `Your prep for ${shortDate(r.day, r.timezone)}, in the order to start it:`,
      ...lines,
      ``,
      `Tick tasks off on the lesson page, where the lesson’s other teachers see them too:`,
      ...lessons.map((l) => `${r.appUrl}/lessons/${l.id}`),
      ``,
      `Before you start:`,
      ...cautionLines(
        charging
          ? ['Small parts', 'Batteries and charging', 'Chargers and power boards']
          : ['Small parts'],
      ),
      DEFER,
      ``,
      `You get this because you turned on the morning summary on your Account page:`,
      `${r.appUrl}/account`,
    ].join('\n'),
  };
}
