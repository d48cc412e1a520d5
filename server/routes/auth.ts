import { Router, type Request, type Response } from 'express';
import { rateLimit, type Options } from 'express-rate-limit';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
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
import { resetMail } from '../mail/messages.js';
import {
  resetCompleteSchema,
  resetRequestSchema,
  signInSchema,
} from '../../shared/schemas/auth.js';

const FIFTEEN_MINUTES = 15 * 60 * 1000;

/** 429 with Retry-After (RFC 6585 §4, RFC 9110 §10.2.3) in the API's error shape. */
const throttled: Options['handler'] = (req, res) => {
  const reset = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
  const seconds = reset ? Math.max(1, Math.ceil((reset.getTime() - Date.now()) / 1000)) : 900;
  res.setHeader('Retry-After', String(seconds));
  res.status(429).json({
    error: {
      code: 'throttled',
      message: `Too many attempts. Try again in ${Math.ceil(seconds / 60)} minutes.`,
    },
  });
};

function emailKey(req: Request): string {
  const raw = (req.body as { email?: unknown } | undefined)?.email;
  return typeof raw === 'string' ? `email:${raw.trim().toLowerCase()}` : 'email:';
}

/** Completes a sign-in: new session id, new CSRF token, last sign-in time. */
export async function signInAs(ctx: AppContext, req: Request, res: Response, userId: string) {
  await regenerate(req);
  req.session.userId = userId;
  issueCsrf(req, res, ctx.config.behindHttps);
  await saveSession(req);
  await ctx.db
    .update(users)
    .set({ lastSignInAt: sql`now()` })
    .where(eq(users.id, userId));
  return sessionUser(ctx.db, userId);
}

export function authRouter(ctx: AppContext): Router {
  const router = Router();

  // Failed sign-ins only are counted (skipSuccessfulRequests): 5 per e-mail, 30 per address.
  const perAddress = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: 30,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: throttled,
  });
  const perEmail = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: 5,
    skipSuccessfulRequests: true,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: emailKey,
    handler: throttled,
  });
  const resetLimit = rateLimit({
    windowMs: FIFTEEN_MINUTES,
    limit: 10,
    standardHeaders: false,
    legacyHeaders: false,
    keyGenerator: emailKey,
    handler: throttled,
  });

  router.get('/csrf', (req, res) => {
    issueCsrf(req, res, ctx.config.behindHttps);
    res.status(204).end();
  });

  router.post('/sign-in', perAddress, perEmail, async (req, res) => {
    const body = parse(signInSchema, req.body);
    const [user] = await ctx.db.select().from(users).where(eq(users.email, body.email));
    // An unknown address costs the same hash as a known one, and answers the same 401.
    const ok = user
      ? (await verifyPassword(user.passwordHash, body.password)) && user.status === 'active'
      : (await verifyPassword(await dummyPasswordHash(), body.password), false);
    if (!user || !ok) {
      throw new HttpError(
        401,
        'invalid-credentials',
        "That e-mail and password don't match an account.",
      );
    }
    res.json({ user: await signInAs(ctx, req, res, user.id) });
  });

  router.post('/sign-out', async (req, res) => {
    if (req.session) await destroySession(req);
    res.clearCookie('trayplan.sid', { path: '/' });
    res.status(204).end();
  });

  router.get('/me', (req, res) => {
    const actor = requireActor(req);
    res.json({ user: actor });
  });

  router.post('/password-reset', resetLimit, async (req, res) => {
    const { email } = parse(resetRequestSchema, req.body);
    const [user] = await ctx.db.select().from(users).where(eq(users.email, email));
    if (user && user.status === 'active') {
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
    if (!reset) {
      throw new HttpError(
        400,
        'token-invalid',
        'This reset link has been used or has run out. Ask for a new one.',
      );
    }
    const problem = passwordProblem(body.password, reset.email);
    if (problem) {
      throw new HttpError(400, 'password-common', problem, [
        { path: 'password', message: problem },
      ]);
    }
    const passwordHash = await hashPassword(body.password);
    await ctx.db.transaction(async (tx) => {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, reset.userId));
      await tx
        .update(passwordResets)
        .set({ usedAt: sql`now()` })
        .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
      await endSessionsOf(tx, reset.userId);
    });
    res.status(204).end();
  });

  return router;
}
