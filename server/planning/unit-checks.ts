/** Checks of a unit's outcomes and co-authors against the school's records. */
import { and, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { outcomeFrameworks, outcomes, users } from '../db/schema/index.js';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import { asId } from './checks.js';

function ids(raw: unknown): string[] {
  return Array.isArray(raw) ? raw.map(asId).filter((x): x is string => x !== undefined) : [];
}

/** Each outcome must be of one of the school's frameworks (`outcomeIds.2`). */
export async function outcomeProblems(
  tx: Tx,
  schoolId: string,
  raw: unknown,
): Promise<ApiErrorDetail[]> {
  const wanted = ids(raw);
  if (!Array.isArray(raw) || wanted.length === 0) return [];
  const found = await tx
    .select({ id: outcomes.id })
    .from(outcomes)
    .innerJoin(outcomeFrameworks, eq(outcomeFrameworks.id, outcomes.frameworkId))
    .where(and(inArray(outcomes.id, wanted), eq(outcomeFrameworks.schoolId, schoolId)));
  const ok = new Set(found.map((o) => o.id));
  const out: ApiErrorDetail[] = [];
  raw.forEach((v, i) => {
    const id = asId(v);
    if (id && !ok.has(id))
      out.push({
        path: `outcomeIds.${i}`,
        message: 'This outcome is not in your school’s frameworks.',
      });
  });
  return out;
}

/** Each co-author must be an active teacher of the school, and not the owner (`coauthorIds.0`). */
export async function coauthorProblems(
  tx: Tx,
  schoolId: string,
  ownerId: string,
  raw: unknown,
): Promise<ApiErrorDetail[]> {
  const wanted = ids(raw);
  if (!Array.isArray(raw) || wanted.length === 0) return [];
  const found = await tx
    .select({ id: users.id })
    .from(users)
    .where(
      and(
        inArray(users.id, wanted),
        eq(users.schoolId, schoolId),
        eq(users.role, 'teacher'),
        eq(users.status, 'active'),
      ),
    );
  const ok = new Set(found.map((u) => u.id));
  const out: ApiErrorDetail[] = [];
  raw.forEach((v, i) => {
    const id = asId(v);
    if (!id) return;
    if (id === ownerId)
      out.push({ path: `coauthorIds.${i}`, message: 'The owner is already an author.' });
    else if (!ok.has(id))
      out.push({ path: `coauthorIds.${i}`, message: 'Choose a teacher of your school.' });
  });
  return out;
}
