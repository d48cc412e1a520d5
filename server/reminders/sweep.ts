/**
 * The reminder sweep, run every minute by the job queue on whichever instance fetches it. It
 * sends whatever is due and not yet sent, so a minute missed (a restart, every instance down)
 * is caught up by the next sweep; each reminder is claimed by one INSERT … ON CONFLICT DO
 * NOTHING in the transaction that queues its e-mail, so two sweeps at once never send it twice.
 */
import { and, eq, gte, inArray, lt, or, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Db } from '../db/client.js';
import {
  classes,
  reminderPreferences,
  schools,
  sentReminders,
  unitCoauthors,
  units,
  lessons,
  users,
} from '../db/schema/index.js';
import { enqueueMail, type OutgoingMail } from '../mail/outbox.js';
import { canRunLesson, type Actor } from '../auth/policy.js';
import { planLesson } from '../prep/plan-lesson.js';
import { readTicks } from '../prep/ticks.js';
import { toLocal } from '../planning/format.js';
import type { PrepTask } from '../../shared/prep/index.js';
import type { Role } from '../../shared/schemas/common.js';
import {
  chargeReminderMail,
  morningSummaryMail,
  type ReminderLesson,
  type SummaryTask,
} from './messages.js';

/** A morning summary still goes out this long after its time (after a restart), not later. */
export const SUMMARY_GRACE_HOURS = 4;
/** Lessons this many school days ahead can have a charge (≤ 24 h) whose reminder is due now. */
const DAYS_AHEAD = 3;

interface Person {
  actor: Actor;
  timezone: string;
  chargeReminders: boolean;
  leadMinutes: number;
  morningSummary: boolean;
  summaryTime: string;
}

interface PlannedLesson {
  lesson: ReminderLesson;
  tasks: PrepTask[];
  ticked: Set<string>;
  runners: Person[];
}

/** One reminder to claim and send. */
interface Due {
  userId: string;
  key: string;
  kind: 'charge' | 'summary';
  lessonId: string | null;
  dueAt: Date;
  mail: OutgoingMail;
}

/** Everyone who turned a reminder on, with their school's timezone. */
async function optedIn(db: Db): Promise<Person[]> {
  const rows = await db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      schoolId: users.schoolId,
      schoolName: schools.name,
      timezone: schools.timezone,
      p: reminderPreferences,
    })
    .from(reminderPreferences)
    .innerJoin(users, eq(users.id, reminderPreferences.userId))
    .innerJoin(schools, eq(schools.id, users.schoolId))
    .where(
      and(
        eq(users.status, 'active'),
        or(
          eq(reminderPreferences.chargeReminders, true),
          eq(reminderPreferences.morningSummary, true),
        ),
      ),
    );
  return rows.map(({ p, timezone, ...u }) => ({
    actor: { ...u, role: u.role as Role },
    timezone,
    chargeReminders: p.chargeReminders,
    leadMinutes: p.leadMinutes,
    morningSummary: p.morningSummary,
    summaryTime: p.summaryTime,
  }));
}

/** The school's lessons from today for DAYS_AHEAD days that one of `people` runs, planned now. */
async function plannedLessons(
  db: Db,
  schoolId: string,
  today: DateTime,
  people: Person[],
): Promise<PlannedLesson[]> {
  return db.transaction(
    async (tx) => {
      const rows = await tx
        .select({
          id: lessons.id,
          title: lessons.title,
          startsAt: lessons.startsAt,
          reliefTeacherId: lessons.reliefTeacherId,
          unitId: units.id,
          ownerId: units.ownerId,
          visibility: units.visibility,
          className: classes.name,
        })
        .from(lessons)
        .innerJoin(units, eq(units.id, lessons.unitId))
        .innerJoin(classes, eq(classes.id, lessons.classId))
        .where(
          and(
            eq(lessons.schoolId, schoolId),
            gte(lessons.startsAt, today.toISODate()!),
            lt(lessons.startsAt, today.plus({ days: DAYS_AHEAD }).toISODate()!),
          ),
        );
      const unitIds = [...new Set(rows.map((r) => r.unitId))];
      const co = unitIds.length
        ? await tx.select().from(unitCoauthors).where(inArray(unitCoauthors.unitId, unitIds))
        : [];
      const out: PlannedLesson[] = [];
      for (const r of rows) {
        const facts = {
          schoolId,
          ownerId: r.ownerId,
          visibility: r.visibility,
          coauthorIds: co.filter((c) => c.unitId === r.unitId).map((c) => c.userId),
        };
        // The lesson's teachers, as the policy names them: its unit's authors and its relief.
        const runners = people.filter((p) => canRunLesson(p.actor, facts, r));
        if (runners.length === 0) continue;
        const planned = await planLesson(tx, r.id);
        if (!planned?.plannable) continue;
        const tasks = planned.plan.tasks;
        const ticks = await readTicks(
          tx,
          r.id,
          tasks.map((t) => t.key),
        );
        out.push({
          lesson: {
            id: r.id,
            title: r.title,
            className: r.className,
            startsAt: toLocal(r.startsAt),
          },
          tasks,
          ticked: new Set(ticks.map((t) => t.taskKey)),
          runners,
        });
      }
      return out;
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
}

/** What is due at `now` for one school's people, not yet knowing what was sent. */
function dueReminders(
  appUrl: string,
  now: Date,
  today: DateTime,
  people: Person[],
  planned: PlannedLesson[],
): Due[] {
  const out: Due[] = [];
  const nowMs = now.getTime();
  for (const person of people) {
    const mine = planned.filter((l) => l.runners.includes(person));
    const base = { to: person.actor.email, name: person.actor.name, timezone: person.timezone };
    if (person.chargeReminders) {
      for (const { lesson, tasks, ticked } of mine) {
        for (const task of tasks) {
          if (task.kind !== 'charge' || ticked.has(task.key)) continue;
          // Lead time in elapsed minutes before the start (across a clock change too); still
          // worth sending until the charge should be done.
          const dueAt = Date.parse(task.startBy) - person.leadMinutes * 60_000;
          if (dueAt > nowMs || nowMs >= Date.parse(task.doneBy)) continue;
          out.push({
            userId: person.actor.id,
            key: `charge|${lesson.id}|${task.key}|${task.startBy}`,
            kind: 'charge',
            lessonId: lesson.id,
            dueAt: new Date(dueAt),
            mail: chargeReminderMail({ ...base, appUrl, lesson, task, now }),
          });
        }
      }
    }
    if (person.morningSummary) {
      const day = today.toISODate()!;
      // The school's wall clock that morning (a time a spring-forward skips moves on an hour).
      const due = DateTime.fromISO(`${day}T${person.summaryTime}`, { zone: person.timezone });
      const dueMs = due.toMillis();
      if (dueMs > nowMs || nowMs >= dueMs + SUMMARY_GRACE_HOURS * 3_600_000) continue;
      const tasks: SummaryTask[] = mine
        .flatMap(({ lesson, tasks, ticked }) =>
          tasks.map((task) => ({ task, lesson, done: ticked.has(task.key) })),
        )
        .filter(
          ({ task }) =>
            DateTime.fromISO(task.startBy, { zone: person.timezone }).toISODate() === day,
        )
        .sort((a, b) => Date.parse(a.task.startBy) - Date.parse(b.task.startBy));
      if (tasks.length === 0) continue;
      out.push({
        userId: person.actor.id,
        key: `summary|${day}`,
        kind: 'summary',
        lessonId: null,
        dueAt: new Date(dueMs),
        mail: morningSummaryMail({ ...base, appUrl, day, tasks }),
      });
    }
  }
  return out;
}

/**
 * Queues every reminder due at `now` that has not been sent; resolves with how many this sweep
 * queued (the others were already claimed, by an earlier sweep or one running beside it).
 */
export async function sweepReminders(
  db: Db,
  appUrl: string,
  now: Date = new Date(),
): Promise<number> {
  const people = await optedIn(db);
  const bySchool = new Map<string, Person[]>();
  for (const p of people)
    bySchool.set(p.actor.schoolId, [...(bySchool.get(p.actor.schoolId) ?? []), p]);
  let queued = 0;
  for (const [schoolId, members] of bySchool) {
    const today = DateTime.fromJSDate(now, { zone: members[0]!.timezone }).startOf('day');
    const planned = await plannedLessons(db, schoolId, today, members);
    for (const due of dueReminders(appUrl, now, today, members, planned)) {
      const claimed = await db.transaction(async (tx) => {
        const rows = await tx
          .insert(sentReminders)
          .values({
            userId: due.userId,
            reminderKey: due.key,
            kind: due.kind,
            lessonId: due.lessonId,
            dueAt: due.dueAt,
          })
          .onConflictDoNothing()
          .returning({ key: sentReminders.reminderKey });
        if (rows.length > 0) await enqueueMail(tx, due.mail);
        return rows.length > 0;
      });
      if (claimed) queued++;
    }
  }
  return queued;
}

/** Forgets sent reminders older than any that could still be due (keeps the table small). */
export async function pruneSentReminders(db: Db): Promise<void> {
  await db.delete(sentReminders).where(lt(sentReminders.sentAt, sql`now() - interval '14 days'`));
}
