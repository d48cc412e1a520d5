/**
 * The personal calendar feed (API.md, "calendars"): `POST /api/account/calendar-feed` makes a new
 * secret address (the old one stops at once), `GET /api/calendar/:token.ics` serves it to a
 * calendar app, which sends no cookie: the token is the credential, hashed at rest, compared in
 * constant time, never logged; an unknown or replaced token is a 404.
 */
import { Router } from 'express';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { calendarFeeds, schools, users } from '../db/schema/index.js';
import { notFound, parseParams } from '../http.js';
import { authorize, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { Role } from '../../shared/schemas/common.js';
import { sameHash, tokenShaped } from '../sharing/links.js';
import { feedCalendar } from '../calendar/feed.js';
import { sendDownload } from '../downloads.js';

/** Mounted at /account/calendar-feed. */
export function calendarFeedRouter(ctx: AppContext): Router {
  const router = Router();
  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'account.edit');
    const { token, hash } = newToken();
    // One feed per person: the new hash replaces the old, so the old address is a 404 at once.
    await ctx.db
      .insert(calendarFeeds)
      .values({ userId: actor.id, tokenHash: hash })
      .onConflictDoUpdate({
        target: calendarFeeds.userId,
        set: { tokenHash: hash, createdAt: new Date() },
      });
    const appUrl = ctx.config.appUrl.replace(/\/+$/, '');
    res.status(201).json({ url: `${appUrl}/api/calendar/${token}.ics` });
  });
  return router;
}

const feedParams = z.object({ token: z.string().max(200) });

/** Mounted at /calendar. */
export function calendarRouter(ctx: AppContext): Router {
  const router = Router();
  const unknown = () => notFound('That calendar address');
  router.get('/:token.ics', async (req, res) => {
    const { token } = parseParams(feedParams, req);
    if (!tokenShaped(token)) throw unknown();
    const hash = hashToken(token);
    const text = await ctx.db.transaction(
      async (tx) => {
        const [row] = await tx
          .select({
            tokenHash: calendarFeeds.tokenHash,
            id: users.id,
            email: users.email,
            name: users.name,
            role: users.role,
            status: users.status,
            schoolId: users.schoolId,
            schoolName: schools.name,
          })
          .from(calendarFeeds)
          .innerJoin(users, eq(users.id, calendarFeeds.userId))
          .innerJoin(schools, eq(schools.id, users.schoolId))
          .where(eq(calendarFeeds.tokenHash, hash));
        // A deactivated person's feed stops with their account.
        if (!row || !sameHash(row.tokenHash, hash) || row.status !== 'active') throw unknown();
        const actor: Actor = {
          id: row.id,
          email: row.email,
          name: row.name,
          role: row.role as Role,
          schoolId: row.schoolId,
          schoolName: row.schoolName,
        };
        return feedCalendar(tx, actor, new Date(), ctx.config.appUrl.replace(/\/+$/, ''));
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    sendDownload(res, 'text/calendar; charset=utf-8', 'trayplan-prep.ics', text);
  });
  return router;
}
