/**
 * Who may do what: the one place every route asks. The client's guards and navigation only
 * mirror these answers; hiding a button is never the protection.
 */
import type { Role } from '../../shared/schemas/common.js';
import { forbidden } from '../http.js';

/** The signed-in user as routes see it. */
export interface Actor {
  id: string;
  email: string;
  name: string;
  role: Role;
  schoolId: string;
  schoolName: string;
}

/** School-wide actions and the roles allowed them. Record-level checks are functions below. */
const ACTIONS = {
  'members.manage': ['admin'],
  'school.settings.edit': ['admin'],
  'school.settings.read': ['admin', 'lead', 'teacher', 'relief'],
  'dev-mail.read': ['admin'],
  'account.edit': ['admin', 'lead', 'teacher', 'relief'],
  'kits.read': ['admin', 'lead', 'teacher', 'relief'],
  'kits.edit': ['admin', 'teacher'],
  'tubs.audit': ['admin', 'teacher', 'relief'],
  'classes.read': ['admin', 'lead', 'teacher'],
  'classes.edit': ['admin', 'teacher'],
  'outcomes.read': ['admin', 'lead', 'teacher'],
  'outcomes.edit': ['admin', 'lead'],
  'units.create': ['teacher'],
  'units.read': ['lead', 'teacher'],
  'units.review': ['lead', 'admin'],
  'coverage.read': ['admin', 'lead', 'teacher'],
  /** Every tub booking of the school (the bookings view), see `seesSchoolBookings`. */
  'bookings.school': ['admin', 'lead', 'teacher'],
  /** Copying a unit the actor can read into their own units (API.md, "Reuse"); relief never. */
  'units.copy': ['admin', 'lead', 'teacher'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof ACTIONS;

/** Whether the actor's role allows a school-wide action. */
export function can(actor: Actor, action: Action): boolean {
  return (ACTIONS[action] as readonly Role[]).includes(actor.role);
}

/** Throws 403 unless the actor may do the action. */
export function authorize(actor: Actor, action: Action): void {
  if (!can(actor, action)) throw forbidden();
}

/** Whether a record of some school may be seen at all by the actor (else it answers 404). */
export function sameSchool(actor: Actor, schoolId: string): boolean {
  return actor.schoolId === schoolId;
}

/**
 * Who changes or deletes a class: the school's admins and the class's own teachers. Other
 * teachers read it (to plan lessons for it) but do not change a colleague's class.
 */
export function canEditClass(actor: Actor, teacherIds: readonly string[]): boolean {
  if (actor.role === 'admin') return true;
  return can(actor, 'classes.edit') && teacherIds.includes(actor.id);
}

/** What the unit rules need to know of a unit. */
export interface UnitFacts {
  schoolId: string;
  ownerId: string;
  /** private or school. */
  visibility: string;
  coauthorIds: readonly string[];
}

/** Whether the actor authors the unit (owner or co-author, and still a teacher). */
export function authorsUnit(actor: Actor, unit: UnitFacts): boolean {
  return (
    sameSchool(actor, unit.schoolId) &&
    actor.role === 'teacher' &&
    (unit.ownerId === actor.id || unit.coauthorIds.includes(actor.id))
  );
}

/**
 * Who reads a unit: its authors; other teachers when it is shared with the school; leads always.
 * Admins and relief teachers do not read units (relief reads the lessons assigned to them).
 */
export function canReadUnit(actor: Actor, unit: UnitFacts): boolean {
  if (!sameSchool(actor, unit.schoolId)) return false;
  if (actor.role === 'lead') return true;
  if (actor.role !== 'teacher') return false;
  return authorsUnit(actor, unit) || unit.visibility === 'school';
}

/** Owners and co-authors edit a unit, its lessons and activities. */
export function canEditUnit(actor: Actor, unit: UnitFacts): boolean {
  return authorsUnit(actor, unit);
}

/** Reading a lesson: as reading its unit, or the relief teacher it is assigned to. */
export function canReadLesson(
  actor: Actor,
  unit: UnitFacts,
  lesson: { reliefTeacherId: string | null },
): boolean {
  if (canReadUnit(actor, unit)) return true;
  return (
    sameSchool(actor, unit.schoolId) &&
    actor.role === 'relief' &&
    lesson.reliefTeacherId === actor.id
  );
}

/**
 * Who sees every tub booking of the school, whoever wrote the lesson: tubs are the school's, and
 * planning a lesson (or lending a tub) needs to know when each one is taken. Admins, leads and
 * teachers do; a relief teacher sees the bookings of the lessons they may read (`canReadLesson`).
 * A booking of a lesson the actor cannot read names the lesson, its class and time (as a double
 * booking warning does) but not its unit, and links nowhere.
 */
export function seesSchoolBookings(actor: Actor, schoolId: string): boolean {
  return sameSchool(actor, schoolId) && can(actor, 'bookings.school');
}

/**
 * Who shares a lesson by link (and lists and withdraws its links): whoever edits it, and the
 * school's admins, who arrange relief cover.
 */
export function canShareLesson(actor: Actor, unit: UnitFacts): boolean {
  return canEditUnit(actor, unit) || (actor.role === 'admin' && sameSchool(actor, unit.schoolId));
}

/** A unit's facts with its review status, for the review rules. */
export interface ReviewFacts extends UnitFacts {
  /** draft, in-review, changes-requested or endorsed. */
  status: string;
}

/** Whether the actor decides on the school's units sent for review (leads and admins). */
export function reviewsUnits(actor: Actor, schoolId: string): boolean {
  return sameSchool(actor, schoolId) && can(actor, 'units.review');
}

/**
 * Who sees a unit in its review (its comments, its review page, the coverage matrix): whoever
 * reads it, and the school's admins once it has been sent for review. Admins do not read
 * teachers' drafts (see canReadUnit); a unit sent for review is one they may decide on.
 */
export function canSeeInReview(actor: Actor, unit: ReviewFacts): boolean {
  if (canReadUnit(actor, unit)) return true;
  return actor.role === 'admin' && sameSchool(actor, unit.schoolId) && unit.status !== 'draft';
}

/**
 * Who runs a lesson on the day (revokes its tray codes, records its pack-away, ticks its prep
 * tasks): its unit's authors, and the relief teacher assigned to that lesson.
 */
export function canRunLesson(
  actor: Actor,
  unit: UnitFacts,
  lesson: { reliefTeacherId: string | null },
): boolean {
  if (authorsUnit(actor, unit)) return true;
  return (
    sameSchool(actor, unit.schoolId) &&
    actor.role === 'relief' &&
    lesson.reliefTeacherId === actor.id
  );
}
