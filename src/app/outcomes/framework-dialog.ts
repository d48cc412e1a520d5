import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatInputModule } from '@angular/material/input';
import { frameworkCreateSchema, type Framework } from '../../../shared/schemas/outcomes';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { OutcomesApi } from './outcomes-api';

/** Creates an outcomes framework by name; closes with the new `Framework`. */
@Component({
  selector: 'app-framework-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatInputModule, FieldErrorPipe],
  template: `
    <h2 mat-dialog-title>New outcomes framework</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content class="form-stack">
        <p class="muted">
          A framework holds the outcomes units are planned against. Import its outcomes from a CSV
          file next.
        </p>
        @if (formError(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        }
        <mat-form-field appearance="outline">
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" autocomplete="off" required />
          <mat-error>{{ form.controls.name.errors | fieldError }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="submitting()">Create</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameworkDialog {
  private readonly api = inject(OutcomesApi);
  private readonly dialogRef = inject<MatDialogRef<FrameworkDialog, Framework>>(MatDialogRef);

  protected readonly form = new FormGroup({
    name: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(frameworkCreateSchema.shape.name, 'Enter a name.')],
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
    this.api.createFramework(this.form.getRawValue().name.trim()).subscribe({
      next: (framework) => this.dialogRef.close(framework),
      error: (error: unknown) => {
        this.submitting.set(false);
        // A 409 name-taken carries a detail for `name`, shown under the field.
        this.formError.set(
          error instanceof AppError ? formErrorMessage(this.form, error) : UNKNOWN_MESSAGE,
        );
      },
    });
  }
}
