/**
 * The school's settings as the API and the prep engine read them. Kept out of the route file so
 * loaders (server/prep/load.ts) depend on the data, not on a router.
 */
import { asc, eq } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  bellPeriods,
  nonTeachingDays,
  schools,
  schoolSettings,
  terms,
} from '../db/schema/index.js';
import { notFound } from '../http.js';
import {
  DEFAULT_PREP,
  prepAllowancesSchema,
  type PaperSize,
  type PrepAllowances,
  type SchoolSettings,
} from '../../shared/schemas/school.js';

/**
 * Stored allowances over the defaults, key by key: a key that is missing, or that an older
 * release stored out of today's range, takes its default rather than breaking every prep plan.
 */
export function mergePrep(stored: unknown): PrepAllowances {
  const merged: PrepAllowances = { ...DEFAULT_PREP };
  if (stored && typeof stored === 'object') {
    for (const key of Object.keys(DEFAULT_PREP) as (keyof PrepAllowances)[]) {
      const field = prepAllowancesSchema.shape[key].safeParse(
        (stored as Record<string, unknown>)[key],
      );
      if (field.success) merged[key] = field.data;
    }
  }
  return merged;
}

/** The settings as GET /api/school answers them (a missing settings row is version 1). */
export async function loadSchoolSettings(tx: Tx, schoolId: string): Promise<SchoolSettings> {
  const [school] = await tx.select().from(schools).where(eq(schools.id, schoolId));
  if (!school) throw notFound('That school');
  const [settings] = await tx
    .select()
    .from(schoolSettings)
    .where(eq(schoolSettings.schoolId, schoolId));
  const termRows = await tx
    .select()
    .from(terms)
    .where(eq(terms.schoolId, schoolId))
    .orderBy(asc(terms.startsOn));
  const periodRows = await tx
    .select()
    .from(bellPeriods)
    .where(eq(bellPeriods.schoolId, schoolId))
    .orderBy(asc(bellPeriods.position), asc(bellPeriods.startsAt));
  const dayRows = await tx
    .select()
    .from(nonTeachingDays)
    .where(eq(nonTeachingDays.schoolId, schoolId))
    .orderBy(asc(nonTeachingDays.date));
  return {
    id: school.id,
    name: school.name,
    timezone: school.timezone,
    paperSize: (school.paperSize === 'Letter' ? 'Letter' : 'A4') as PaperSize,
    prep: mergePrep(settings?.prep),
    terms: termRows.map((t) => ({
      id: t.id,
      name: t.name,
      startsOn: t.startsOn,
      endsOn: t.endsOn,
    })),
    periods: periodRows.map((p) => ({
      id: p.id,
      name: p.name,
      startsAt: p.startsAt,
      endsAt: p.endsAt,
    })),
    nonTeachingDays: dayRows.map((d) => ({ id: d.id, date: d.date, reason: d.reason })),
    version: settings?.version ?? 1,
  };
}
