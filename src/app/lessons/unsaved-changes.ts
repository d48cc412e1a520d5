import type { CanDeactivateFn } from '@angular/router';

/** A page that can tell whether it holds changes not saved yet. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/** The question asked before leaving a form with unsaved changes. */
export const LEAVE_QUESTION = 'You have changes that are not saved. Leave this page anyway?';

/** Asks before the router leaves a page with unsaved changes. */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (page) =>
  !page.hasUnsavedChanges() || confirm(LEAVE_QUESTION);
