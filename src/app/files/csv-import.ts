import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import type { Observable } from 'rxjs';
import type { ApiErrorDetail } from '../../../shared/schemas/common';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import type { UploadEvent } from './transfer';

/**
 * The body and actions of a CSV import dialog (parts lists, outcomes): choose a file, upload it
 * with a progress bar, and on a 422 list every bad row (line, column, reason) and say that
 * nothing was imported. The dialog around it gives the title and the words about the format.
 */
@Component({
  selector: 'app-csv-import',
  imports: [MatDialogModule, MatButtonModule, MatProgressBarModule, MatTableModule],
  template: `
    <mat-dialog-content>
      <ng-content />
      <input
        #picker
        class="visually-hidden"
        type="file"
        accept=".csv,text/csv"
        (change)="picked($any($event.target))"
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
          [attr.aria-label]="progressLabel()"
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
export class CsvImport<T> {
  /** Sends the file; the dialog binds its API call here. */
  readonly send = input.required<(file: File) => Observable<UploadEvent<T>>>();
  /** Largest file accepted, in bytes (the server's limit). */
  readonly maxBytes = input.required<number>();
  /** The sentence shown when the file is too large. */
  readonly tooLarge = input.required<string>();
  /** What stays as it was when rows are bad ("The parts list"). */
  readonly unchanged = input.required<string>();
  /** Accessible name of the progress bar. */
  readonly progressLabel = input('Uploading the file');
  /** The parsed answer of a successful import. */
  readonly imported = output<T>();

  protected readonly columns = ['line', 'column', 'reason'];
  protected readonly file = signal<File | null>(null);
  protected readonly uploading = signal(false);
  /** Upload progress in percent; null while the browser does not know the total. */
  protected readonly percent = signal<number | null>(null);
  protected readonly message = signal<string | null>(null);
  protected readonly rows = signal<readonly ApiErrorDetail[]>([]);

  /**
   * Takes the file from the picker, then empties the picker: choosing the same file again (say,
   * after correcting it) must fire `change` again and be read afresh. Without this the browser
   * sees no change, and the old File, whose bytes changed on disk, can no longer be read.
   */
  protected picked(picker: HTMLInputElement): void {
    this.pick(picker.files ? [...picker.files] : null);
    picker.value = '';
  }

  /** Takes the chosen file; a file over the limit is refused before it is sent. */
  pick(files: FileList | File[] | null): void {
    const chosen = files?.[0] ?? null;
    this.rows.set([]);
    this.message.set(null);
    if (chosen && chosen.size > this.maxBytes()) {
      this.file.set(null);
      this.message.set(this.tooLarge());
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
    this.send()(file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') this.percent.set(event.percent);
        else this.imported.emit(event.body);
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
            `${error.message}${nothing} ${this.unchanged()} is unchanged: fix these lines and import the file again.`,
          );
          this.rows.set(error.details);
        } else {
          this.message.set(error.message);
        }
      },
    });
  }
}
