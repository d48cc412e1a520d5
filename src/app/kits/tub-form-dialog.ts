import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import {
  TUB_STATUSES,
  TUB_STATUS_LABELS,
  tubCreateSchema,
  tubSchema,
  tubUpdateSchema,
  type Tub,
  type TubStatus,
  type TubSummary,
  type TubUpdate,
} from '../../../shared/schemas/kits';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { KitsApi } from './kits-api';

/** Add a tub to a kit type (no `tub`), or edit one (`tub` as read, with its version). */
export interface TubFormData {
  kitTypeId: string;
  tub?: TubSummary;
}

type Editable = Pick<TubSummary, 'label' | 'controllerLabel' | 'status'>;
type Change = Omit<TubUpdate, 'version'>;

/** One line of "what changed" after a stale edit. */
export interface ChangedField {
  field: string;
  now: string;
  was: string;
}

const FIELD_WORDS: Record<keyof Editable, string> = {
  label: 'Label',
  controllerLabel: 'Controller label',
  status: 'Status',
};

function shown(key: keyof Editable, tub: Editable): string {
  if (key === 'status') return TUB_STATUS_LABELS[tub.status];
  return tub[key] ?? '(none)';
}

/**
 * The add and edit form of a tub: label, controller label and status. An edit sends the version
 * it read and only the fields changed; a stale one (409) shows what someone else changed and
 * lets the person reload or re-apply. Closes with the saved `Tub`.
 */
@Component({
  selector: 'app-tub-form-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  templateUrl: './tub-form-dialog.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TubFormDialog {
  private readonly api = inject(KitsApi);
  private readonly dialogRef = inject<MatDialogRef<TubFormDialog, Tub>>(MatDialogRef);
  protected readonly data = inject<TubFormData>(MAT_DIALOG_DATA);

  protected readonly statuses = TUB_STATUSES;
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  /** The tub as last read from the server (its version is the one sent). */
  protected readonly base = signal<TubSummary | null>(this.data.tub ?? null);
  /** After a 409 `stale-version`: the change refused and what the other person changed. */
  protected readonly stale = signal<{ change: Change; changed: ChangedField[] } | null>(null);

  protected readonly form = new FormGroup({
    label: new FormControl(this.data.tub?.label ?? '', {
      nonNullable: true,
      validators: [zodValidator(tubCreateSchema.shape.label)],
    }),
    controllerLabel: new FormControl(this.data.tub?.controllerLabel ?? '', {
      nonNullable: true,
      validators: [zodValidator(tubCreateSchema.shape.controllerLabel)],
    }),
    status: new FormControl<TubStatus>(this.data.tub?.status ?? 'ready', {
      nonNullable: true,
      validators: [zodValidator(tubCreateSchema.shape.status)],
    }),
  });

  /** The status in words for the select ("Needs sorting"), never the code. */
  protected statusLabel(status: TubStatus): string {
    return TUB_STATUS_LABELS[status];
  }

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const base = this.base();
    if (!base) {
      const body = tubCreateSchema.parse({ kitTypeId: this.data.kitTypeId, ...this.values() });
      this.send(this.api.createTub(body), {});
      return;
    }
    const change = this.changeFrom(base);
    if (Object.keys(change).length === 0) {
      // The schema's own rule: an edit must change something.
      this.formError.set(
        tubUpdateSchema.safeParse({ version: base.version }).error?.issues[0]?.message ??
          'Change the label, the controller label or the status.',
      );
      return;
    }
    this.send(this.api.updateTub(base.id, { version: base.version, ...change }), change);
  }

  /** Drops the refused change and shows the tub as saved now. */
  protected reload(): void {
    const base = this.base();
    this.stale.set(null);
    if (base) this.resetTo(base);
  }

  /** Sends the refused change again on the version the server holds now. */
  protected reapply(): void {
    const base = this.base();
    const refused = this.stale();
    if (!base || !refused) return;
    this.stale.set(null);
    this.send(
      this.api.updateTub(base.id, { version: base.version, ...refused.change }),
      refused.change,
    );
  }

  private values(): Editable {
    const v = this.form.getRawValue();
    return {
      label: v.label.trim(),
      controllerLabel: v.controllerLabel.trim() || null,
      status: v.status,
    };
  }

  /** Only the fields the person changed, so a colleague's edit of another one is kept. */
  private changeFrom(base: TubSummary): Change {
    const next = this.values();
    const change: Change = {};
    if (next.label !== base.label) change.label = next.label;
    if (next.controllerLabel !== base.controllerLabel)
      change.controllerLabel = next.controllerLabel;
    if (next.status !== base.status) change.status = next.status;
    return change;
  }

  private resetTo(tub: TubSummary): void {
    this.form.reset({
      label: tub.label,
      controllerLabel: tub.controllerLabel ?? '',
      status: tub.status,
    });
  }

  private send(request: ReturnType<KitsApi['createTub']>, change: Change): void {
    this.submitting.set(true);
    request.subscribe({
      next: (tub) => this.dialogRef.close(tub),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        const current = staleConflict(error, tubSchema)?.current;
        const before = this.base();
        if (current && before) {
          this.base.set(current);
          this.stale.set({ change, changed: changedFields(before, current) });
          return;
        }
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }
}

/** What differs between the tub as the person opened it and as it is saved now. */
export function changedFields(before: Editable, now: Editable): ChangedField[] {
  return (Object.keys(FIELD_WORDS) as (keyof Editable)[])
    .filter((key) => before[key] !== now[key])
    .map((key) => ({ field: FIELD_WORDS[key], now: shown(key, now), was: shown(key, before) }));
}
