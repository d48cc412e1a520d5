/**
 * Across lessons (PREP-RULES.md, last section): the weekly prep agenda, booking conflicts and
 * recharge gaps of a school, built from the same engine as each lesson's prep plan.
 */
import { Router } from 'express';
import { and, asc, desc, eq, gte, inArray, lt } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import {
  classes,
  lessonTubs,
  lessons,
  parts,
  schools,
  tubs,
  unitCoauthors,
  units,
} from '../db/schema/index.js';
import { parse } from '../http.js';
import { schoolDate } from '../../shared/schemas/text.js';
import { requireActor } from '../auth/session.js';
import { authorsUnit, canReadLesson, type Actor } from '../auth/policy.js';
import { intervalsOverlap, naturalCompare, type PrepPlan } from '../../shared/prep/index.js';
import { toLocal } from '../planning/format.js';
import { planLesson } from '../prep/plan-lesson.js';
import { readTicks } from '../prep/ticks.js';
import type { PrepTick } from '../../shared/schemas/prep-ticks.js';

const weekQuery = z.object({
  week: schoolDate('Give the week as a date that exists, like 2026-07-27.'),
  mine: z.enum(['true', 'false']).optional(),
});

interface LessonRow {
  id: string;
  title: string;
  startsAt: string;
  endsAt: string;
  unitId: string;
  unitTitle: string;
  className: string;
  ownerId: string;
  visibility: string;
  reliefTeacherId: string | null;
  kitTypeId: string;
}

/** Which lessons to read: a range of local dates, the order, and one page of the candidates. */
interface LessonQuery {
  from?: string;
  to?: string;
  latestFirst?: boolean;
  limit?: number;
  offset?: number;
}

/**
 * Lessons of the school in [from, to) (local dates) that the actor may read, in time order; with
 * `mine`, only those of units they author and those they cover as the relief teacher.
 */
export async function readableLessons(
  tx: Tx,
  actor: Actor,
  from: string,
  to: string,
  mine: boolean,
): Promise<LessonRow[]> {
  return (await readablePage(tx, actor, { from, to }, mine)).rows;
}

/** One page of candidates (`read` of them) and those of them the actor may read. */
async function readablePage(
  tx: Tx,
  actor: Actor,
  q: LessonQuery,
  mine: boolean,
): Promise<{ rows: LessonRow[]; read: number }> {
  const select = tx
    .select({
      id: lessons.id,
      title: lessons.title,
      startsAt: lessons.startsAt,
      endsAt: lessons.endsAt,
      unitId: units.id,
      unitTitle: units.title,
      className: classes.name,
      ownerId: units.ownerId,
      visibility: units.visibility,
      reliefTeacherId: lessons.reliefTeacherId,
      kitTypeId: lessons.kitTypeId,
    })
    .from(lessons)
    .innerJoin(units, eq(units.id, lessons.unitId))
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .where(
      and(
        eq(lessons.schoolId, actor.schoolId),
        q.from ? gte(lessons.startsAt, q.from) : undefined,
        q.to ? lt(lessons.startsAt, q.to) : undefined,
      ),
    )
    .orderBy(
      q.latestFirst ? desc(lessons.startsAt) : asc(lessons.startsAt),
      q.latestFirst ? desc(lessons.id) : asc(lessons.id),
    );
  const rows: LessonRow[] =
    q.limit === undefined ? await select : await select.limit(q.limit).offset(q.offset ?? 0);
  const unitIds = [...new Set(rows.map((r) => r.unitId))];
  const co = unitIds.length
    ? await tx.select().from(unitCoauthors).where(inArray(unitCoauthors.unitId, unitIds))
    : [];
  const readable = rows.filter((r) => {
    const facts = {
      schoolId: actor.schoolId,
      ownerId: r.ownerId,
      visibility: r.visibility,
      coauthorIds: co.filter((c) => c.unitId === r.unitId).map((c) => c.userId),
    };
    if (!canReadLesson(actor, facts, r)) return false;
    if (!mine) return true;
    return authorsUnit(actor, facts) || r.reliefTeacherId === actor.id;
  });
  return { rows: readable, read: rows.length };
}

/** The Monday (ISO 8601 weeks start on Monday) of the week holding a stored local date-time. */
function mondayOf(stored: string): string {
  return DateTime.fromISO(toLocal(stored).slice(0, 10)).startOf('week').toISODate()!;
}

/**
 * The Monday of the nearest week before `before` (or from `after` on) holding a lesson the
 * agenda would list, or null. Candidates are read a page at a time nearest first, each page
 * through the policy, so the first one kept is the nearest.
 */
async function nearestWeek(
  tx: Tx,
  actor: Actor,
  mine: boolean,
  side: { before: string } | { after: string },
): Promise<string | null> {
  const limit = 100;
  for (let offset = 0; ; offset += limit) {
    const q: LessonQuery =
      'before' in side
        ? { to: side.before, latestFirst: true, limit, offset }
        : { from: side.after, limit, offset };
    const page = await readablePage(tx, actor, q, mine);
    if (page.rows[0]) return mondayOf(page.rows[0].startsAt);
    if (page.read < limit) return null;
  }
}

function lessonSummary(r: LessonRow) {
  return {
    id: r.id,
    title: r.title,
    unitId: r.unitId,
    unitTitle: r.unitTitle,
    className: r.className,
    startsAt: toLocal(r.startsAt),
    endsAt: toLocal(r.endsAt),
  };
}

export function agendaRouter(ctx: AppContext): Router {
  const router = Router();

  // GET /api/agenda?week=YYYY-MM-DD[&mine=true]: every prep task of the week in time order.
  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    const q = parse(weekQuery, req.query);
    const monday = DateTime.fromISO(q.week).startOf('week');
    const from = monday.toISODate()!;
    const to = monday.plus({ days: 7 }).toISODate()!;
    const { out: result, otherWeeks } = await ctx.db.transaction(
      async (tx) => {
        const rows = await readableLessons(tx, actor, from, to, q.mine === 'true');
        const out: {
          lesson: ReturnType<typeof lessonSummary>;
          plan: PrepPlan | null;
          ticks: Map<string, PrepTick>;
        }[] = [];
        for (const r of rows) {
          // Access was decided by readableLessons (the policy). A lesson the engine refuses shows
          // without tasks, listed as not plannable; any other error fails the request.
          const planned = await planLesson(tx, r.id);
          if (!planned) continue; // deleted since the list was read: impossible in one snapshot
          const plan = planned.plannable ? planned.plan : null;
          const keys = plan?.tasks.map((t) => t.key) ?? [];
          const ticks = new Map((await readTicks(tx, r.id, keys)).map((t) => [t.taskKey, t]));
          out.push({ lesson: lessonSummary(r), plan, ticks });
        }
        // The nearest weeks either side with lessons of the list, so Home can open on the week
        // that matters and an empty week can point to the next (or last) one with lessons.
        const mineOnly = q.mine === 'true';
        const otherWeeks = {
          previous: await nearestWeek(tx, actor, mineOnly, { before: from }),
          next: await nearestWeek(tx, actor, mineOnly, { after: to }),
        };
        return { out, otherWeeks };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    const tasks = result
      .flatMap(({ lesson, plan, ticks }) =>
        (plan?.tasks ?? []).map((task) => {
          // Ticked by one of the lesson's teachers on the lesson page (shared with all of them).
          const tick = ticks.get(task.key);
          return { ...task, lesson, tick: tick ? { at: tick.at, by: tick.by } : null };
        }),
      )
      .sort((a, b) => Date.parse(a.startBy) - Date.parse(b.startBy));
    type Attention = { lesson: ReturnType<typeof lessonSummary>; kind: string; message: string };
    const attention: Attention[] = result.flatMap(({ lesson, plan }): Attention[] =>
      plan
        ? [
            ...plan.shortfalls.map((s) => ({
              lesson,
              kind: 'shortfall',
              // The engine's sentence names the part by name ("Group 8 is short of 1 × Rover …").
              message: s.message,
            })),
            // Booking conflicts come once per pair from findConflicts below, not once per lesson.
            ...plan.warnings
              .filter((w) => w.code !== 'booking-conflict')
              .map((w) => ({ lesson, kind: w.code, message: w.message })),
          ]
        : [{ lesson, kind: 'not-plannable', message: 'This lesson cannot be planned yet.' }],
    );
    // Booking conflicts and recharge gaps that touch one of these lessons need action too.
    const shown = new Map(result.map((r) => [r.lesson.id, r.lesson]));
    const across = await findConflicts(ctx.db, actor, from, to);
    for (const c of across.conflicts) {
      const mine = c.lessons.find((l) => shown.has(l.id));
      if (mine)
        attention.push({
          lesson: shown.get(mine.id)!,
          kind: 'booking-conflict',
          message: c.message,
        });
    }
    for (const g of across.rechargeGaps) {
      const mine = shown.get(g.after.id) ?? shown.get(g.before.id);
      if (mine) attention.push({ lesson: mine, kind: 'recharge-gap', message: g.message });
    }
    res.json({
      week: from,
      lessons: result.map((r) => ({
        ...r.lesson,
        groups: r.plan?.totals.groups ?? null,
        shortfalls: r.plan?.shortfalls.length ?? 0,
      })),
      tasks,
      attention,
      otherWeeks,
    });
  });

  return router;
}

const rangeQuery = z.object({
  from: schoolDate('Give a date that exists, like 2026-07-20.'),
  to: schoolDate('Give a date that exists, like 2026-09-25.'),
});

/** Booking conflicts and recharge gaps among the actor's readable lessons in [from, to). */
async function findConflicts(tx: Tx, actor: Actor, from: string, to: string) {
  const [school] = await tx.select().from(schools).where(eq(schools.id, actor.schoolId));
  const zone = school!.timezone;
  const rows = await readableLessons(tx, actor, from, to, false);
  const ids = rows.map((r) => r.id);
  const bookings = ids.length
    ? await tx
        .select({ lessonId: lessonTubs.lessonId, tubId: tubs.id, label: tubs.label })
        .from(lessonTubs)
        .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
        .where(inArray(lessonTubs.lessonId, ids))
    : [];
  const chargeRows = rows.length
    ? await tx
        .select({ kitTypeId: parts.kitTypeId, minutes: parts.chargeMinutes, name: parts.name })
        .from(parts)
        .where(inArray(parts.kitTypeId, [...new Set(rows.map((r) => r.kitTypeId))]))
    : [];
  const instant = (local: string) => DateTime.fromISO(toLocal(local), { zone }).toMillis();
  const byTub = new Map<string, { label: string; lessons: LessonRow[] }>();
  const byId = new Map(rows.map((r) => [r.id, r]));
  for (const b of bookings) {
    const entry = byTub.get(b.tubId) ?? { label: b.label, lessons: [] };
    entry.lessons.push(byId.get(b.lessonId)!);
    byTub.set(b.tubId, entry);
  }
  const conflicts = new Map<string, { a: LessonRow; b: LessonRow; tubs: string[] }>();
  const gaps = [];
  for (const { label, lessons: list } of byTub.values()) {
    list.sort((x, y) => instant(x.startsAt) - instant(y.startsAt));
    for (let i = 0; i < list.length; i++) {
      for (let j = i + 1; j < list.length; j++) {
        const a = list[i]!;
        const b = list[j]!;
        const overlap = intervalsOverlap(
          { startsAt: instant(a.startsAt), endsAt: instant(a.endsAt) },
          { startsAt: instant(b.startsAt), endsAt: instant(b.endsAt) },
        );
        if (!overlap) break;
        const key = `${a.id}|${b.id}`;
        const c = conflicts.get(key) ?? { a, b, tubs: [] };
        c.tubs.push(label);
        conflicts.set(key, c);
      }
      const next = list[i + 1];
      if (next) {
        const a = list[i]!;
        const between = (instant(next.startsAt) - instant(a.endsAt)) / 60_000;
        const full = Math.max(
          0,
          ...chargeRows
            .filter((p) => p.kitTypeId === a.kitTypeId && p.minutes)
            .map((p) => p.minutes!),
        );
        if (full > 0 && between >= 0 && between < full) {
          gaps.push({
            tub: label,
            before: lessonSummary(a),
            after: lessonSummary(next),
            minutesBetween: between,
            fullChargeMinutes: full,
            message: `${label} has ${between} minutes between "${a.title}" and "${next.title}"; a full charge takes ${full}.`,
          });
        }
      }
    }
  }
  return {
    conflicts: [...conflicts.values()].map((c) => ({
      lessons: [lessonSummary(c.a), lessonSummary(c.b)],
      tubs: c.tubs.sort(naturalCompare),
      message: `"${c.a.title}" and "${c.b.title}" overlap and both book ${c.tubs.join(', ')}.`,
    })),
    rechargeGaps: gaps,
  };
}

/** GET /api/conflicts?from=&to=: booking conflicts and recharge gaps of the school. */
export function conflictsRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    const q = parse(rangeQuery, req.query);
    res.json(await findConflicts(ctx.db, actor, q.from, q.to));
  });
  return router;
}
