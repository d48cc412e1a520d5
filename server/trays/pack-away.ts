/**
 * The pack-away audit of a whole lesson: one audit per booked tub, each exactly as
 * POST /api/tubs/:id/audits records it (server/kits/tubs.ts), with the lesson's id, all in the
 * caller's one transaction, so a failure in any tub writes nothing at all.
 */
import { eq } from 'drizzle-orm';
import type { z } from 'zod';
import type { Tx } from '../db/client.js';
import { lessonTubs } from '../db/schema/index.js';
import { HttpError } from '../http.js';
import type { Actor } from '../auth/policy.js';
import { recordAudit } from '../kits/tubs.js';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import type { TubAudit } from '../../shared/schemas/kits.js';
import type { packAwayCreateSchema } from '../../shared/schemas/trays.js';

export async function recordPackAway(
  tx: Tx,
  actor: Actor,
  lessonId: string,
  body: z.output<typeof packAwayCreateSchema>,
): Promise<TubAudit[]> {
  const booked = new Set(
    (
      await tx
        .select({ tubId: lessonTubs.tubId })
        .from(lessonTubs)
        .where(eq(lessonTubs.lessonId, lessonId))
    ).map((r) => r.tubId),
  );
  const details: ApiErrorDetail[] = [];
  const seen = new Set<string>();
  body.tubs.forEach((t, i) => {
    if (!booked.has(t.tubId)) {
      details.push({ path: `tubs.${i}.tubId`, message: 'That tub is not booked for this lesson.' });
    } else if (seen.has(t.tubId)) {
      details.push({ path: `tubs.${i}.tubId`, message: 'That tub is listed twice.' });
    }
    seen.add(t.tubId);
  });
  if (details.length) {
    throw new HttpError(400, 'invalid-input', 'Some fields need attention.', details);
  }
  const audits: TubAudit[] = [];
  // In a fixed order (by tub id) so two pack-aways of shared tubs never wait on each other.
  const order = [...body.tubs.entries()].sort(([, a], [, b]) => a.tubId.localeCompare(b.tubId));
  const byIndex = new Map<number, TubAudit>();
  for (const [i, t] of order) {
    try {
      const { audit } = await recordAudit(tx, actor, t.tubId, {
        lessonId,
        missing: t.missing,
        found: t.found,
        note: body.note,
      });
      byIndex.set(i, audit);
    } catch (err) {
      if (err instanceof HttpError && err.status === 400 && err.details) {
        throw new HttpError(
          400,
          err.code,
          err.message,
          err.details.map((d) => ({ ...d, path: `tubs.${i}.${d.path}` })),
        );
      }
      throw err;
    }
  }
  for (let i = 0; i < body.tubs.length; i++) audits.push(byIndex.get(i)!);
  return audits;
}
