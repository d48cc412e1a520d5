/** Loads the build instructions a pack prints (see ./attachments.ts); run in the route's snapshot. */
import { asc, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { activities, attachments, lessons } from '../db/schema/index.js';
import type { PackAttachment } from './attachments.js';

/** The attachments of the lessons' activities, in lesson, activity and upload order. */
export async function loadPackAttachments(
  tx: Tx,
  lessonIds: readonly string[],
): Promise<PackAttachment[]> {
  if (!lessonIds.length) return [];
  const rows = await tx
    .select({
      lessonId: activities.lessonId,
      activityTitle: activities.title,
      filename: attachments.filename,
      contentType: attachments.contentType,
      bytes: attachments.bytes,
    })
    .from(attachments)
    .innerJoin(activities, eq(activities.id, attachments.activityId))
    .innerJoin(lessons, eq(lessons.id, activities.lessonId))
    .where(inArray(activities.lessonId, [...lessonIds]))
    .orderBy(
      asc(lessons.position),
      asc(activities.position),
      asc(attachments.createdAt),
      asc(attachments.id),
    );
  return rows.map((r) => ({ ...r, bytes: new Uint8Array(r.bytes) }));
}
