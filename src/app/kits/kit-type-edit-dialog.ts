import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import {
  kitTypeSchema,
  kitTypeUpdateSchema,
  type KitType,
  type KitTypeUpdate,
} from '../../../shared/schemas/kits';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { KitsApi } from './kits-api';

type Change = Omit<KitTypeUpdate, 'version'>;

/**
 * Renames a kit type or edits its description, sending the version it read and only what
 * changed. A stale edit (409) shows the name and description saved now and offers Reload or
 * Re-apply. Closes with the saved `KitType`.
 */
@Component({
  selector: 'app-kit-type-edit-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    FieldErrorPipe,
  ],
  template: `
    <h2 mat-dialog-title>Edit kit type</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content class="form-stack">
        @if (stale(); as refused) {
          <div class="form-error" role="alert">
            <p>Someone changed this kit type after you opened it, so your change was not saved.</p>
            <p>Saved now: name “{{ base().name }}”, description “{{ base().description }}”.</p>
            <div class="form-actions">
              <button matButton="filled" type="button" (click)="reapply()">
                Re-apply my change
              </button>
              <button matButton type="button" (click)="reload()">Reload</button>
            </div>
          </div>
        }
        @if (formError(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        }
        <mat-form-field appearance="outline">
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" required />
          <mat-error>{{ form.controls.name.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Description</mat-label>
          <textarea matInput formControlName="description" rows="3"></textarea>
          <mat-error>{{ form.controls.description.errors | fieldError }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="submitting() || stale() !== null">
          Save
        </button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitTypeEditDialog {
  private readonly api = inject(KitsApi);
  private readonly dialogRef = inject<MatDialogRef<KitTypeEditDialog, KitType>>(MatDialogRef);

  /** The kit type as last read from the server (its version is the one sent). */
  protected readonly base = signal(inject<KitType>(MAT_DIALOG_DATA));
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  /** The change a 409 `stale-version` refused, kept for Re-apply. */
  protected readonly stale = signal<Change | null>(null);
  protected readonly form = new FormGroup({
    name: new FormControl(this.base().name, {
      nonNullable: true,
      validators: [zodValidator(kitTypeUpdateSchema.shape.name)],
    }),
    description: new FormControl(this.base().description, {
      nonNullable: true,
      validators: [zodValidator(kitTypeUpdateSchema.shape.description)],
    }),
  });

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const base = this.base();
    const { name, description } = this.form.getRawValue();
    const change: Change = {};
    if (name.trim() !== base.name) change.name = name.trim();
    if (description.trim() !== base.description) change.description = description.trim();
    if (Object.keys(change).length === 0) {
      this.formError.set('Change the name or the description.');
      return;
    }
    this.send(change);
  }

  protected reload(): void {
    this.stale.set(null);
    const { name, description } = this.base();
    this.form.reset({ name, description });
  }

  protected reapply(): void {
    const change = this.stale();
    this.stale.set(null);
    if (change) this.send(change);
  }

  private send(change: Change): void {
    this.submitting.set(true);
    this.api.update(this.base().id, { version: this.base().version, ...change }).subscribe({
      next: (kit) => this.dialogRef.close(kit),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        const current = staleConflict(error, kitTypeSchema)?.current;
        if (current) {
          this.base.set(current);
          this.stale.set(change);
          return;
        }
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }
}
