/**
 * A group's tray without an account (API.md, "The group's tray and pack-away"). The token in
 * the path is the credential: no session, no CSRF cookie; it opens one group of one lesson and
 * nothing else. Mounted before the session middleware. Tokens and codes are never logged.
 */
import express, { Router, type Request } from 'express';
import { sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { trayLines } from '../db/schema/index.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { bump, PER_ADDRESS, throttled } from '../auth/throttle.js';
import {
  trayCodeSchema,
  trayLineParamsSchema,
  trayLineUpdateSchema,
  trayTokenSchema,
  type TrayLine,
} from '../../shared/schemas/trays.js';
import { openTrayToken, tokenOfCode, trayKey } from '../trays/tokens.js';
import { trayGroup, trayLinesOf, trayView } from '../trays/view.js';
import { notifyTrayChange } from '../trays/events.js';

const tokenParams = z.object({ token: trayTokenSchema });
const codeParams = z.object({ code: trayCodeSchema });

export function traysRouter(ctx: AppContext): Router {
  const router = Router();
  const key = trayKey(ctx.config.sessionSecret);
  router.use(express.json({ limit: '4kb' }));
  router.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    // The address holds a credential: never send it on to another site.
    res.setHeader('Referrer-Policy', 'no-referrer');
    next();
  });

  /**
   * A short code typed at /tray. Counted like sign-in per address (a school behind one address
   * gets PER_ADDRESS wrong codes in the window); a right code gives its place back.
   */
  router.get('/by-code/:code', async (req: Request, res) => {
    const counter = `tray-code:${req.ip ?? 'unknown'}`;
    const count = (await bump(ctx.db, [counter])).get(counter)!;
    if (count.failures > PER_ADDRESS) {
      await bump(ctx.db, [counter], -1);
      throw throttled(count.secondsLeft);
    }
    const parsed = codeParams.safeParse(req.params);
    if (!parsed.success) throw notFound('That tray code');
    const token = await ctx.db.transaction((tx) => tokenOfCode(tx, key, parsed.data.code));
    await bump(ctx.db, [counter], -1);
    res.json({ token });
  });

  router.get('/:token', async (req, res) => {
    const { token } = parseParams(tokenParams, req);
    const view = await ctx.db.transaction(
      async (tx) => {
        const tray = await openTrayToken(tx, key, token);
        return trayView(tx, tray.lessonId, tray.group, tray.expiresAt);
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    res.json(view);
  });

  router.put('/:token/lines/:partCode', async (req, res) => {
    const { token, partCode } = parseParams(trayLineParamsSchema, req);
    const body = parse(trayLineUpdateSchema, req.body);
    const line = await ctx.db.transaction(async (tx) => {
      const tray = await openTrayToken(tx, key, token);
      // Serialises the group's taps so two phones on one tray never lose a change.
      await tx.execute(
        sql`SELECT pg_advisory_xact_lock(hashtext(${`${tray.lessonId}|${tray.group}`}))`,
      );
      const { input, group } = await trayGroup(tx, tray.lessonId, tray.group);
      const planned = group.lines.find((l) => l.partCode === partCode);
      if (!planned) throw notFound('That part in this tray');
      if (body.missing !== undefined && body.missing > planned.allocated) {
        throw new HttpError(400, 'invalid-input', 'Some fields need attention.', [
          {
            path: 'missing',
            message: `Missing is at most ${planned.allocated}, the pieces in the tray.`,
          },
        ]);
      }
      const set = {
        ...(body.out !== undefined ? { out: body.out } : {}),
        ...(body.back !== undefined ? { back: body.back } : {}),
        ...(body.missing !== undefined ? { missing: body.missing } : {}),
        updatedAt: sql`now()`,
      };
      const [row] = await tx
        .insert(trayLines)
        .values({ lessonId: tray.lessonId, groupNumber: tray.group, partCode, ...set })
        .onConflictDoUpdate({
          target: [trayLines.lessonId, trayLines.groupNumber, trayLines.partCode],
          set,
        })
        .returning();
      await notifyTrayChange(tx, tray.lessonId);
      const state = new Map([
        [partCode, { out: row!.out, back: row!.back, missing: row!.missing }],
      ]);
      return trayLinesOf(input, { ...group, lines: [planned] }, state)[0] as TrayLine;
    });
    res.json(line);
  });

  return router;
}
