/**
 * The coverage matrix of API.md: every outcome of a framework (covered or not) against year level
 * × term, each cell the units of that year level and term that list the outcome and that the
 * asker may see. Columns: the year levels the school teaches (its classes) and those of its units
 * for the framework, each with terms 1–4; the query narrows both.
 */
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  classes,
  outcomeFrameworks,
  outcomes,
  unitCoauthors,
  unitOutcomes,
  units,
} from '../db/schema/index.js';
import { notFound } from '../http.js';
import { canSeeInReview, type Actor } from '../auth/policy.js';
import { naturalCompare } from '../../shared/prep/index.js';
import type {
  Coverage,
  CoverageColumn,
  CoverageQuery,
  CoverageUnit,
} from '../../shared/schemas/review.js';
import type { UnitStatus } from '../../shared/schemas/units.js';

/** Terms of a school year (termSchema allows 1–4). */
export const TERMS = [1, 2, 3, 4] as const;

/** A unit linked to an outcome of the framework, as the matrix needs it. */
interface Placed extends CoverageUnit {
  yearLevel: number;
  term: number | null;
  outcomeId: string;
}

/** The outcomes of the framework in the framework's grouping: by strand, then by code. */
async function frameworkOutcomes(tx: Tx, frameworkId: string) {
  const rows = await tx
    .select({
      id: outcomes.id,
      code: outcomes.code,
      description: outcomes.description,
      strand: outcomes.strand,
    })
    .from(outcomes)
    .where(eq(outcomes.frameworkId, frameworkId));
  return rows.sort((a, b) => naturalCompare(a.strand, b.strand) || naturalCompare(a.code, b.code));
}

/** Every unit–outcome link of the framework in the school that the actor may see. */
async function visibleLinks(tx: Tx, actor: Actor, frameworkId: string): Promise<Placed[]> {
  const rows = await tx
    .select({
      id: units.id,
      title: units.title,
      status: units.status,
      yearLevel: units.yearLevel,
      term: units.term,
      schoolId: units.schoolId,
      ownerId: units.ownerId,
      visibility: units.visibility,
      outcomeId: unitOutcomes.outcomeId,
    })
    .from(unitOutcomes)
    .innerJoin(units, eq(units.id, unitOutcomes.unitId))
    .innerJoin(outcomes, eq(outcomes.id, unitOutcomes.outcomeId))
    .where(and(eq(outcomes.frameworkId, frameworkId), eq(units.schoolId, actor.schoolId)));
  const unitIds = [...new Set(rows.map((r) => r.id))];
  const coauthors = new Map<string, string[]>();
  if (unitIds.length) {
    const links = await tx
      .select()
      .from(unitCoauthors)
      .where(inArray(unitCoauthors.unitId, unitIds));
    for (const l of links) coauthors.set(l.unitId, [...(coauthors.get(l.unitId) ?? []), l.userId]);
  }
  // The policy decides, unit by unit: the SQL above only narrows to the school.
  return rows
    .filter((r) => canSeeInReview(actor, { ...r, coauthorIds: coauthors.get(r.id) ?? [] }))
    .map((r) => ({
      id: r.id,
      title: r.title,
      status: r.status as UnitStatus,
      yearLevel: r.yearLevel,
      term: r.term,
      outcomeId: r.outcomeId,
    }));
}

/** The matrix for the query (404 when the framework is not one of the actor's school). */
export async function coverageMatrix(
  tx: Tx,
  actor: Actor,
  query: CoverageQuery,
): Promise<Coverage> {
  const [framework] = await tx
    .select({ id: outcomeFrameworks.id, name: outcomeFrameworks.name })
    .from(outcomeFrameworks)
    .where(
      and(
        eq(outcomeFrameworks.id, query.frameworkId),
        eq(outcomeFrameworks.schoolId, actor.schoolId),
      ),
    );
  if (!framework) throw notFound('That outcomes framework');
  const list = await frameworkOutcomes(tx, framework.id);
  const links = await visibleLinks(tx, actor, framework.id);
  const taught = await tx
    .selectDistinct({ yearLevel: classes.yearLevel })
    .from(classes)
    .where(eq(classes.schoolId, actor.schoolId))
    .orderBy(asc(classes.yearLevel));
  const years =
    query.yearLevel !== undefined
      ? [query.yearLevel]
      : [...new Set([...taught.map((c) => c.yearLevel), ...links.map((l) => l.yearLevel)])].sort(
          (a, b) => a - b,
        );
  const terms = query.term !== undefined ? [query.term] : [...TERMS];
  const columns: CoverageColumn[] = years.flatMap((yearLevel) =>
    terms.map((term) => ({ yearLevel, term })),
  );
  const counted = links.filter((l) => query.status === 'any' || l.status === 'endorsed');
  const cellKey = (outcomeId: string, yearLevel: number, term: number | null) =>
    `${outcomeId}|${yearLevel}|${term}`;
  const byCell = new Map<string, CoverageUnit[]>();
  for (const l of counted) {
    const key = cellKey(l.outcomeId, l.yearLevel, l.term);
    byCell.set(key, [...(byCell.get(key) ?? []), { id: l.id, title: l.title, status: l.status }]);
  }
  return {
    framework,
    columns,
    outcomes: list.map((o) => ({
      ...o,
      cells: columns.map((c) => ({
        ...c,
        units: (byCell.get(cellKey(o.id, c.yearLevel, c.term)) ?? []).sort(
          (a, b) => naturalCompare(a.title, b.title) || a.id.localeCompare(b.id),
        ),
      })),
    })),
  };
}

/** How many outcomes no cell covers: the gaps the lead's Home counts. */
export function gapCount(matrix: Coverage): number {
  return matrix.outcomes.filter((o) => o.cells.every((c) => c.units.length === 0)).length;
}
