/**
 * Checks that need the database: ids that must be of the actor's school, tubs of the lesson's kit
 * type, part codes in its parts list, a time that exists in the school's timezone. Each returns
 * problems as API details so a route can list them together with the zod issues of the body
 * (every problem in one 400, not one per attempt).
 */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { z } from 'zod';
import type { Tx } from '../db/client.js';
import { bellPeriods, classes, kitTypes, parts, schools, tubs, users } from '../db/schema/index.js';
import { HttpError, issuesToDetails } from '../http.js';
import { uuidSchema, type ApiErrorDetail } from '../../shared/schemas/common.js';
import {
  MATERIAL_ONE_OF_MESSAGE,
  MAX_LESSON_MINUTES,
  localMinutes,
} from '../../shared/schemas/lessons.js';
import { localToInstant } from '../../shared/prep/time.js';

/** Parses with zod but keeps going: the data when it is valid, and the issues either way. */
export function check<T extends z.ZodType>(
  schema: T,
  data: unknown,
): { data?: z.infer<T>; details: ApiErrorDetail[] } {
  const result = schema.safeParse(data);
  return result.success
    ? { data: result.data, details: [] }
    : { details: issuesToDetails(result.error.issues) };
}

/** The 400 of the API, listing every problem. */
export function invalid(details: ApiErrorDetail[]): HttpError {
  // The wall-clock rule of the schema and the timezone check can word the same problem alike.
  const seen = new Set<string>();
  const unique = details.filter((d) => {
    const key = `${d.path}\n${d.message}`;
    return seen.has(key) ? false : (seen.add(key), true);
  });
  return new HttpError(400, 'invalid-input', 'Some fields need attention.', unique);
}

/** A raw value as an id, when it is one (else zod has already reported it). */
export function asId(v: unknown): string | undefined {
  return uuidSchema.safeParse(v).success ? (v as string) : undefined;
}

/** The school's IANA timezone, in which lesson times are wall-clock times. */
export async function schoolTimezone(tx: Tx, schoolId: string): Promise<string> {
  const [row] = await tx
    .select({ timezone: schools.timezone })
    .from(schools)
    .where(eq(schools.id, schoolId));
  return row?.timezone ?? 'UTC';
}

/** The school's kit type (not archived), or null. */
export async function kitTypeOf(tx: Tx, schoolId: string, kitTypeId: string) {
  const [kit] = await tx
    .select({ id: kitTypes.id, name: kitTypes.name })
    .from(kitTypes)
    .where(
      and(eq(kitTypes.id, kitTypeId), eq(kitTypes.schoolId, schoolId), isNull(kitTypes.archivedAt)),
    );
  return kit ?? null;
}

/** Every tub of the kit type that is not retired: what a lesson books when no tubs are named. */
export async function defaultTubIds(tx: Tx, kitTypeId: string): Promise<string[]> {
  const rows = await tx
    .select({ id: tubs.id, status: tubs.status })
    .from(tubs)
    .where(eq(tubs.kitTypeId, kitTypeId));
  return rows.filter((t) => t.status !== 'retired').map((t) => t.id);
}

/** What a lesson's references are (raw, as sent; the ones not sent are left out). */
export interface LessonRefs {
  classId?: unknown;
  /** The kit type sent in the body, checked to be the school's. */
  kitTypeId?: unknown;
  /** The kit type the tubs must be of (sent, or the lesson's current one). */
  effectiveKitTypeId?: string;
  tubIds?: unknown;
  periodId?: unknown;
  reliefTeacherId?: unknown;
  /** The window after the change, for the timezone checks. */
  startsAt?: unknown;
  endsAt?: unknown;
}

/** Problems with a lesson's references and its window in the school's timezone. */
export async function lessonRefProblems(
  tx: Tx,
  schoolId: string,
  refs: LessonRefs,
): Promise<ApiErrorDetail[]> {
  const out: ApiErrorDetail[] = [];
  const classId = asId(refs.classId);
  if (classId) {
    const [c] = await tx
      .select({ id: classes.id })
      .from(classes)
      .where(and(eq(classes.id, classId), eq(classes.schoolId, schoolId)));
    if (!c) out.push({ path: 'classId', message: 'Choose one of your school’s classes.' });
  }
  const sentKit = asId(refs.kitTypeId);
  const kit = sentKit ? await kitTypeOf(tx, schoolId, sentKit) : null;
  if (sentKit && !kit)
    out.push({ path: 'kitTypeId', message: 'Choose one of your school’s kit types.' });
  const kitId = sentKit ? kit?.id : refs.effectiveKitTypeId;
  if (Array.isArray(refs.tubIds)) {
    const ids = refs.tubIds.map(asId).filter((x): x is string => x !== undefined);
    const found = ids.length
      ? await tx
          .select({
            id: tubs.id,
            label: tubs.label,
            kitTypeId: tubs.kitTypeId,
            status: tubs.status,
          })
          .from(tubs)
          .where(and(inArray(tubs.id, ids), eq(tubs.schoolId, schoolId)))
      : [];
    const byId = new Map(found.map((t) => [t.id, t]));
    refs.tubIds.forEach((raw, i) => {
      const id = asId(raw);
      if (!id) return;
      const tub = byId.get(id);
      if (!tub)
        out.push({ path: `tubIds.${i}`, message: 'This is not one of your school’s tubs.' });
      else if (kitId && tub.kitTypeId !== kitId) {
        out.push({ path: `tubIds.${i}`, message: `${tub.label} is a tub of another kit type.` });
      } else if (tub.status === 'retired') {
        out.push({ path: `tubIds.${i}`, message: `${tub.label} is retired and cannot be booked.` });
      }
    });
  }
  const periodId = asId(refs.periodId);
  if (periodId) {
    const [p] = await tx
      .select({ id: bellPeriods.id })
      .from(bellPeriods)
      .where(and(eq(bellPeriods.id, periodId), eq(bellPeriods.schoolId, schoolId)));
    if (!p) out.push({ path: 'periodId', message: 'Choose one of your school’s periods.' });
  }
  const reliefId = asId(refs.reliefTeacherId);
  if (reliefId) {
    const [r] = await tx
      .select({ id: users.id })
      .from(users)
      .where(
        and(
          eq(users.id, reliefId),
          eq(users.schoolId, schoolId),
          eq(users.role, 'relief'),
          eq(users.status, 'active'),
        ),
      );
    if (!r)
      out.push({
        path: 'reliefTeacherId',
        message: 'Choose one of your school’s relief teachers.',
      });
  }
  out.push(...(await windowProblems(tx, schoolId, refs.startsAt, refs.endsAt)));
  return out;
}

/**
 * The window in elapsed time in the school's timezone: a wall-clock time skipped when daylight
 * time begins does not exist, and a lesson across the change lasts an hour more or less.
 */
async function windowProblems(
  tx: Tx,
  schoolId: string,
  startsAt: unknown,
  endsAt: unknown,
): Promise<ApiErrorDetail[]> {
  if (typeof startsAt !== 'string' || typeof endsAt !== 'string') return [];
  if (localMinutes(startsAt) === null || localMinutes(endsAt) === null) return [];
  const zone = await schoolTimezone(tx, schoolId);
  const out: ApiErrorDetail[] = [];
  const from = localToInstant(startsAt, zone);
  const to = localToInstant(endsAt, zone);
  const missing = 'This time does not exist in the school’s timezone (the clocks go forward then).';
  if (from === null) out.push({ path: 'startsAt', message: missing });
  if (to === null) out.push({ path: 'endsAt', message: missing });
  if (from === null || to === null) return out;
  const minutes = Math.round((to - from) / 60_000);
  if (minutes <= 0) out.push({ path: 'endsAt', message: 'The lesson must end after it starts.' });
  else if (minutes > MAX_LESSON_MINUTES) {
    out.push({
      path: 'endsAt',
      message: `A lesson is at most ${MAX_LESSON_MINUTES} minutes long; this one is ${minutes}.`,
    });
  }
  return out;
}

/** The part codes of a kit type's parts list. */
export async function partCodesOf(tx: Tx, kitTypeId: string): Promise<Set<string>> {
  const rows = await tx
    .select({ code: parts.code })
    .from(parts)
    .where(eq(parts.kitTypeId, kitTypeId));
  return new Set(rows.map((r) => r.code));
}

/** Problems with the part codes of raw materials (`materials.3.partCode`) by the parts list. */
export async function materialProblems(
  tx: Tx,
  kitTypeId: string,
  rawMaterials: unknown,
): Promise<ApiErrorDetail[]> {
  if (!Array.isArray(rawMaterials)) return [];
  const codes = await partCodesOf(tx, kitTypeId);
  const [kit] = await tx
    .select({ name: kitTypes.name })
    .from(kitTypes)
    .where(eq(kitTypes.id, kitTypeId));
  const out: ApiErrorDetail[] = [];
  rawMaterials.forEach((m, i) => {
    if (typeof m !== 'object' || m === null) return;
    const line = m as { partCode?: unknown; consumable?: unknown };
    // The schema's one-of rule, again: zod skips it on a line whose other fields fail.
    if ((line.partCode === undefined) === (line.consumable === undefined)) {
      out.push({ path: `materials.${i}.partCode`, message: MATERIAL_ONE_OF_MESSAGE });
    }
    const code = line.partCode;
    if (typeof code !== 'string' || code.trim() === '' || code.trim().length > 64) return;
    if (!codes.has(code.trim())) {
      out.push({
        path: `materials.${i}.partCode`,
        message: `${code.trim()} is not in the parts list of ${kit?.name ?? 'the kit type'}.`,
      });
    }
  });
  return out;
}
