/**
 * The review state machine of API.md, as data: which step moves a unit from which status to
 * which, and who may take it. Pure, so the route and the table test read the same rules.
 *
 *   draft ──submit──▶ in-review ──request-changes──▶ changes-requested ──submit──▶ in-review
 *                       └──endorse──▶ endorsed ──reopen──▶ draft
 */
import type { ReviewAction } from '../../shared/schemas/review.js';
import type { UnitStatus } from '../../shared/schemas/units.js';
import type { Role } from '../../shared/schemas/common.js';

/** How the actor stands to the unit: the review rules depend on it as much as on the role. */
export interface Standing {
  role: Role;
  /** Whether the actor owns the unit. */
  owner: boolean;
  /** Whether the actor co-authors the unit. */
  coauthor: boolean;
}

interface Move {
  from: readonly UnitStatus[];
  to: UnitStatus;
  /** Whether someone standing so may take the step at all (from any status). */
  allowed: (who: Standing) => boolean;
}

const author = (w: Standing) => w.role === 'teacher' && (w.owner || w.coauthor);
const reviewer = (w: Standing) => w.role === 'lead' || w.role === 'admin';

export const MOVES: Readonly<Record<ReviewAction, Move>> = {
  submit: { from: ['draft', 'changes-requested'], to: 'in-review', allowed: author },
  'request-changes': { from: ['in-review'], to: 'changes-requested', allowed: reviewer },
  endorse: { from: ['in-review'], to: 'endorsed', allowed: reviewer },
  reopen: {
    from: ['endorsed'],
    to: 'draft',
    allowed: (w) => (w.role === 'teacher' && w.owner) || reviewer(w),
  },
};

export type Verdict =
  { ok: true; to: UnitStatus } | { ok: false; reason: 'forbidden' | 'invalid-transition' };

/**
 * Whether `who` may take `action` on a unit in `status`. A role that may never take the step
 * hears "forbidden" whatever the status; a permitted step from the wrong status is an invalid
 * transition.
 */
export function judge(action: ReviewAction, status: UnitStatus, who: Standing): Verdict {
  const move = MOVES[action];
  if (!move.allowed(who)) return { ok: false, reason: 'forbidden' };
  if (!move.from.includes(status)) return { ok: false, reason: 'invalid-transition' };
  return { ok: true, to: move.to };
}

/** The steps `who` may take on a unit in `status` (the buttons the screen shows). */
export function possibleSteps(status: UnitStatus, who: Standing): ReviewAction[] {
  return (Object.keys(MOVES) as ReviewAction[]).filter((a) => judge(a, status, who).ok);
}
