import { Router } from 'express';
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { invitations, users } from '../db/schema/index.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { authorize, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { activeAdminCount, endSessionsOf } from '../auth/users.js';
import { INVITATION_DAYS, newToken } from '../auth/tokens.js';
import { enqueueMail } from '../mail/outbox.js';
import { isUniqueViolation } from '../db/errors.js';
import { invitationMail } from '../mail/messages.js';
import { idParamsSchema, type Role } from '../../shared/schemas/common.js';
import { inviteSchema, memberUpdateSchema, type Member } from '../../shared/schemas/members.js';

/** The school's members, oldest first, with a pending invitation's expiry. */
async function listMembers(tx: Tx, schoolId: string, onlyId?: string): Promise<Member[]> {
  const pending = tx
    .select({
      userId: invitations.userId,
      expiresAt: sql<Date>`max(${invitations.expiresAt})`.as('expires_at'),
    })
    .from(invitations)
    .where(isNull(invitations.usedAt))
    .groupBy(invitations.userId)
    .as('pending');
  const rows = await tx
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      status: users.status,
      lastSignInAt: users.lastSignInAt,
      expiresAt: pending.expiresAt,
    })
    .from(users)
    .leftJoin(pending, eq(pending.userId, users.id))
    .where(
      onlyId
        ? and(eq(users.schoolId, schoolId), eq(users.id, onlyId))
        : eq(users.schoolId, schoolId),
    )
    .orderBy(users.createdAt, users.email);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    email: r.email,
    role: r.role,
    status: r.status,
    lastSignInAt: r.lastSignInAt ? r.lastSignInAt.toISOString() : null,
    invitationExpiresAt:
      r.status === 'invited' && r.expiresAt ? new Date(r.expiresAt).toISOString() : null,
  }));
}

async function oneMember(tx: Tx, actor: Actor, id: string): Promise<Member> {
  const [member] = await listMembers(tx, actor.schoolId, id);
  if (!member) throw notFound('That member');
  return member;
}

/** Inserts a fresh invitation token (older ones stop working) and queues its e-mail. */
async function sendInvitation(
  ctx: AppContext,
  tx: Tx,
  actor: Actor,
  userId: string,
  email: string,
  role: Role,
) {
  await tx
    .update(invitations)
    .set({ usedAt: sql`now()` })
    .where(and(eq(invitations.userId, userId), isNull(invitations.usedAt)));
  const { token, hash } = newToken();
  await tx.insert(invitations).values({
    userId,
    tokenHash: hash,
    invitedBy: actor.id,
    expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
  });
  await enqueueMail(
    tx,
    invitationMail(
      ctx.config.appUrl,
      email,
      actor.schoolName,
      role,
      actor.name || actor.email,
      token,
    ),
  );
}

export function membersRouter(ctx: AppContext): Router {
  const router = Router();

  router.use((req, _res, next) => {
    authorize(requireActor(req), 'members.manage');
    next();
  });

  router.get('/', async (req, res) => {
    res.json({ members: await listMembers(ctx.db, requireActor(req).schoolId) });
  });

  router.post('/invitations', async (req, res) => {
    const actor = requireActor(req);
    const body = parse(inviteSchema, req.body);
    // Only this school's people are looked at: whether the address belongs to another school is
    // not the admin's to learn (OWASP Authentication Cheat Sheet, account enumeration). Such an
    // invitation is sent like any other; its link tells the invitee, who owns the address.
    const [existing] = await ctx.db
      .select()
      .from(users)
      .where(and(eq(users.email, body.email), eq(users.schoolId, actor.schoolId)));
    if (existing) {
      const invited = existing.status === 'invited';
      throw new HttpError(
        409,
        invited ? 'already-invited' : 'already-member',
        invited
          ? 'This address already has an invitation. Use "Resend invitation" to send it again.'
          : 'This address belongs to a member of your school already.',
        [{ path: 'email', message: invited ? 'Already invited.' : 'Already a member.' }],
      );
    }
    const member = await ctx.db
      .transaction(async (tx) => {
        const [user] = await tx
          .insert(users)
          .values({
            schoolId: actor.schoolId,
            email: body.email,
            role: body.role,
            status: 'invited',
          })
          .returning();
        await sendInvitation(ctx, tx, actor, user!.id, body.email, body.role);
        return oneMember(tx, actor, user!.id);
      })
      .catch((err: unknown) => {
        // Two admins inviting the same address at once: the second finds the first's invitation.
        if (isUniqueViolation(err))
          throw new HttpError(409, 'already-invited', 'This address was invited a moment ago.', [
            { path: 'email', message: 'Already invited.' },
          ]);
        throw err;
      });
    ctx.kickMail();
    res.status(201).json({ member });
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(memberUpdateSchema, req.body);
    const member = await ctx.db.transaction(async (tx) => {
      // Lock the school's admins so two admins demoting each other cannot leave none.
      await tx.execute(
        sql`SELECT id FROM users WHERE school_id = ${actor.schoolId} AND role = 'admin' FOR UPDATE`,
      );
      const current = await oneMember(tx, actor, id);
      if (body.status === 'active' && current.status === 'invited') {
        throw new HttpError(
          400,
          'not-accepted',
          'This person has not accepted the invitation yet.',
        );
      }
      const losesAdmin =
        current.role === 'admin' &&
        current.status === 'active' &&
        ((body.role !== undefined && body.role !== 'admin') || body.status === 'deactivated');
      if (losesAdmin && (await activeAdminCount(tx, actor.schoolId)) <= 1) {
        throw new HttpError(
          400,
          'last-admin',
          'A school needs at least one active admin. Make someone else admin first.',
        );
      }
      await tx
        .update(users)
        .set({
          ...(body.role ? { role: body.role } : {}),
          ...(body.status ? { status: body.status } : {}),
        })
        .where(and(eq(users.id, id), eq(users.schoolId, actor.schoolId)));
      if (body.status === 'deactivated') await endSessionsOf(tx, id);
      return oneMember(tx, actor, id);
    });
    res.json({ member });
  });

  router.post('/:id/resend', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const member = await ctx.db.transaction(async (tx) => {
      const current = await oneMember(tx, actor, id);
      if (current.status !== 'invited') {
        throw new HttpError(
          400,
          'not-invited',
          'This person has already accepted their invitation.',
        );
      }
      await sendInvitation(ctx, tx, actor, id, current.email, current.role);
      return oneMember(tx, actor, id);
    });
    ctx.kickMail();
    res.status(202).json({ member });
  });

  return router;
}
