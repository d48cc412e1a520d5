/**
 * One review step, whole: check who may take it from where, move the status with the version,
 * keep its comment, write the history event and queue the e-mails, all in one transaction.
 */
import { eq, sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { units } from '../db/schema/index.js';
import { forbidden, HttpError } from '../http.js';
import type { Actor } from '../auth/policy.js';
import { recordUnitEvent } from '../planning/history.js';
import { stale } from '../db/versions.js';
import { unitDetail } from '../planning/units.js';
import type { Unit } from '../../shared/schemas/units.js';
import { UNIT_STATUS_LABELS } from '../../shared/schemas/units.js';
import { REVIEW_ACTION_LABELS, type ReviewStep } from '../../shared/schemas/review.js';
import { reviewableUnit, standing } from './access.js';
import { judge } from './transitions.js';
import { addComment } from './comments.js';
import { enqueueAll, stepMail, stepRecipients } from './mail.js';

const FORBIDDEN: Record<ReviewStep['action'], string> = {
  submit: 'Only the unit’s owner and co-authors send it for review.',
  'request-changes': 'Only a curriculum lead or a school admin asks for changes.',
  endorse: 'Only a curriculum lead or a school admin endorses a unit.',
  reopen: 'Only the unit’s owner, a curriculum lead or a school admin reopens it.',
};

/** The step as the end of "A unit that is … cannot be …". */
const PAST: Record<ReviewStep['action'], string> = {
  submit: 'sent for review',
  'request-changes': 'sent back for changes',
  endorse: 'endorsed',
  reopen: 'reopened',
};

/** Takes the step; answers the unit as it now is. Throws 404, 403 or 409 as API.md says. */
export async function takeReviewStep(
  tx: Tx,
  actor: Actor,
  unitId: string,
  step: ReviewStep,
  appUrl: string,
): Promise<Unit> {
  const unit = await reviewableUnit(tx, actor, unitId, true);
  const verdict = judge(step.action, unit.status, standing(actor, unit));
  if (!verdict.ok && verdict.reason === 'forbidden') throw forbidden(FORBIDDEN[step.action]);
  // The version first: a stale page may show a status that is no longer true.
  if (unit.version !== step.version) throw stale('unit', await unitDetail(tx, actor, unitId));
  if (!verdict.ok) {
    throw new HttpError(
      409,
      'invalid-transition',
      `A unit that is “${UNIT_STATUS_LABELS[unit.status].toLowerCase()}” cannot be ${PAST[step.action]}.`,
      undefined,
      { current: await unitDetail(tx, actor, unitId) },
    );
  }
  await tx
    .update(units)
    .set({
      status: verdict.to,
      version: sql`${units.version} + 1`,
      updatedAt: sql`now()`,
      ...(step.action === 'submit' ? { submittedAt: sql`now()` } : {}),
    })
    .where(eq(units.id, unitId));
  if (step.comment !== undefined)
    await addComment(tx, actor, unit, step.comment, null, step.action);
  await recordUnitEvent(tx, {
    unitId,
    schoolId: unit.schoolId,
    actorId: actor.id,
    action: 'review',
    summary: `${REVIEW_ACTION_LABELS[step.action]}: ${UNIT_STATUS_LABELS[unit.status]} → ${UNIT_STATUS_LABELS[verdict.to]}`,
  });
  const recipients = await stepRecipients(tx, actor, unit, step.action);
  await enqueueAll(
    tx,
    recipients.map((r) => stepMail(appUrl, r, actor, unit, step.action, step.comment)),
  );
  return unitDetail(tx, actor, unitId);
}
