import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog, MatDialogModule } from '@angular/material/dialog';
import type { CanDeactivateFn } from '@angular/router';
import { map, of } from 'rxjs';

/** A screen that can hold edits not saved yet. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/** Asks whether to leave a form with unsaved changes. Closes with true to leave. */
@Component({
  selector: 'app-leave-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Leave without saving?</h2>
    <mat-dialog-content>
      <p>Your changes to the school settings are not saved yet. If you leave now they are lost.</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="true">Leave without saving</button>
      <button matButton="filled" type="button" [mat-dialog-close]="false" cdkFocusInitial>
        Stay on this page
      </button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LeaveDialog {}

/** Route guard: leaving a screen with unsaved changes asks first. */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (component) => {
  if (!component.hasUnsavedChanges()) return of(true);
  return inject(MatDialog)
    .open<LeaveDialog, undefined, boolean>(LeaveDialog, { width: 'min(28rem, calc(100vw - 2rem))' })
    .afterClosed()
    .pipe(map((leave) => leave === true));
};
