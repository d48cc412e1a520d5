/**
 * Who hears of a review step or a comment, and what they read. Plain text, the unit's link on a
 * line of its own: authors open the unit, leads and admins its review page. Messages go into the
 * outbox in the step's own transaction, so a step rolled back never sends one.
 */
import { and, eq, inArray } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import { unitComments, unitEvents, users } from '../db/schema/index.js';
import { enqueueMail, type OutgoingMail } from '../mail/outbox.js';
import type { Actor } from '../auth/policy.js';
import type { ReviewAction } from '../../shared/schemas/review.js';
import type { Role } from '../../shared/schemas/common.js';
import type { ReviewUnitFacts } from './access.js';

interface Recipient {
  id: string;
  email: string;
  name: string;
  role: Role;
}

async function activeUsers(tx: Tx, schoolId: string, ids: readonly string[]) {
  if (ids.length === 0) return [];
  return (await tx
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(
      and(eq(users.schoolId, schoolId), eq(users.status, 'active'), inArray(users.id, [...ids])),
    )) as Recipient[];
}

async function leads(tx: Tx, schoolId: string): Promise<Recipient[]> {
  return (await tx
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(
      and(eq(users.schoolId, schoolId), eq(users.status, 'active'), eq(users.role, 'lead')),
    )) as Recipient[];
}

function authors(unit: ReviewUnitFacts): string[] {
  return [unit.ownerId, ...unit.coauthorIds];
}

/** Everyone but the actor, each once. */
function others(people: Recipient[], actor: Actor): Recipient[] {
  const seen = new Set<string>([actor.id]);
  return people.filter((p) => !seen.has(p.id) && seen.add(p.id));
}

/** Who a review step concerns (API.md): submitted → leads; decided → the unit's authors. */
export async function stepRecipients(
  tx: Tx,
  actor: Actor,
  unit: ReviewUnitFacts,
  action: ReviewAction,
): Promise<Recipient[]> {
  const people =
    action === 'submit'
      ? await leads(tx, unit.schoolId)
      : action === 'reopen'
        ? [
            ...(await activeUsers(tx, unit.schoolId, authors(unit))),
            ...(await leads(tx, unit.schoolId)),
          ]
        : await activeUsers(tx, unit.schoolId, authors(unit));
  return others(people, actor);
}

/**
 * The other participants of a unit's review: its authors, whoever commented or took a step,
 * and the leads while it waits in review.
 */
export async function commentRecipients(
  tx: Tx,
  actor: Actor,
  unit: ReviewUnitFacts,
): Promise<Recipient[]> {
  const commenters = await tx
    .selectDistinct({ id: unitComments.authorId })
    .from(unitComments)
    .where(eq(unitComments.unitId, unit.id));
  const steppers = await tx
    .selectDistinct({ id: unitEvents.actorId })
    .from(unitEvents)
    .where(and(eq(unitEvents.unitId, unit.id), eq(unitEvents.action, 'review')));
  const ids = [...authors(unit), ...commenters.map((c) => c.id), ...steppers.map((s) => s.id)];
  const people = await activeUsers(
    tx,
    unit.schoolId,
    ids.filter((id): id is string => !!id),
  );
  if (unit.status === 'in-review') people.push(...(await leads(tx, unit.schoolId)));
  return others(people, actor);
}

function unitLink(appUrl: string, unitId: string, role: Role): string {
  const base = appUrl.replace(/\/+$/, '');
  return role === 'teacher' ? `${base}/units/${unitId}` : `${base}/review/units/${unitId}`;
}

const STEP_SUBJECT: Record<ReviewAction, string> = {
  submit: 'sent for review',
  'request-changes': 'changes requested',
  endorse: 'endorsed',
  reopen: 'reopened',
};

const STEP_LINE: Record<ReviewAction, (who: string) => string> = {
  submit: (who) => `${who} has sent this unit for review.`,
  'request-changes': (who) => `${who} has asked for changes to this unit.`,
  endorse: (who) => `${who} has endorsed this unit.`,
  reopen: (who) => `${who} has reopened this unit: it is a draft again.`,
};

function quoted(text: string): string[] {
  return text.split(/\r?\n/).map((l) => `> ${l}`);
}

function who(actor: Actor): string {
  return actor.name || actor.email;
}

/** The message of a review step to one recipient. */
export function stepMail(
  appUrl: string,
  to: Recipient,
  actor: Actor,
  unit: { id: string; title: string },
  action: ReviewAction,
  comment?: string,
): OutgoingMail {
  return {
    to: to.email,
    subject: `“${unit.title}”: ${STEP_SUBJECT[action]}`,
    text: [
      `Hello ${to.name || 'there'},`,
      ``,
      STEP_LINE[action](who(actor)),
      ...(comment ? [``, `${who(actor)} wrote:`, ...quoted(comment)] : []),
      ``,
      `Open the unit:`,
      unitLink(appUrl, unit.id, to.role),
    ].join('\n'),
  };
}

/** The message of a comment to one recipient. */
export function commentMail(
  appUrl: string,
  to: Recipient,
  actor: Actor,
  unit: { id: string; title: string },
  body: string,
  lessonTitle: string | null,
): OutgoingMail {
  return {
    to: to.email,
    subject: `“${unit.title}”: a new comment`,
    text: [
      `Hello ${to.name || 'there'},`,
      ``,
      `${who(actor)} commented on ${lessonTitle ? `the lesson “${lessonTitle}” of ` : ''}this unit:`,
      ...quoted(body),
      ``,
      `Open the unit:`,
      unitLink(appUrl, unit.id, to.role),
    ].join('\n'),
  };
}

/** Queues one message per recipient in the caller's transaction. */
export async function enqueueAll(tx: Tx, mails: OutgoingMail[]): Promise<void> {
  for (const mail of mails) await enqueueMail(tx, mail);
}
