import { inject } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import type { CanDeactivateFn } from '@angular/router';
import { of } from 'rxjs';
import { confirm } from './confirm-dialog';

/** A page that can hold changes not yet saved. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/** Asks before leaving a page with unsaved changes (in-app navigation; see `beforeunload`). */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (page) =>
  page.hasUnsavedChanges()
    ? confirm(inject(MatDialog), {
        title: 'Leave without saving?',
        message: 'Your changes to this unit are not saved yet. If you leave now, they are lost.',
        confirm: 'Leave without saving',
        cancel: 'Stay and keep editing',
        danger: true,
      })
    : of(true);
