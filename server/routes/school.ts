/**
 * School settings under /api/school: name, timezone, paper size, prep allowances and the
 * calendar. Everyone of the school reads them (lesson times and prep plans depend on them);
 * only an admin saves them, all at once, with the version they read.
 */
import { Router } from 'express';
import { and, asc, eq, inArray, notInArray, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import {
  bellPeriods,
  nonTeachingDays,
  schools,
  schoolSettings,
  terms,
  users,
} from '../db/schema/index.js';
import { parse } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { schoolSettingsUpdateSchema, timeZoneNames } from '../../shared/schemas/school.js';
import { loadSchoolSettings } from '../school/settings.js';
import { stale, versionedUpdate } from '../db/versions.js';

/** Ids the form sent that really are this school's rows; any other id is treated as new. */
async function keptIds(
  tx: Tx,
  table: typeof terms | typeof bellPeriods | typeof nonTeachingDays,
  schoolId: string,
  sent: (string | undefined)[],
) {
  const ids = sent.filter((x): x is string => !!x);
  if (!ids.length) return new Set<string>();
  const rows = await tx
    .select({ id: table.id })
    .from(table)
    .where(and(eq(table.schoolId, schoolId), inArray(table.id, ids)));
  return new Set(rows.map((r) => r.id));
}

/**
 * Lessons booked in a period move with it: each keeps its date and takes the period's new
 * times, so no screen or pack shows a time the lesson does not have. A moved lesson's version
 * goes up, so an editor opened on the old times gets a 409 rather than writing them back.
 */
async function followPeriod(
  tx: Tx,
  schoolId: string,
  periodId: string,
  startsAt: string,
  endsAt: string,
): Promise<void> {
  await tx.execute(sql`
    UPDATE lessons
       SET starts_at = starts_at::date + ${startsAt}::time,
           ends_at = starts_at::date + ${endsAt}::time,
           version = version + 1,
           updated_at = now()
     WHERE school_id = ${schoolId}
       AND period_id = ${periodId}
       AND (starts_at::time <> ${startsAt}::time OR ends_at::time <> ${endsAt}::time)`);
}

type Update = ReturnType<typeof schoolSettingsUpdateSchema.parse>;

/**
 * Saves the calendar lists. Rows keep their ids when the form sent them back: lessons point at
 * bell periods, and deleting and re-adding a period would unlink every lesson booked in it.
 */
async function saveCalendar(tx: Tx, schoolId: string, body: Update): Promise<void> {
  const termIds = await keptIds(
    tx,
    terms,
    schoolId,
    body.terms.map((t) => t.id),
  );
  await tx
    .delete(terms)
    .where(and(eq(terms.schoolId, schoolId), notInArray(terms.id, [...termIds])));
  for (const t of body.terms) {
    const values = { name: t.name, startsOn: t.startsOn, endsOn: t.endsOn };
    if (t.id && termIds.has(t.id)) await tx.update(terms).set(values).where(eq(terms.id, t.id));
    else await tx.insert(terms).values({ schoolId, ...values });
  }

  const periodIds = await keptIds(
    tx,
    bellPeriods,
    schoolId,
    body.periods.map((p) => p.id),
  );
  await tx
    .delete(bellPeriods)
    .where(and(eq(bellPeriods.schoolId, schoolId), notInArray(bellPeriods.id, [...periodIds])));
  const ordered = [...body.periods].sort((a, b) => a.startsAt.localeCompare(b.startsAt));
  for (const [position, p] of ordered.entries()) {
    const values = { position, name: p.name, startsAt: p.startsAt, endsAt: p.endsAt };
    if (p.id && periodIds.has(p.id)) {
      await tx.update(bellPeriods).set(values).where(eq(bellPeriods.id, p.id));
      await followPeriod(tx, schoolId, p.id, p.startsAt, p.endsAt);
    } else await tx.insert(bellPeriods).values({ schoolId, ...values });
  }

  const dayIds = await keptIds(
    tx,
    nonTeachingDays,
    schoolId,
    body.nonTeachingDays.map((d) => d.id),
  );
  await tx
    .delete(nonTeachingDays)
    .where(
      and(eq(nonTeachingDays.schoolId, schoolId), notInArray(nonTeachingDays.id, [...dayIds])),
    );
  for (const d of body.nonTeachingDays) {
    const values = { date: d.date, reason: d.reason };
    if (d.id && dayIds.has(d.id))
      await tx.update(nonTeachingDays).set(values).where(eq(nonTeachingDays.id, d.id));
    else await tx.insert(nonTeachingDays).values({ schoolId, ...values });
  }
}

/** GET /, GET /timezones and PUT / under /api/school. */
export function schoolRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'school.settings.read');
    res.json({ school: await loadSchoolSettings(ctx.db, actor.schoolId) });
  });

  /** The IANA zone names for the searchable select. */
  router.get('/timezones', (req, res) => {
    requireActor(req);
    res.json({ timezones: timeZoneNames() });
  });

  /** The school's active teachers (for class teachers and co-authors): admins, leads, teachers. */
  router.get('/teachers', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.read');
    const rows = await ctx.db
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(
        and(
          eq(users.schoolId, actor.schoolId),
          eq(users.role, 'teacher'),
          eq(users.status, 'active'),
        ),
      )
      .orderBy(asc(users.name));
    res.json({ teachers: rows });
  });

  router.put('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'school.settings.edit');
    const body = parse(schoolSettingsUpdateSchema, req.body);
    const school = await ctx.db.transaction(async (tx) => {
      // A school without a settings row is at version 1: make the row, so the check can lock it.
      await tx.insert(schoolSettings).values({ schoolId: actor.schoolId }).onConflictDoNothing();
      const saved = await versionedUpdate(
        tx,
        schoolSettings,
        eq(schoolSettings.schoolId, actor.schoolId),
        body.version,
        { prep: body.prep },
      );
      if (!saved) {
        throw stale(
          'school settings',
          await loadSchoolSettings(tx, actor.schoolId),
          'Someone saved the school settings after you opened them. ' +
            'Reload to see their changes, then make yours again.',
        );
      }
      await tx
        .update(schools)
        .set({ name: body.name, timezone: body.timezone, paperSize: body.paperSize })
        .where(eq(schools.id, actor.schoolId));
      await saveCalendar(tx, actor.schoolId, body);
      return loadSchoolSettings(tx, actor.schoolId);
    });
    res.json({ school });
  });

  return router;
}
