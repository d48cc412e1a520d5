import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { OUTCOME_CSV_MAX_BYTES, type OutcomeImportResult } from '../../../shared/schemas/outcomes';
import { CsvImport } from '../files/csv-import';
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
  imports: [MatDialogModule, CsvImport],
  template: `
    <h2 mat-dialog-title>Import outcomes</h2>
    <app-csv-import
      [send]="send"
      [maxBytes]="maxBytes"
      tooLarge="That file is larger than 2 MB. Split the framework or remove blank rows."
      unchanged="The framework"
      progressLabel="Uploading the outcomes"
      (imported)="dialogRef.close($event)"
    >
      <p>
        The file replaces the outcomes of {{ data.frameworkName }}. Use a CSV with a header row:
        <code>code</code> and <code>description</code> are needed; <code>strand</code> and
        <code>year_band</code> may follow, in any order. At most 2 MB.
      </p>
      <p class="muted">
        Outcomes whose code is in the file keep their place in units; outcomes whose code is not in
        the file are removed from the framework and from the units that cite them.
      </p>
    </app-csv-import>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutcomeImportDialog {
  private readonly api = inject(OutcomesApi);
  protected readonly dialogRef =
    inject<MatDialogRef<OutcomeImportDialog, OutcomeImportResult>>(MatDialogRef);
  protected readonly data = inject<OutcomeImportData>(MAT_DIALOG_DATA);
  protected readonly maxBytes = OUTCOME_CSV_MAX_BYTES;
  protected readonly send = (file: File) => this.api.importOutcomes(this.data.frameworkId, file);
}
