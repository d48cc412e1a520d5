import { Router } from 'express';
import type { AppContext } from '../context.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { notFound } from '../http.js';
import { eq } from 'drizzle-orm';
import { users } from '../db/schema/index.js';

/** Development only: what the embedded mail fake received, so a person can follow a link. */
export function devMailRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (req, res) => {
    const devMail = ctx.devMail;
    if (!ctx.config.development || !devMail) throw notFound('The mail outbox');
    const actor = requireActor(req);
    authorize(actor, 'dev-mail.read');
    // Only mail addressed to people of the admin's own school: schools stay apart even here.
    const rows = await ctx.db
      .select({ email: users.email })
      .from(users)
      .where(eq(users.schoolId, actor.schoolId));
    const ours = new Set(rows.map((r) => r.email));
    res.json({ messages: devMail().filter((m) => m.to.some((t) => ours.has(t.toLowerCase()))) });
  });
  return router;
}
