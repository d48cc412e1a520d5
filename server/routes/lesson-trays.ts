/**
 * A lesson's trays for its teachers: the board of every group, its live stream (server-sent
 * events, fed between instances by LISTEN/NOTIFY), revoking every tray code of the lesson, and
 * the lesson's pack-away audit.
 */
import { Router } from 'express';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { parse, parseParams } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { readableLesson } from '../planning/access.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { packAwayCreateSchema, type TrayBoard } from '../../shared/schemas/trays.js';
import { recordPackAway } from '../trays/pack-away.js';
import { trayBoard } from '../trays/view.js';
import { TrayEvents } from '../trays/events.js';
import { revokeTrayCodes } from '../trays/tokens.js';
import { runnableLesson } from '../trays/access.js';

/** A comment line this often keeps proxies from closing a quiet stream (WHATWG HTML, SSE). */
export const HEARTBEAT_MS = 20_000;

export function lessonTraysRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = <T>(work: (tx: Tx) => Promise<T>) =>
    ctx.db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });
  const events = new TrayEvents(ctx.config.databaseUrl, (lessonId) =>
    snapshot((tx) => trayBoard(tx, lessonId)),
  );

  router.get('/:id/trays', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    res.json(
      await snapshot(async (tx) => {
        await readableLesson(tx, actor, id);
        return trayBoard(tx, id);
      }),
    );
  });

  /**
   * The board as a stream: the whole board first (so a reconnect catches up by itself), then
   * again each time any instance saves a tick or count of the lesson.
   */
  router.get('/:id/trays/events', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await snapshot((tx) => readableLesson(tx, actor, id));
    res.status(200);
    res.setHeader('Content-Type', 'text/event-stream; charset=utf-8');
    res.setHeader('Cache-Control', 'no-cache, no-store');
    res.setHeader('X-Accel-Buffering', 'no');
    res.flushHeaders();
    let seq = 0;
    let open = true;
    const send = (board: TrayBoard) => {
      if (open) res.write(`id: ${++seq}\nevent: trays\ndata: ${JSON.stringify(board)}\n\n`);
    };
    const stop = await events.subscribe(id, {
      send,
      end: () => {
        open = false;
        res.end();
      },
    });
    const beat = setInterval(() => open && res.write(': keep-alive\n\n'), HEARTBEAT_MS);
    res.on('close', () => {
      open = false;
      clearInterval(beat);
      stop();
    });
    res.write('retry: 3000\n\n');
    // Subscribed first, then read: a tick between the two is sent again, never lost.
    send(await snapshot((tx) => trayBoard(tx, id)));
  });

  router.post('/:id/trays/revoke', async (req, res) => {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    await snapshot((tx) => runnableLesson(tx, actor, id));
    res.json({ revoked: await revokeTrayCodes(ctx.db, id) });
  });

  /** The lesson's pack-away audit: one audit per booked tub, in one transaction. */
  router.post('/:id/pack-away', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'tubs.audit');
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(packAwayCreateSchema, req.body);
    const audits = await ctx.db.transaction(async (tx) => {
      await runnableLesson(tx, actor, id);
      return recordPackAway(tx, actor, id, body);
    });
    res.status(201).json({ audits });
  });

  return router;
}
