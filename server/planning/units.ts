/** Reading units: the detail record every unit route answers with, and the filtered lists. */
import { and, asc, desc, eq, ilike, or, sql, type SQL } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  classes,
  lessons,
  outcomes,
  unitCoauthors,
  unitOutcomes,
  terms,
  units,
  users,
} from '../db/schema/index.js';
import { notFound } from '../http.js';
import { canEditUnit, canReadUnit, type Actor, type UnitFacts } from '../auth/policy.js';
import type { Unit, UnitListQuery, UnitSummary } from '../../shared/schemas/units.js';
import { likePattern, toLocal } from './format.js';
import { basedOnOf } from '../reuse/based-on.js';
import { outsideTermNote } from '../../shared/calendar/terms.js';

function person(u: { id: string; name: string; email: string }) {
  return { id: u.id, name: u.name || u.email, email: u.email };
}

/** The unit as `GET /api/units/:id` answers it, for this actor (404 when there is none). */
export async function unitDetail(tx: Tx, actor: Actor, unitId: string): Promise<Unit> {
  const [row] = await tx
    .select({ unit: units, owner: { id: users.id, name: users.name, email: users.email } })
    .from(units)
    .innerJoin(users, eq(users.id, units.ownerId))
    .where(eq(units.id, unitId));
  if (!row) throw notFound('That unit');
  const coauthors = await tx
    .select({ id: users.id, name: users.name, email: users.email })
    .from(unitCoauthors)
    .innerJoin(users, eq(users.id, unitCoauthors.userId))
    .where(eq(unitCoauthors.unitId, unitId))
    .orderBy(asc(users.name), asc(users.email));
  const unitOutcomeRows = await tx
    .select({
      id: outcomes.id,
      code: outcomes.code,
      description: outcomes.description,
      frameworkId: outcomes.frameworkId,
      strand: outcomes.strand,
      yearBand: outcomes.yearBand,
    })
    .from(unitOutcomes)
    .innerJoin(outcomes, eq(outcomes.id, unitOutcomes.outcomeId))
    .where(eq(unitOutcomes.unitId, unitId))
    .orderBy(asc(outcomes.code));
  const lessonRows = await tx
    .select({
      id: lessons.id,
      title: lessons.title,
      startsAt: lessons.startsAt,
      endsAt: lessons.endsAt,
      classId: classes.id,
      className: classes.name,
    })
    .from(lessons)
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position), asc(lessons.createdAt));
  const u = row.unit;
  const schoolTerms = await tx
    .select({ name: terms.name, startsOn: terms.startsOn, endsOn: terms.endsOn })
    .from(terms)
    .where(eq(terms.schoolId, u.schoolId));
  const facts: UnitFacts = {
    schoolId: u.schoolId,
    ownerId: u.ownerId,
    visibility: u.visibility,
    coauthorIds: coauthors.map((c) => c.id),
  };
  return {
    id: u.id,
    title: u.title,
    yearLevel: u.yearLevel,
    learningArea: u.learningArea,
    term: u.term,
    status: u.status,
    visibility: u.visibility,
    owner: person(row.owner),
    version: u.version,
    updatedAt: u.updatedAt.toISOString(),
    canEdit: canEditUnit(actor, facts),
    overview: u.overview,
    copiedFromId: u.copiedFromId,
    createdAt: u.createdAt.toISOString(),
    coauthors: coauthors.map(person),
    outcomes: unitOutcomeRows,
    lessons: lessonRows.map((l) => ({
      id: l.id,
      title: l.title,
      date: toLocal(l.startsAt).slice(0, 10),
      startsAt: toLocal(l.startsAt),
      endsAt: toLocal(l.endsAt),
      classId: l.classId,
      className: l.className,
      termNote: outsideTermNote(toLocal(l.startsAt).slice(0, 10), u.term, schoolTerms),
    })),
    isOwner: canEditUnit(actor, facts) && u.ownerId === actor.id,
    basedOn: await basedOnOf(tx, actor, unitId),
  };
}

/**
 * The "My units" list (owned or co-authored) or the school's library (shared with the school;
 * for a lead, who reviews, every unit of the school), filtered, most recently changed first.
 */
export async function listUnits(
  tx: Tx,
  actor: Actor,
  query: UnitListQuery,
): Promise<UnitSummary[]> {
  const coauthoring = sql<boolean>`exists (select 1 from ${unitCoauthors} where ${unitCoauthors.unitId} = ${units.id} and ${unitCoauthors.userId} = ${actor.id})`;
  const where: (SQL | undefined)[] = [eq(units.schoolId, actor.schoolId)];
  if (query.scope === 'mine') where.push(or(eq(units.ownerId, actor.id), coauthoring));
  else if (actor.role !== 'lead') where.push(eq(units.visibility, 'school'));
  if (query.yearLevel !== undefined) where.push(eq(units.yearLevel, query.yearLevel));
  if (query.term !== undefined) where.push(eq(units.term, query.term));
  if (query.status) where.push(eq(units.status, query.status));
  if (query.owner) where.push(eq(units.ownerId, query.owner));
  if (query.q) {
    const p = likePattern(query.q);
    where.push(or(ilike(units.title, p), ilike(units.learningArea, p), ilike(units.overview, p)));
  }
  const rows = await tx
    .select({
      unit: units,
      owner: { id: users.id, name: users.name, email: users.email },
      isCoauthor: coauthoring,
      lessonCount: sql<number>`(select count(*)::int from ${lessons} where ${lessons.unitId} = ${units.id})`,
    })
    .from(units)
    .innerJoin(users, eq(users.id, units.ownerId))
    .where(and(...where))
    .orderBy(desc(units.updatedAt), asc(units.title))
    .limit(500);
  const out: UnitSummary[] = [];
  for (const r of rows) {
    const u = r.unit;
    // The policy has the last word; the SQL above only narrows the rows it is asked about.
    const facts: UnitFacts = {
      schoolId: u.schoolId,
      ownerId: u.ownerId,
      visibility: u.visibility,
      coauthorIds: r.isCoauthor ? [actor.id] : [],
    };
    if (!canReadUnit(actor, facts)) continue;
    out.push({
      id: u.id,
      title: u.title,
      yearLevel: u.yearLevel,
      learningArea: u.learningArea,
      term: u.term,
      status: u.status,
      visibility: u.visibility,
      owner: person(r.owner),
      lessonCount: r.lessonCount,
      version: u.version,
      updatedAt: u.updatedAt.toISOString(),
      canEdit: canEditUnit(actor, facts),
    });
  }
  return out;
}
