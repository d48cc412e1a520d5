import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialog,
  MatDialogModule,
  MatDialogRef,
} from '@angular/material/dialog';
import { map, type Observable } from 'rxjs';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';

/** What to ask, and the request that deletes once the person confirms. */
export interface DeleteDialogData {
  title: string;
  message: string;
  /** The words of the delete button, e.g. "Delete Tub 8". */
  confirm: string;
  /** Sends the delete; its errors are shown in the dialog (the API marks them as such). */
  run: () => Observable<unknown>;
}

/**
 * Asks before deleting, then deletes. A refusal (409: lessons still use the record) keeps the
 * dialog open with the server's message, so the person reads why; closes with `true` once gone.
 */
@Component({
  selector: 'app-delete-dialog',
  imports: [MatButtonModule, MatDialogModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <mat-dialog-content>
      <p>{{ data.message }}</p>
      @if (error(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close [disabled]="busy()">
        {{ refused() ? 'Close' : 'Cancel' }}
      </button>
      @if (!refused()) {
        <button
          matButton="filled"
          type="button"
          class="danger"
          [disabled]="busy()"
          (click)="remove()"
        >
          {{ data.confirm }}
        </button>
      }
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
export class DeleteDialog {
  protected readonly data = inject<DeleteDialogData>(MAT_DIALOG_DATA);
  private readonly dialogRef = inject<MatDialogRef<DeleteDialog, boolean>>(MatDialogRef);

  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  /** The server refused for a reason another try will not change (409). */
  protected readonly refused = signal(false);

  protected remove(): void {
    this.busy.set(true);
    this.error.set(null);
    this.data.run().subscribe({
      next: () => this.dialogRef.close(true),
      error: (error: unknown) => {
        this.busy.set(false);
        this.error.set(error instanceof AppError ? error.message : UNKNOWN_MESSAGE);
        this.refused.set(error instanceof AppError && error.status === 409);
      },
    });
  }
}

/** Opens the confirmation; emits true only when the record was deleted. */
export function confirmDelete(dialog: MatDialog, data: DeleteDialogData): Observable<boolean> {
  return dialog
    .open<DeleteDialog, DeleteDialogData, boolean>(DeleteDialog, {
      data,
      width: 'min(30rem, calc(100vw - 2rem))',
    })
    .afterClosed()
    .pipe(map((gone) => gone === true));
}
