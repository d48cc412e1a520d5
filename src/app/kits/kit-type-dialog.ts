import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { kitTypeCreateSchema, type KitType } from '../../../shared/schemas/kits';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { KitsApi } from './kits-api';

/** Creates a kit type (name and description); closes with the new `KitType`. */
@Component({
  selector: 'app-kit-type-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    FieldErrorPipe,
  ],
  template: `
    <h2 mat-dialog-title>New kit type</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content class="form-stack">
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
        <p class="muted">Add its parts list afterwards by importing a CSV.</p>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="submitting()">Create</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitTypeDialog {
  private readonly api = inject(KitsApi);
  private readonly dialogRef = inject<MatDialogRef<KitTypeDialog, KitType>>(MatDialogRef);

  protected readonly form = new FormGroup({
    name: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(kitTypeCreateSchema.shape.name)],
    }),
    description: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(kitTypeCreateSchema.shape.description)],
    }),
  });
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.api.create(kitTypeCreateSchema.parse(this.form.getRawValue())).subscribe({
      next: (kit) => this.dialogRef.close(kit),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }
}
