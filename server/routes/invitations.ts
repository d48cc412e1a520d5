import { Router } from 'express';
import { and, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { invitations, schools, users } from '../db/schema/index.js';
import { HttpError, parse } from '../http.js';
import { hashPassword, passwordProblem } from '../auth/passwords.js';
import { hashToken } from '../auth/tokens.js';
import { isUniqueViolation } from '../db/errors.js';
import { signInAs } from './auth.js';
import { acceptInvitationSchema } from '../../shared/schemas/auth.js';

const tokenParams = z.object({ token: z.string().min(10).max(200) });
const invalid = () =>
  new HttpError(
    404,
    'invitation-invalid',
    'This invitation has been used or has run out. Ask your school admin for a new one.',
  );

export function invitationsRouter(ctx: AppContext): Router {
  const router = Router();

  async function find(token: string) {
    const [row] = await ctx.db
      .select({
        id: invitations.id,
        userId: users.id,
        email: users.email,
        role: users.role,
        schoolName: schools.name,
        expiresAt: invitations.expiresAt,
      })
      .from(invitations)
      .innerJoin(users, eq(users.id, invitations.userId))
      .innerJoin(schools, eq(schools.id, users.schoolId))
      .where(
        and(
          eq(invitations.tokenHash, hashToken(token)),
          isNull(invitations.usedAt),
          gt(invitations.expiresAt, sql`now()`),
          eq(users.status, 'invited'),
        ),
      );
    return row;
  }

  /** Whether the address already joined Trayplan (in any school): then no invitation can be used. */
  async function joinedElsewhere(email: string): Promise<boolean> {
    const [joined] = await ctx.db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.email, email), ne(users.status, 'invited')));
    return !!joined;
  }
  // Told to the invitee only (the holder of the link owns the address), never to the admin.
  const alreadyJoined = () =>
    new HttpError(
      409,
      'invitation-address-taken',
      'This e-mail address already has a Trayplan account at another school, and an account ' +
        'belongs to one school. Ask the school that invited you to use another address.',
    );

  router.get('/:token', async (req, res) => {
    const parsed = tokenParams.safeParse(req.params);
    const row = parsed.success ? await find(parsed.data.token) : undefined;
    if (!row) throw invalid();
    if (await joinedElsewhere(row.email)) throw alreadyJoined();
    res.json({
      email: row.email,
      role: row.role,
      schoolName: row.schoolName,
      expiresAt: row.expiresAt.toISOString(),
    });
  });

  router.post('/:token/accept', async (req, res) => {
    const parsed = tokenParams.safeParse(req.params);
    const row = parsed.success ? await find(parsed.data.token) : undefined;
    if (!row) throw invalid();
    const body = parse(acceptInvitationSchema, req.body);
    if (await joinedElsewhere(row.email)) throw alreadyJoined();
    const problem = passwordProblem(body.password, row.email);
    if (problem)
      throw new HttpError(400, 'password-common', problem, [
        { path: 'password', message: problem },
      ]);
    const passwordHash = await hashPassword(body.password);
    const accepted = await ctx.db
      .transaction(async (tx) => {
        // The claim is one conditional UPDATE: of racing uses of the link exactly one gets a row.
        const [won] = await tx
          .update(invitations)
          .set({ usedAt: sql`now()` })
          .where(
            and(
              eq(invitations.id, row.id),
              isNull(invitations.usedAt),
              gt(invitations.expiresAt, sql`now()`),
            ),
          )
          .returning({ id: invitations.id });
        if (!won) return false;
        // The status condition keeps an older link of the same person from reviving the account.
        const done = await tx
          .update(users)
          .set({ name: body.name, passwordHash, status: 'active' })
          .where(and(eq(users.id, row.userId), eq(users.status, 'invited')))
          .returning({ id: users.id });
        if (done.length !== 1) return false;
        await tx
          .update(invitations)
          .set({ usedAt: sql`now()` })
          .where(and(eq(invitations.userId, row.userId), isNull(invitations.usedAt)));
        return true;
      })
      .catch((err: unknown) => {
        // Two schools' invitations of one address accepted at once: the unique index on joined
        // addresses lets one win; the other is told the address is taken.
        if (isUniqueViolation(err)) return 'taken' as const;
        throw err;
      });
    if (accepted === 'taken') throw alreadyJoined();
    if (!accepted) throw invalid();
    res.json({ user: await signInAs(ctx, req, res, row.userId) });
  });

  return router;
}
