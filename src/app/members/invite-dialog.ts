import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import {
  ROLES,
  ROLE_LABELS,
  emailSchema,
  roleSchema,
  type Role,
} from '../../../shared/schemas/common';
import type { Member } from '../../../shared/schemas/members';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage, showFieldError } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { MembersApi } from './members-api';

/** Shown under the e-mail field for a 409 `already-member`. */
export const EMAIL_TAKEN_MESSAGE = 'Someone at this school already has that e-mail address.';

/** Invites a new member by e-mail; closes with the invited `Member`. */
@Component({
  selector: 'app-invite-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    <h2 mat-dialog-title>Invite a member</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content class="form-stack">
        <p class="muted">They get an e-mail with a link to set their name and password.</p>
        @if (formError(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        }
        <mat-form-field appearance="outline">
          <mat-label>E-mail</mat-label>
          <input matInput type="email" formControlName="email" autocomplete="off" required />
          <mat-error>{{ form.controls.email.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Role</mat-label>
          <mat-select formControlName="role" required>
            @for (role of roles; track role) {
              <mat-option [value]="role">{{ roleLabels[role] }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ form.controls.role.errors | fieldError }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="submitting()">Send invitation</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InviteDialog {
  private readonly api = inject(MembersApi);
  private readonly dialogRef = inject<MatDialogRef<InviteDialog, Member>>(MatDialogRef);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly form = new FormGroup({
    email: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(emailSchema, 'Enter their e-mail address.')],
    }),
    role: new FormControl<Role>('teacher', {
      nonNullable: true,
      validators: [zodValidator(roleSchema, 'Choose a role.')],
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
    const { email, role } = this.form.getRawValue();
    this.api.invite({ email: emailSchema.parse(email), role }).subscribe({
      next: (member) => this.dialogRef.close(member),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        if (error.code === 'already-member') {
          showFieldError(this.form, 'email', EMAIL_TAKEN_MESSAGE);
        } else {
          this.formError.set(formErrorMessage(this.form, error));
        }
      },
    });
  }
}
