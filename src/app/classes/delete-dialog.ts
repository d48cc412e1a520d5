import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

/** Asks before a class is deleted; closes with `true` to go ahead. */
@Component({
  selector: 'app-class-delete-dialog',
  imports: [MatDialogModule, MatButtonModule],
  template: `
    <h2 mat-dialog-title>Delete {{ data.name }}?</h2>
    <mat-dialog-content>
      <p>The class is removed from the school. A class that lessons use cannot be deleted.</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Cancel</button>
      <button matButton="filled" type="button" class="danger" [mat-dialog-close]="true">
        Delete
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
export class ClassDeleteDialog {
  protected readonly data = inject<{ name: string }>(MAT_DIALOG_DATA);
}
