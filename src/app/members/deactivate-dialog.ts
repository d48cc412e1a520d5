import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

/** What the deactivation dialog needs to know. */
export interface DeactivateDialogData {
  name: string;
  email: string;
}

/** Asks before a member loses access; closes with `true` to go ahead. */
@Component({
  selector: 'app-deactivate-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Deactivate {{ data.name || data.email }}?</h2>
    <mat-dialog-content>
      <p>
        They will no longer be able to sign in. Their units, lessons and audits stay with the
        school, and you can reactivate them later.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Cancel</button>
      <button matButton="filled" type="button" class="danger" [mat-dialog-close]="true">
        Deactivate
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeactivateDialog {
  protected readonly data = inject<DeactivateDialogData>(MAT_DIALOG_DATA);
}
