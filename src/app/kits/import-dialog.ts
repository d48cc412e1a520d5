import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MAX_CSV_BYTES } from '../../../shared/schemas/kits';
import { CsvImport } from '../files/csv-import';
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
  imports: [MatDialogModule, CsvImport],
  template: `
    <h2 mat-dialog-title>Import a parts list</h2>
    <app-csv-import
      [send]="send"
      [maxBytes]="maxBytes"
      tooLarge="That file is larger than 2 MB. Split the parts list or remove blank rows."
      unchanged="The parts list"
      progressLabel="Uploading the parts list"
      (imported)="dialogRef.close($event.imported)"
    >
      <p>
        The file replaces the whole parts list of {{ data.kitTypeName }}. Use a CSV with a header
        row: <code>code</code>, <code>name</code> and <code>qty</code> are needed;
        <code>colour</code>, <code>category</code>, <code>compartment</code>, <code>small</code> and
        <code>charge_minutes</code> may follow, in any order. At most 2 MB.
      </p>
    </app-csv-import>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportDialog {
  private readonly api = inject(KitsApi);
  protected readonly dialogRef = inject<MatDialogRef<ImportDialog, number>>(MatDialogRef);
  protected readonly data = inject<ImportDialogData>(MAT_DIALOG_DATA);
  protected readonly maxBytes = MAX_CSV_BYTES;
  protected readonly send = (file: File) => this.api.importParts(this.data.kitTypeId, file);
}
