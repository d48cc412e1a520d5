import type { ReviewAction } from '../../../shared/schemas/review';
import type { Role } from '../../../shared/schemas/common';
import type { Unit } from '../../../shared/schemas/units';

/** The words of each step's button. */
export const STEP_BUTTONS: Record<ReviewAction, string> = {
  submit: 'Send for review',
  'request-changes': 'Request changes',
  endorse: 'Endorse',
  reopen: 'Reopen',
};

/** What a comment that came with a step says it was. */
export const STEP_NOTES: Record<ReviewAction, string> = {
  submit: 'sent for review',
  'request-changes': 'requested changes',
  endorse: 'endorsed',
  reopen: 'reopened',
};

/** "2 Dec 2026, 4:05 pm" in the reader's own clock. */
export function when(iso: string): string {
  return new Intl.DateTimeFormat('en-AU', {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
  }).format(new Date(iso));
}

/**
 * The steps the screen offers on a unit (API.md, "Review and coverage"): its authors send it
 * for review, leads and admins decide, its owner or a reviewer reopens it once endorsed. Only
 * a mirror: the server decides again on every step.
 */
export function reviewStepsFor(unit: Unit, role: Role): ReviewAction[] {
  const reviewer = role === 'lead' || role === 'admin';
  switch (unit.status) {
    case 'draft':
    case 'changes-requested':
      return unit.canEdit ? ['submit'] : [];
    case 'in-review':
      return reviewer ? ['request-changes', 'endorse'] : [];
    case 'endorsed':
      return unit.isOwner || reviewer ? ['reopen'] : [];
  }
}
