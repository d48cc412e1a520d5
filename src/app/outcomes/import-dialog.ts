import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import type { ApiErrorDetail } from '../../../shared/schemas/common';
import { OUTCOME_CSV_MAX_BYTES, type OutcomeImportResult } from '../../../shared/schemas/outcomes';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import { OutcomesApi } from './outcomes-api';

/** What the import dialog needs: the framework whose outcomes the file replaces. */
export interface OutcomeImportData {
  frameworkId: string;
  frameworkName: string;
}

/**
 * Uploads an outcomes CSV that replaces a framework's outcomes. Closes with the import's result;
 * a file with bad rows lists every one (line, column, reason) and imports nothing.
 */
@Component({
  selector: 'app-outcome-import-dialog',
  imports: [MatDialogModule, MatButtonModule, MatProgressBarModule, MatTableModule],
  template: `
    <h2 mat-dialog-title>Import outcomes</h2>
    <mat-dialog-content>
      <p>
        The file replaces the outcomes of {{ data.frameworkName }}. Use a CSV with a header row:
        <code>code</code> and <code>description</code> are needed; <code>strand</code> and
        <code>year_band</code> may follow, in any order. At most 2 MB.
      </p>
      <p class="muted">
        Outcomes whose code is in the file keep their place in units; outcomes whose code is not in
        the file are removed from the framework and from the units that cite them.
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
          aria-label="Uploading the outcomes"
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
            <td mat-cell *matCellDef="let row">{{ lineOf(row) }}</td>
          </ng-container>
          <ng-container matColumnDef="column">
            <th mat-header-cell *matHeaderCellDef>Column</th>
            <td mat-cell *matCellDef="let row">{{ columnOf(row) }}</td>
          </ng-container>
          <ng-container matColumnDef="reason">
            <th mat-header-cell *matHeaderCellDef>Reason</th>
            <td mat-cell *matCellDef="let row">{{ reasonOf(row) }}</td>
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
export class OutcomeImportDialog {
  private readonly api = inject(OutcomesApi);
  private readonly dialogRef =
    inject<MatDialogRef<OutcomeImportDialog, OutcomeImportResult>>(MatDialogRef);
  protected readonly data = inject<OutcomeImportData>(MAT_DIALOG_DATA);

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
    if (chosen && chosen.size > OUTCOME_CSV_MAX_BYTES) {
      this.file.set(null);
      this.message.set('That file is larger than 2 MB. Split the framework or remove blank rows.');
      return;
    }
    this.file.set(chosen);
  }

  // Typed readers for the rows table: its cell context is untyped under strict templates.
  protected lineOf(row: ApiErrorDetail): string {
    return row.line === undefined ? '—' : String(row.line);
  }
  protected columnOf(row: ApiErrorDetail): string {
    return row.column || '—';
  }
  protected reasonOf(row: ApiErrorDetail): string {
    return row.message;
  }

  protected upload(): void {
    const file = this.file();
    if (!file) return;
    this.uploading.set(true);
    this.percent.set(null);
    this.message.set(null);
    this.rows.set([]);
    this.api.importOutcomes(this.data.frameworkId, file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') this.percent.set(event.percent);
        else this.dialogRef.close(event.result);
      },
      error: (error: unknown) => {
        this.uploading.set(false);
        if (!(error instanceof AppError)) {
          this.message.set(UNKNOWN_MESSAGE);
          return;
        }
        if (error.status === 422) {
          // Whatever the server's wording, the person is told that nothing changed.
          const nothing = /nothing was imported/i.test(error.message)
            ? ''
            : ' Nothing was imported.';
          this.message.set(
            `${error.message}${nothing} The framework is unchanged: fix these lines and import the file again.`,
          );
          this.rows.set(error.details);
        } else {
          this.message.set(error.message);
        }
      },
    });
  }
}
