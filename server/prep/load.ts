/**
 * Builds the prep engine's input for a stored lesson: its class, the kit type's parts list, the
 * booked tubs with stock = quantity − missing, the school's settings and timezone, and earlier
 * lessons that day sharing a tub. The engine itself (shared/prep) does no I/O.
 */
import { and, asc, eq, inArray, lt, ne, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import {
  activities,
  classes,
  lessonTubs,
  lessons,
  materials,
  parts,
  schoolSettings,
  schools,
  tubMissing,
  tubs,
} from '../db/schema/index.js';
import type { PrepInput } from '../../shared/prep/index.js';
import { mergePrep } from '../school/settings.js';
import { toLocal } from '../planning/format.js';
import { tubStock } from '../kits/stock.js';

/** The engine's input for one lesson as stored now. */
export async function loadPrepInput(tx: Tx, lessonId: string): Promise<PrepInput | null> {
  const [lesson] = await tx
    .select({
      id: lessons.id,
      schoolId: lessons.schoolId,
      kitTypeId: lessons.kitTypeId,
      startsAt: lessons.startsAt,
      endsAt: lessons.endsAt,
      groupSize: lessons.groupSize,
      studentCount: classes.studentCount,
      devices: classes.devices,
      timezone: schools.timezone,
    })
    .from(lessons)
    .innerJoin(classes, eq(classes.id, lessons.classId))
    .innerJoin(schools, eq(schools.id, lessons.schoolId))
    .where(eq(lessons.id, lessonId));
  if (!lesson) return null;

  const [settingsRow] = await tx
    .select({ prep: schoolSettings.prep })
    .from(schoolSettings)
    .where(eq(schoolSettings.schoolId, lesson.schoolId));
  const partRows = await tx
    .select()
    .from(parts)
    .where(eq(parts.kitTypeId, lesson.kitTypeId))
    .orderBy(asc(parts.position));
  const tubRows = await tx
    .select({
      id: tubs.id,
      label: tubs.label,
      controllerLabel: tubs.controllerLabel,
      status: tubs.status,
    })
    .from(lessonTubs)
    .innerJoin(tubs, eq(tubs.id, lessonTubs.tubId))
    .where(eq(lessonTubs.lessonId, lessonId));
  const tubIds = tubRows.map((t) => t.id);
  const missingRows = tubIds.length
    ? await tx.select().from(tubMissing).where(inArray(tubMissing.tubId, tubIds))
    : [];
  const activityRows = await tx
    .select()
    .from(activities)
    .where(eq(activities.lessonId, lessonId))
    .orderBy(asc(activities.position));
  const materialRows = activityRows.length
    ? await tx
        .select()
        .from(materials)
        .where(
          inArray(
            materials.activityId,
            activityRows.map((a) => a.id),
          ),
        )
        .orderBy(asc(materials.position))
    : [];

  const missingByTub = new Map<string, Map<string, number>>();
  for (const m of missingRows) {
    const counts = missingByTub.get(m.tubId) ?? new Map<string, number>();
    counts.set(m.partCode, m.count);
    missingByTub.set(m.tubId, counts);
  }
  const byActivity = new Map<string, typeof materialRows>();
  for (const m of materialRows) {
    const list = byActivity.get(m.activityId) ?? [];
    list.push(m);
    byActivity.set(m.activityId, list);
  }

  // Earlier lessons of the same day that book any of the same tubs (for recharge gaps).
  const day = lesson.startsAt.slice(0, 10);
  const earlier = tubIds.length
    ? await tx
        .select({ id: lessons.id, endsAt: lessons.endsAt, tubId: lessonTubs.tubId })
        .from(lessons)
        .innerJoin(lessonTubs, eq(lessonTubs.lessonId, lessons.id))
        .where(
          and(
            eq(lessons.schoolId, lesson.schoolId),
            ne(lessons.id, lesson.id),
            inArray(lessonTubs.tubId, tubIds),
            sql`${lessons.startsAt}::date = ${day}::date`,
            lt(lessons.endsAt, lesson.startsAt),
          ),
        )
    : [];
  const earlierById = new Map<string, { endsAt: string; tubIds: string[] }>();
  for (const e of earlier) {
    const entry = earlierById.get(e.id) ?? { endsAt: toLocal(e.endsAt), tubIds: [] };
    entry.tubIds.push(e.tubId);
    earlierById.set(e.id, entry);
  }

  return {
    timezone: lesson.timezone,
    lesson: {
      startsAt: toLocal(lesson.startsAt),
      endsAt: toLocal(lesson.endsAt),
      groupSize: lesson.groupSize,
    },
    class: { studentCount: lesson.studentCount, devices: lesson.devices },
    parts: partRows.map((p) => ({
      code: p.code,
      name: p.name,
      colour: p.colour,
      category: p.category,
      compartment: p.compartment,
      small: p.small,
      fullChargeMinutes: p.chargeMinutes,
    })),
    tubs: tubRows.map((t) => ({
      id: t.id,
      label: t.label,
      controllerLabel: t.controllerLabel,
      status: t.status,
      stock: tubStock(partRows, missingByTub.get(t.id) ?? new Map()),
    })),
    activities: activityRows.map((a) => ({
      title: a.title,
      kind: a.kind,
      minutes: a.minutes,
      materials: (byActivity.get(a.id) ?? []).map((m) => ({
        ...(m.partCode ? { partCode: m.partCode } : { consumable: m.consumable ?? '' }),
        qty: m.qty,
        per: m.per,
        returnable: m.returnable,
      })),
    })),
    // Stored settings merged key by key with the defaults, so a value an older release stored (or
    // one missing) never makes a lesson unplannable.
    settings: mergePrep(settingsRow?.prep ?? {}),
    earlierSameDay: [...earlierById.values()].sort((a, b) => a.endsAt.localeCompare(b.endsAt)),
  };
}
