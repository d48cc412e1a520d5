import { Router } from 'express';
import type { AppContext } from '../context.js';

/** Liveness with the database's state: 503 when PostgreSQL does not answer within 2 s. */
export function healthRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    let timer: NodeJS.Timeout | undefined;
    try {
      await Promise.race([
        ctx.pool.query('SELECT 1'),
        new Promise((_, reject) => {
          timer = setTimeout(() => reject(new Error('timeout')), 2000);
        }),
      ]);
      res.json({ status: 'ok', db: 'ok' });
    } catch {
      res.status(503).json({ status: 'degraded', db: 'down' });
    } finally {
      clearTimeout(timer);
    }
  });
  return router;
}
