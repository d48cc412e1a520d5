/**
 * The lesson as a share link shows it: what the relief page shows (timeline, pull lists, relief
 * notes, cautions, the activities' build instructions by name) and nothing else of the school.
 */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, attachments } from '../db/schema/index.js';
import type { LessonPackModel } from '../pdf/model.js';
import { CAUTIONS } from '../pdf/cautions.js';
import { listing } from '../pdf/format.js';
import type { ActivityKind } from '../../shared/schemas/lessons.js';
import type { SharedActivity, SharedLesson } from '../../shared/schemas/sharing.js';

/** The lesson's activities in order, each with its attachments' names (not their bytes). */
export async function activitiesWithAttachments(
  tx: Tx,
  lessonId: string,
): Promise<SharedActivity[]> {
  const rows = await tx
    .select({
      id: activities.id,
      title: activities.title,
      kind: activities.kind,
      minutes: activities.minutes,
    })
    .from(activities)
    .where(eq(activities.lessonId, lessonId))
    .orderBy(asc(activities.position));
  const files = rows.length
    ? await tx
        .select({
          id: attachments.id,
          activityId: attachments.activityId,
          filename: attachments.filename,
          size: attachments.size,
          contentType: attachments.contentType,
        })
        .from(attachments)
        .where(
          inArray(
            attachments.activityId,
            rows.map((r) => r.id),
          ),
        )
        .orderBy(asc(attachments.createdAt), asc(attachments.id))
    : [];
  return rows.map((r) => ({
    ...r,
    kind: r.kind as ActivityKind,
    attachments: files
      .filter((f) => f.activityId === r.id)
      .map(({ id, filename, size, contentType }) => ({ id, filename, size, contentType })),
  }));
}

/** The cautions with the lesson's own small and rechargeable parts named, as the pack has them. */
export function lessonCautions(lesson: LessonPackModel): { title: string; text: string }[] {
  const small = lesson.parts.filter((p) => p.small).map((p) => p.name);
  const rechargeable = lesson.parts.filter((p) => p.rechargeable).map((p) => p.name);
  return CAUTIONS.map((c) => {
    let text = c.text;
    if (c.title === 'Small parts' && small.length)
      text += ` Small parts in this lesson: ${listing(small)}.`;
    if (c.title === 'Batteries and charging' && rechargeable.length)
      text += ` Rechargeable in this lesson: ${listing(rechargeable)}.`;
    return { title: c.title, text };
  });
}

/** The answer of `GET /api/share/:token`. */
export function sharedLesson(
  lesson: LessonPackModel,
  schoolName: string,
  lessonActivities: SharedActivity[],
  expiresAt: Date,
): SharedLesson {
  return {
    lesson: {
      title: lesson.title,
      unitTitle: lesson.unitTitle,
      number: lesson.number,
      lessonCount: lesson.lessonCount,
      schoolName,
      className: lesson.className,
      studentCount: lesson.studentCount,
      startsAt: lesson.startsAt,
      endsAt: lesson.endsAt,
      periodName: lesson.periodName,
      room: lesson.room,
      kitTypeName: lesson.kitTypeName,
      learningIntention: lesson.learningIntention,
      successCriteria: lesson.successCriteria,
      reliefNotes: lesson.reliefNotes,
      activities: lessonActivities,
    },
    parts: lesson.parts.map((p) => ({
      code: p.code,
      name: p.name,
      colour: p.colour,
      compartment: p.compartment,
      small: p.small,
      rechargeable: p.rechargeable,
    })),
    plan: lesson.plan,
    problems: lesson.problems,
    cautions: lessonCautions(lesson),
    expiresAt: expiresAt.toISOString(),
  };
}
