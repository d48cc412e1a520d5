/**
 * The demo school's calendar: prep settings, the four terms of 2026, bell times and the
 * non-teaching days of term 3. Invented dates in the usual South Australian pattern (four terms,
 * two-week breaks, a longer summer break), for the demo only.
 */
import type { Tx } from '../db/client.js';
import { bellPeriods, nonTeachingDays, schoolSettings, terms } from '../db/schema/index.js';

/** Terms of 2026 at Kestrel Ridge (invented). Term 3 is the demo term. */
export const DEMO_TERMS = [
  { name: 'Term 1', startsOn: '2026-01-27', endsOn: '2026-04-10' },
  { name: 'Term 2', startsOn: '2026-04-27', endsOn: '2026-07-03' },
  { name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' },
  { name: 'Term 4', startsOn: '2026-10-12', endsOn: '2026-12-11' },
] as const;

/** The bell times, wall-clock in Australia/Adelaide (invented). */
export const DEMO_BELLS = [
  { name: 'Period 1', startsAt: '08:50', endsAt: '09:40' },
  { name: 'Period 2', startsAt: '09:40', endsAt: '10:30' },
  { name: 'Recess', startsAt: '10:30', endsAt: '11:10' },
  { name: 'Period 3', startsAt: '11:10', endsAt: '12:00' },
  { name: 'Period 4', startsAt: '12:00', endsAt: '12:50' },
  { name: 'Lunch', startsAt: '12:50', endsAt: '13:40' },
  { name: 'Period 5', startsAt: '13:40', endsAt: '14:30' },
  { name: 'Period 6', startsAt: '14:30', endsAt: '15:20' },
] as const;

export type BellName = (typeof DEMO_BELLS)[number]['name'];

/** Non-teaching days of term 3 (invented); no demo lesson falls on one. */
export const DEMO_NON_TEACHING_DAYS = [
  { date: '2026-08-11', reason: 'Pupil-free day (staff development)' },
  { date: '2026-09-18', reason: 'Pupil-free day (report writing)' },
] as const;

/** A period as a lesson needs it: its id and its clock times. */
export interface SeededPeriod {
  id: string;
  startsAt: string;
  endsAt: string;
}

/**
 * Seeds the calendar of one school and returns its periods by name. The prep settings are left
 * empty so that every allowance takes the default of PREP-RULES.md, as a new school would.
 */
export async function seedCalendar(
  tx: Tx,
  schoolId: string,
): Promise<Record<BellName, SeededPeriod>> {
  await tx.insert(schoolSettings).values({ schoolId, prep: {} });
  await tx.insert(terms).values(DEMO_TERMS.map((t) => ({ schoolId, ...t })));
  await tx.insert(nonTeachingDays).values(DEMO_NON_TEACHING_DAYS.map((d) => ({ schoolId, ...d })));
  const rows = await tx
    .insert(bellPeriods)
    .values(DEMO_BELLS.map((b, position) => ({ schoolId, position, ...b })))
    .returning();
  const periods = {} as Record<BellName, SeededPeriod>;
  for (const r of rows)
    periods[r.name as BellName] = { id: r.id, startsAt: r.startsAt, endsAt: r.endsAt };
  return periods;
}
