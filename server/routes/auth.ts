import { Router, type Request, type Response } from 'express';
import { and, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { passwordResets, users } from '../db/schema/index.js';
import { HttpError, parse } from '../http.js';
import { issueCsrf } from '../auth/csrf.js';
import {
  dummyPasswordHash,
  hashPassword,
  passwordProblem,
  verifyPassword,
} from '../auth/passwords.js';
import { destroySession, regenerate, requireActor, saveSession } from '../auth/session.js';
import { endSessionsOf, sessionUser } from '../auth/users.js';
import { hashToken, newToken, RESET_MINUTES } from '../auth/tokens.js';
import { enqueueMail } from '../mail/outbox.js';
import { resetMail, signInWarningMail } from '../mail/messages.js';
import { countRequest, reserveSignIn, signInKeys, sleep } from '../auth/throttle.js';
import {
  resetCompleteSchema,
  resetRequestSchema,
  signInSchema,
} from '../../shared/schemas/auth.js';

/** Reset e-mails one address may ask for in the throttling window. */
const RESET_REQUESTS_PER_WINDOW = 10;

const resetInvalid = () =>
  new HttpError(
    400,
    'token-invalid',
    'This reset link has been used or has run out. Ask for a new one.',
  );

/** Completes a sign-in: new session id, new CSRF token, last sign-in time. */
export async function signInAs(ctx: AppContext, req: Request, res: Response, userId: string) {
  await regenerate(req);
  req.session.userId = userId;
  issueCsrf(req, res, ctx.config.sessionSecret, ctx.config.behindHttps);
  await saveSession(req);
  await ctx.db
    .update(users)
    .set({ lastSignInAt: sql`now()` })
    .where(eq(users.id, userId));
  return sessionUser(ctx.db, userId);
}

export function authRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/csrf', (req, res) => {
    issueCsrf(req, res, ctx.config.sessionSecret, ctx.config.behindHttps);
    res.status(204).end();
  });

  router.post('/sign-in', async (req, res) => {
    // A malformed request checks no password, so it is answered before anything is counted.
    const body = parse(signInSchema, req.body);
    const attempt = await reserveSignIn(ctx.db, signInKeys(body.email, req.ip ?? ''));
    if (attempt.delayMs) await sleep(attempt.delayMs);
    // The joined account of the address (invitations may wait in other schools; they have no
    // password, so they would only cost the dummy hash below anyway).
    const [user] = await ctx.db
      .select()
      .from(users)
      .where(and(eq(users.email, body.email), ne(users.status, 'invited')));
    // An unknown address costs the same hash as a known one, and answers the same 401.
    // An invited person without a password yet costs the same hash too, so timing cannot tell
    // "invited, not joined" from "has an account".
    const hash = user?.passwordHash ?? (await dummyPasswordHash());
    const matches = await verifyPassword(hash, body.password);
    const ok = !!user && !!user.passwordHash && matches && user.status === 'active';
    if (!user || !ok) {
      if (user && user.status === 'active' && (await attempt.shouldWarn())) {
        await enqueueMail(ctx.db, signInWarningMail(ctx.config.appUrl, user.email, user.name));
        ctx.kickMail();
      }
      throw new HttpError(
        401,
        'invalid-credentials',
        "That e-mail and password don't match an account.",
      );
    }
    await attempt.release();
    res.json({ user: await signInAs(ctx, req, res, user.id) });
  });

  router.post('/sign-out', async (req, res) => {
    if (req.session) await destroySession(req);
    res.clearCookie('trayplan.sid', { path: '/' });
    res.status(204).end();
  });

  /**
   * The session as the app's start-up asks for it: 200 with the user, or with null when signed
   * out. A signed-out visit is normal, so it must not be an HTTP error the browser logs.
   */
  router.get('/session', (req, res) => {
    res.json({ user: req.actor ?? null });
  });

  router.get('/me', (req, res) => {
    const actor = requireActor(req);
    res.json({ user: actor });
  });

  router.post('/password-reset', async (req, res) => {
    const { email } = parse(resetRequestSchema, req.body);
    await countRequest(ctx.db, `reset:${email}`, RESET_REQUESTS_PER_WINDOW);
    const [user] = await ctx.db
      .select()
      .from(users)
      .where(and(eq(users.email, email), eq(users.status, 'active')));
    if (user) {
      const { token, hash } = newToken();
      await ctx.db.transaction(async (tx) => {
        await tx.insert(passwordResets).values({
          userId: user.id,
          tokenHash: hash,
          expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000),
        });
        await enqueueMail(tx, resetMail(ctx.config.appUrl, user.email, user.name, token));
      });
      ctx.kickMail();
    }
    // The same answer whether or not the address has an account.
    res.status(202).json({ ok: true });
  });

  router.post('/password-reset/complete', async (req, res) => {
    const body = parse(resetCompleteSchema, req.body);
    const [reset] = await ctx.db
      .select({ id: passwordResets.id, userId: passwordResets.userId, email: users.email })
      .from(passwordResets)
      .innerJoin(users, eq(users.id, passwordResets.userId))
      .where(
        and(
          eq(passwordResets.tokenHash, hashToken(body.token)),
          isNull(passwordResets.usedAt),
          gt(passwordResets.expiresAt, sql`now()`),
          eq(users.status, 'active'),
        ),
      );
    if (!reset) throw resetInvalid();
    const problem = passwordProblem(body.password, reset.email);
    if (problem) {
      throw new HttpError(400, 'password-common', problem, [
        { path: 'password', message: problem },
      ]);
    }
    const passwordHash = await hashPassword(body.password);
    const claimed = await ctx.db.transaction(async (tx) => {
      // The claim is one conditional UPDATE: of racing uses of the link exactly one gets a row.
      const [won] = await tx
        .update(passwordResets)
        .set({ usedAt: sql`now()` })
        .where(
          and(
            eq(passwordResets.id, reset.id),
            isNull(passwordResets.usedAt),
            gt(passwordResets.expiresAt, sql`now()`),
          ),
        )
        .returning({ id: passwordResets.id });
      if (!won) return false;
      await tx.update(users).set({ passwordHash }).where(eq(users.id, reset.userId));
      // Any other reset link of this person stops working too.
      await tx
        .update(passwordResets)
        .set({ usedAt: sql`now()` })
        .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
      await endSessionsOf(tx, reset.userId);
      return true;
    });
    if (!claimed) throw resetInvalid();
    res.status(204).end();
  });

  return router;
}
