import { inject } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import type { CanDeactivateFn } from '@angular/router';
import { of } from 'rxjs';
import { confirm } from './confirm-dialog';

/** A page that can hold changes not saved yet (its `beforeunload` covers closing the tab). */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/** Route guard of every long form: leaving with unsaved changes asks first. */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (page) =>
  page.hasUnsavedChanges()
    ? confirm(inject(MatDialog), {
        title: 'Leave without saving?',
        message: 'Your changes on this page are not saved yet. If you leave now, they are lost.',
        confirm: 'Leave without saving',
        cancel: 'Stay and keep editing',
        danger: true,
      })
    : of(true);
