import { and, eq, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { schools, users } from '../db/schema/index.js';
import type { SessionUser } from '../../shared/schemas/auth.js';

/** Loads a user with their school's name, as the auth routes return it. */
export async function sessionUser(tx: Tx, userId: string): Promise<SessionUser | null> {
  const [row] = await tx
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      schoolId: users.schoolId,
      schoolName: schools.name,
    })
    .from(users)
    .innerJoin(schools, eq(schools.id, users.schoolId))
    .where(eq(users.id, userId));
  return row;
}

/** Ends every stored session of a user, optionally keeping one (the caller's own). */
export async function endSessionsOf(tx: Tx, userId: string, keepSid?: string): Promise<void> {
  await tx.execute(
    keepSid
      ? sql`DELETE FROM "session" WHERE sess->>'userId' = ${userId} AND sid <> ${keepSid}`
      : sql`DELETE FROM "session" WHERE sess->>'userId' = ${userId}`,
  );
}

/** Number of active admins of a school. */
export async function activeAdminCount(tx: Tx, schoolId: string): Promise<number> {
  const [row] = await tx
    .select({ n: sql<number>`count(*)::int` })
    .from(users)
    .where(and(eq(users.schoolId, schoolId), eq(users.role, 'admin'), eq(users.status, 'active')));
  return row?.n ?? 0;
}
