import { LiveAnnouncer } from '@angular/cdk/a11y';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import * as z from 'zod';
import {
  MAX_PART_QTY,
  TUB_STATUS_LABELS,
  tubAuditCreateSchema,
  type Part,
  type Tub,
  type TubAudit,
} from '../../../shared/schemas/kits';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { focusAfter } from '../a11y/focus-after';
import { KitsApi } from './kits-api';

/** What the tub dialog needs: the tub, the kit type's parts (names and quantities). */
export interface TubDialogData {
  tubId: string;
  parts: readonly Pick<Part, 'code' | 'name' | 'qty'>[];
  canAudit: boolean;
}

/** Blank or a whole number 0…MAX (0 and blank both mean "none"). */
const countValidator = zodValidator(
  z.union([
    z.literal(''),
    z.null(),
    z.coerce.number().refine((v) => Number.isInteger(v) && v >= 0 && v <= MAX_PART_QTY, {
      error: `Use a whole number from 0 to ${MAX_PART_QTY}.`,
    }),
  ]),
);

function countRow(code: string) {
  return new FormGroup({
    partCode: new FormControl(code, { nonNullable: true }),
    missing: new FormControl<number | null>(null, { validators: [countValidator] }),
    found: new FormControl<number | null>(null, { validators: [countValidator] }),
  });
}

/**
 * One tub: its status, stock and missing count per part, a pack-away audit form (what went
 * missing, what turned up again) and the audit history. Closes with `true` after an audit.
 */
@Component({
  selector: 'app-tub-dialog',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    FieldErrorPipe,
  ],
  templateUrl: './tub-dialog.html',
  styleUrl: './tub-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TubDialog {
  private readonly api = inject(KitsApi);
  private readonly announcer = inject(LiveAnnouncer);
  private readonly focus = focusAfter();
  private readonly dialogRef = inject<MatDialogRef<TubDialog, boolean>>(MatDialogRef);
  protected readonly data = inject<TubDialogData>(MAT_DIALOG_DATA);

  protected readonly statusLabels = TUB_STATUS_LABELS;
  /** The tub's status, stock and missing parts, read again after an audit. */
  private readonly tubRead = apiResource({ load: () => this.api.tub(this.data.tubId) });
  protected readonly tub = computed<Tub | null>(() => this.tubRead.value() ?? null);
  private readonly auditsRead = apiResource({ load: () => this.api.audits(this.data.tubId) });
  protected readonly audits = computed<readonly TubAudit[]>(() => this.auditsRead.value() ?? []);
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly saved = signal(false);
  /** Shown under the form after an audit is recorded (and announced, WCAG 2.2 SC 4.1.3). */
  protected readonly recorded = signal<string | null>(null);
  protected readonly form = new FormGroup({
    lines: new FormArray(this.data.parts.map((p) => countRow(p.code))),
    note: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(tubAuditCreateSchema.shape.note)],
    }),
  });

  protected partName(index: number): string {
    const part = this.data.parts[index];
    return part ? `${part.name} (${part.code})` : '';
  }

  protected missingOf(tub: Tub, code: string): number {
    return tub.missing.find((m) => m.partCode === code)?.count ?? 0;
  }

  protected stockOf(tub: Tub, code: string): number {
    return tub.stock[code] ?? 0;
  }

  protected nameOf(code: string): string {
    return this.data.parts.find((p) => p.code === code)?.name ?? code;
  }

  protected countsText(lines: readonly { partCode: string; count: number }[]): string {
    return lines.map((l) => `${l.count} × ${this.nameOf(l.partCode)}`).join(', ');
  }

  protected close(): void {
    this.dialogRef.close(this.saved());
  }

  protected submit(): void {
    this.formError.set(null);
    this.recorded.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      // The count may be scrolled off: focus goes to it, as school settings does (SC 3.3.1).
      this.focus('.mat-form-field-invalid :is(input, textarea)');
      return;
    }
    const { lines, note } = this.form.getRawValue();
    const pick = (key: 'missing' | 'found') =>
      lines
        .map((l) => ({ partCode: l.partCode, count: Number(l[key] ?? 0) }))
        .filter((l) => l.count > 0);
    const body = { missing: pick('missing'), found: pick('found'), note };
    if (body.missing.length === 0 && body.found.length === 0 && !note.trim()) {
      this.formError.set('Enter what went missing or turned up, or a note.');
      return;
    }
    this.submitting.set(true);
    this.api.createAudit(this.data.tubId, body).subscribe({
      next: () => {
        this.submitting.set(false);
        this.saved.set(true);
        this.form.reset();
        this.tubRead.reload();
        this.auditsRead.reload();
        const message = 'The audit is recorded: the stock and history below are updated.';
        this.recorded.set(message);
        void this.announcer.announce(message);
        // The button was disabled while sending, which dropped focus to the page (SC 2.4.3).
        this.focus('.record-audit');
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        this.formError.set(error instanceof AppError ? error.message : String(error));
        this.focus('.record-audit');
      },
    });
  }
}
