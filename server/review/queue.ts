/**
 * The review queue (units waiting for a decision, oldest first) and the lead's Home summary:
 * how many wait, and how many outcomes no unit of the current term covers.
 */
import { and, asc, eq, sql, type SQL } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { lessons, outcomeFrameworks, schools, terms, units, users } from '../db/schema/index.js';
import type { Actor } from '../auth/policy.js';
import type { QueueRow, ReviewQueueQuery, ReviewSummary } from '../../shared/schemas/review.js';
import type { UnitStatus } from '../../shared/schemas/units.js';
import { coverageMatrix, gapCount } from './coverage-matrix.js';

const DAY_MS = 24 * 60 * 60 * 1000;

/** Units of the actor's school in the queried review status, waiting longest first. */
export async function reviewQueue(
  tx: Tx,
  actor: Actor,
  query: ReviewQueueQuery,
  now = new Date(),
): Promise<QueueRow[]> {
  const waitingSince = sql`coalesce(${units.submittedAt}, ${units.updatedAt})`;
  const where: SQL[] = [eq(units.schoolId, actor.schoolId), eq(units.status, query.status)];
  if (query.yearLevel !== undefined) where.push(eq(units.yearLevel, query.yearLevel));
  if (query.term !== undefined) where.push(eq(units.term, query.term));
  const rows = await tx
    .select({
      id: units.id,
      title: units.title,
      yearLevel: units.yearLevel,
      term: units.term,
      status: units.status,
      version: units.version,
      ownerId: users.id,
      ownerName: users.name,
      ownerEmail: users.email,
      submittedAt: units.submittedAt,
      updatedAt: units.updatedAt,
      lessonCount: sql<number>`(select count(*)::int from ${lessons} where ${lessons.unitId} = ${units.id})`,
    })
    .from(units)
    .innerJoin(users, eq(users.id, units.ownerId))
    .where(and(...where))
    .orderBy(asc(waitingSince), asc(units.title))
    .limit(500);
  return rows.map((r) => {
    const since = r.submittedAt ?? r.updatedAt;
    return {
      id: r.id,
      title: r.title,
      yearLevel: r.yearLevel,
      term: r.term,
      status: r.status as UnitStatus,
      version: r.version,
      owner: { id: r.ownerId, name: r.ownerName || r.ownerEmail },
      lessonCount: r.lessonCount,
      waitingSince: since.toISOString(),
      daysWaiting: Math.max(0, Math.floor((now.getTime() - since.getTime()) / DAY_MS)),
    };
  });
}

/** Today's date (`YYYY-MM-DD`) in the school's timezone. */
export function schoolToday(timezone: string, now: Date): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: timezone }).format(now);
}

/**
 * The current term: the one holding today; between terms, the next one; after the last, the
 * last. Its number is its place among the terms of its calendar year.
 */
export async function currentTerm(
  tx: Tx,
  schoolId: string,
  now: Date,
): Promise<ReviewSummary['term']> {
  const [school] = await tx
    .select({ timezone: schools.timezone })
    .from(schools)
    .where(eq(schools.id, schoolId));
  const all = await tx
    .select()
    .from(terms)
    .where(eq(terms.schoolId, schoolId))
    .orderBy(asc(terms.startsOn));
  if (!school || all.length === 0) return null;
  const today = schoolToday(school.timezone, now);
  const term =
    all.find((t) => t.startsOn <= today && today <= t.endsOn) ??
    all.find((t) => t.startsOn > today) ??
    all[all.length - 1]!;
  const year = Number(term.startsOn.slice(0, 4));
  const number = all.filter((t) => t.startsOn.startsWith(`${year}-`)).indexOf(term) + 1;
  return { number: Math.min(Math.max(number, 1), 4), name: term.name, year };
}

/** The lead's Home: what waits for review, and each framework's gaps in the current term. */
export async function reviewSummary(
  tx: Tx,
  actor: Actor,
  now = new Date(),
): Promise<ReviewSummary> {
  const queue = await reviewQueue(tx, actor, { status: 'in-review' }, now);
  const term = await currentTerm(tx, actor.schoolId, now);
  const frameworks = await tx
    .select({ id: outcomeFrameworks.id, name: outcomeFrameworks.name })
    .from(outcomeFrameworks)
    .where(eq(outcomeFrameworks.schoolId, actor.schoolId))
    .orderBy(asc(outcomeFrameworks.name));
  const counts = [];
  for (const f of frameworks) {
    const matrix = await coverageMatrix(tx, actor, {
      frameworkId: f.id,
      status: 'any',
      ...(term ? { term: term.number } : {}),
    });
    counts.push({ ...f, outcomes: matrix.outcomes.length, gaps: gapCount(matrix) });
  }
  return { waiting: queue.length, oldest: queue.slice(0, 5), term, frameworks: counts };
}
