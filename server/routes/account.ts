import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import { users } from '../db/schema/index.js';
import { HttpError, parse } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { hashPassword, passwordProblem, verifyPassword } from '../auth/passwords.js';
import { endSessionsOf, sessionUser } from '../auth/users.js';
import { accountUpdateSchema, passwordChangeSchema } from '../../shared/schemas/auth.js';
import { reminderPreferencesUpdateSchema } from '../../shared/schemas/reminders.js';
import { readPreferences, savePreferences } from '../reminders/preferences.js';

export function accountRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', (req, res) => {
    res.json({ user: requireActor(req) });
  });

  router.patch('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'account.edit');
    const { name } = parse(accountUpdateSchema, req.body);
    await ctx.db.update(users).set({ name }).where(eq(users.id, actor.id));
    res.json({ user: await sessionUser(ctx.db, actor.id) });
  });

  // The person's reminder e-mails (charging and the morning summary), off until turned on.
  router.get('/reminders', async (req, res) => {
    const actor = requireActor(req);
    res.json({ reminders: await readPreferences(ctx.db, actor.id) });
  });

  router.patch('/reminders', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'account.edit');
    const change = parse(reminderPreferencesUpdateSchema, req.body);
    const reminders = await ctx.db.transaction((tx) => savePreferences(tx, actor.id, change));
    res.json({ reminders });
  });

  router.post('/password', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'account.edit');
    const body = parse(passwordChangeSchema, req.body);
    const [row] = await ctx.db.select().from(users).where(eq(users.id, actor.id));
    if (!row || !(await verifyPassword(row.passwordHash, body.currentPassword))) {
      throw new HttpError(400, 'wrong-password', 'The current password is not right.', [
        { path: 'currentPassword', message: 'The current password is not right.' },
      ]);
    }
    const problem = passwordProblem(body.newPassword, actor.email);
    if (problem) {
      throw new HttpError(400, 'password-common', problem, [
        { path: 'newPassword', message: problem },
      ]);
    }
    const passwordHash = await hashPassword(body.newPassword);
    await ctx.db.transaction(async (tx) => {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, actor.id));
      // Other devices signed in with the old password are signed out; this one stays.
      await endSessionsOf(tx, actor.id, req.sessionID);
    });
    res.status(204).end();
  });

  return router;
}
