import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialog,
  MatDialogModule,
  MatDialogRef,
} from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import type { Observable } from 'rxjs';
import type { Part } from '../../../shared/schemas/kits';

/** A part the activities use that the new kit type lacks, with the lines that use it. */
export interface MissingPart {
  code: string;
  /** Its name in the old kit type (null when the parts list no longer has it). */
  name: string | null;
  /** "Build (2 per group)", one per material line using it. */
  uses: string[];
}

export interface KitSwitchData {
  kitName: string;
  missing: MissingPart[];
  /** The new kit type's parts, to map to. */
  parts: readonly Part[];
}

/** What the save sends with the new kit type. */
export interface KitSwitchChoice {
  partMap: Record<string, string>;
  dropMissingParts: boolean;
}

/**
 * Lists the parts the activities use that the new kit type does not have, before the switch,
 * and lets the teacher pick a part of the new kit for each or leave its lines out. Closes with
 * the choice (or nothing: the lesson stays as it is).
 */
@Component({
  selector: 'app-kit-switch-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatSelectModule,
  ],
  template: `
    <h2 mat-dialog-title>Switch to {{ data.kitName }}?</h2>
    <mat-dialog-content>
      <p>
        The activities use {{ data.missing.length === 1 ? 'a part' : 'parts' }} that
        {{ data.kitName }} does not have. Choose a part of {{ data.kitName }} for each, or leave it
        out of the activities. Nothing changes until you switch.
      </p>
      <form [formGroup]="form">
        @for (m of data.missing; track m.code) {
          <section class="missing">
            <h3>{{ m.code }}{{ m.name ? ' ' + m.name : '' }}</h3>
            <p class="muted">Used in {{ m.uses.join('; ') }}</p>
            <mat-form-field appearance="outline" subscriptSizing="dynamic">
              <mat-label>Instead of {{ m.code }}</mat-label>
              <mat-select [formControlName]="m.code">
                <mat-option value="">Leave it out</mat-option>
                @for (p of data.parts; track p.id) {
                  <mat-option [value]="p.code">{{ p.code }} {{ p.name }}</mat-option>
                }
              </mat-select>
            </mat-form-field>
          </section>
        }
      </form>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close>Keep the old kit type</button>
      <button matButton="filled" type="button" (click)="confirm()">Switch kit type</button>
    </mat-dialog-actions>
  `,
  styles: `
    .missing h3 {
      margin-block: 1rem 0.25rem;
      font-size: 1rem;
    }
    .missing p {
      margin-block: 0 0.5rem;
    }
    mat-form-field {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitSwitchDialog {
  protected readonly data = inject<KitSwitchData>(MAT_DIALOG_DATA);
  private readonly dialogRef = inject<MatDialogRef<KitSwitchDialog, KitSwitchChoice>>(MatDialogRef);
  protected readonly form = new FormGroup(
    Object.fromEntries(
      this.data.missing.map((m) => [m.code, new FormControl('', { nonNullable: true })]),
    ),
  );

  protected confirm(): void {
    const partMap: Record<string, string> = {};
    let dropping = false;
    for (const [code, to] of Object.entries(this.form.getRawValue())) {
      if (to) partMap[code] = to;
      else dropping = true;
    }
    this.dialogRef.close({ partMap, dropMissingParts: dropping });
  }
}

/** Opens the switch dialog; emits the choice, or undefined when the teacher keeps the old kit. */
export function chooseKitSwitch(
  dialog: MatDialog,
  data: KitSwitchData,
): Observable<KitSwitchChoice | undefined> {
  return dialog
    .open<KitSwitchDialog, KitSwitchData, KitSwitchChoice>(KitSwitchDialog, {
      data,
      width: 'min(36rem, calc(100vw - 2rem))',
    })
    .afterClosed();
}
