import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import type { ApiErrorDetail } from '../../../shared/schemas/common';
import { MAX_CSV_BYTES } from '../../../shared/schemas/kits';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import { KitsApi } from './kits-api';

/** What the import dialog needs: the kit type whose parts list the file replaces. */
export interface ImportDialogData {
  kitTypeId: string;
  kitTypeName: string;
}

/**
 * Uploads a parts-list CSV (the format of API.md) that replaces the whole list. Closes with the
 * number of parts imported; a file with bad rows lists every one and imports nothing.
 */
@Component({
  selector: 'app-import-dialog',
  imports: [MatDialogModule, MatButtonModule, MatProgressBarModule, MatTableModule],
  template: `
    <h2 mat-dialog-title>Import a parts list</h2>
    <mat-dialog-content>
      <p>
        The file replaces the whole parts list of {{ data.kitTypeName }}. Use a CSV with a header
        row: <code>code</code>, <code>name</code> and <code>qty</code> are needed;
        <code>colour</code>, <code>category</code>, <code>compartment</code>, <code>small</code> and
        <code>charge_minutes</code> may follow, in any order. At most 2 MB.
      </p>
      <input
        #picker
        class="visually-hidden"
        type="file"
        accept=".csv,text/csv"
        (change)="pick($any($event.target).files)"
      />
      <p>
        <button
          matButton="outlined"
          type="button"
          [disabled]="uploading()"
          (click)="picker.click()"
        >
          Choose a CSV file
        </button>
        @if (file(); as f) {
          <span class="file-name">{{ f.name }}</span>
        }
      </p>
      @if (uploading()) {
        <mat-progress-bar
          [mode]="percent() === null ? 'indeterminate' : 'determinate'"
          [value]="percent() ?? 0"
          aria-label="Uploading the parts list"
        />
        <p class="muted" role="status">
          Uploading… {{ percent() === null ? '' : percent() + '%' }}
        </p>
      }
      @if (message(); as text) {
        <p class="form-error" role="alert">{{ text }}</p>
      }
      @if (rows().length > 0) {
        <table mat-table [dataSource]="rows()" class="rows">
          <caption class="visually-hidden">
            Lines of the file that need attention
          </caption>
          <ng-container matColumnDef="line">
            <th mat-header-cell *matHeaderCellDef>Line</th>
            <td mat-cell *matCellDef="let row">{{ row.line ?? '—' }}</td>
          </ng-container>
          <ng-container matColumnDef="column">
            <th mat-header-cell *matHeaderCellDef>Column</th>
            <td mat-cell *matCellDef="let row">{{ row.column || '—' }}</td>
          </ng-container>
          <ng-container matColumnDef="reason">
            <th mat-header-cell *matHeaderCellDef>Reason</th>
            <td mat-cell *matCellDef="let row">{{ row.message }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
        </table>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close [disabled]="uploading()">Cancel</button>
      <button
        matButton="filled"
        type="button"
        [disabled]="!file() || uploading()"
        (click)="upload()"
      >
        Import
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .file-name {
      margin-inline-start: 0.75rem;
    }
    .rows {
      width: 100%;
      margin-top: 0.5rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportDialog {
  private readonly api = inject(KitsApi);
  private readonly dialogRef = inject<MatDialogRef<ImportDialog, number>>(MatDialogRef);
  protected readonly data = inject<ImportDialogData>(MAT_DIALOG_DATA);

  protected readonly columns = ['line', 'column', 'reason'];
  protected readonly file = signal<File | null>(null);
  protected readonly uploading = signal(false);
  /** Upload progress in percent; null while the browser does not know the total. */
  protected readonly percent = signal<number | null>(null);
  protected readonly message = signal<string | null>(null);
  protected readonly rows = signal<readonly ApiErrorDetail[]>([]);

  /** Takes the chosen file; a file over the limit is refused before it is sent. */
  pick(files: FileList | File[] | null): void {
    const chosen = files?.[0] ?? null;
    this.rows.set([]);
    this.message.set(null);
    if (chosen && chosen.size > MAX_CSV_BYTES) {
      this.file.set(null);
      this.message.set('That file is larger than 2 MB. Split the parts list or remove blank rows.');
      return;
    }
    this.file.set(chosen);
  }

  protected upload(): void {
    const file = this.file();
    if (!file) return;
    this.uploading.set(true);
    this.percent.set(null);
    this.message.set(null);
    this.rows.set([]);
    this.api.importParts(this.data.kitTypeId, file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') this.percent.set(event.percent);
        else this.dialogRef.close(event.imported);
      },
      error: (error: unknown) => {
        this.uploading.set(false);
        if (!(error instanceof AppError)) {
          this.message.set(UNKNOWN_MESSAGE);
          return;
        }
        if (error.status === 422) {
          // The server says how many lines; this makes sure "nothing imported" is always said.
          const nothing = /nothing was imported/i.test(error.message)
            ? ''
            : ' Nothing was imported.';
          this.message.set(
            `${error.message}${nothing} The parts list is unchanged: fix these lines and import the file again.`,
          );
          this.rows.set(error.details);
        } else {
          this.message.set(error.message);
        }
      },
    });
  }
}
