import type { ReviewAction } from '../../../shared/schemas/review';

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
