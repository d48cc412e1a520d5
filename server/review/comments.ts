/** A unit's review comments: read in order, and written (alone or with a review step). */
import { and, asc, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { lessons, unitComments, users } from '../db/schema/index.js';
import { HttpError } from '../http.js';
import type { Actor } from '../auth/policy.js';
import type { ReviewAction, UnitComment } from '../../shared/schemas/review.js';

const columns = {
  id: unitComments.id,
  body: unitComments.body,
  at: unitComments.at,
  lessonId: unitComments.lessonId,
  step: unitComments.step,
  authorId: users.id,
  authorName: users.name,
  authorEmail: users.email,
};

function toComment(r: {
  id: string;
  body: string;
  at: Date;
  lessonId: string | null;
  step: string | null;
  authorId: string | null;
  authorName: string | null;
  authorEmail: string | null;
}): UnitComment {
  return {
    id: r.id,
    body: r.body,
    at: r.at.toISOString(),
    lessonId: r.lessonId,
    step: r.step as ReviewAction | null,
    author: r.authorId ? { id: r.authorId, name: r.authorName || r.authorEmail || '' } : null,
  };
}

/** The unit's comments, oldest first. */
export async function listComments(tx: Tx, unitId: string): Promise<UnitComment[]> {
  const rows = await tx
    .select(columns)
    .from(unitComments)
    .leftJoin(users, eq(users.id, unitComments.authorId))
    .where(eq(unitComments.unitId, unitId))
    .orderBy(asc(unitComments.at), asc(unitComments.id));
  return rows.map(toComment);
}

/** The title of the unit's lesson `lessonId`, or a 400 when the unit has no such lesson. */
export async function lessonOfUnit(tx: Tx, unitId: string, lessonId: string): Promise<string> {
  const [row] = await tx
    .select({ title: lessons.title })
    .from(lessons)
    .where(and(eq(lessons.id, lessonId), eq(lessons.unitId, unitId)));
  if (!row) {
    throw new HttpError(400, 'invalid-input', 'Some fields need attention.', [
      { path: 'lessonId', message: 'Choose one of this unit’s lessons.' },
    ]);
  }
  return row.title;
}

/** Writes a comment and answers it as the list shows it. */
export async function addComment(
  tx: Tx,
  actor: Actor,
  unit: { id: string; schoolId: string },
  body: string,
  lessonId: string | null,
  step: ReviewAction | null,
): Promise<UnitComment> {
  const [row] = await tx
    .insert(unitComments)
    .values({ unitId: unit.id, schoolId: unit.schoolId, lessonId, authorId: actor.id, body, step })
    .returning();
  return toComment({
    ...row!,
    authorId: actor.id,
    authorName: actor.name,
    authorEmail: actor.email,
  });
}
