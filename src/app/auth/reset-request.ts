import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { emailSchema } from '../../../shared/schemas/common';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { AuthApi } from './auth-api';
import { RESET_SENT_MESSAGE } from './messages';

/** `/reset`: asks for a reset link. The answer never tells whether the address has an account. */
@Component({
  selector: 'app-reset-request',
  imports: [
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    RouterLink,
    FieldErrorPipe,
  ],
  template: `
    <mat-card class="auth-card" appearance="outlined">
      <mat-card-content>
        <h1>Reset your password</h1>
        @if (sent()) {
          <p class="form-notice" role="status">{{ sentMessage }}</p>
          <p><a routerLink="/sign-in">Back to sign in</a></p>
        } @else {
          <p class="muted">
            Enter the e-mail address you sign in with. We'll send a link to set a new password.
          </p>
          @if (formError(); as message) {
            <p class="form-error" role="alert">{{ message }}</p>
          }
          <form class="form-stack" [formGroup]="form" (ngSubmit)="submit()" novalidate>
            <mat-form-field appearance="outline">
              <mat-label>E-mail</mat-label>
              <input matInput type="email" formControlName="email" autocomplete="email" required />
              <mat-error>{{ form.controls.email.errors | fieldError }}</mat-error>
            </mat-form-field>
            <div class="form-actions">
              <button matButton="filled" type="submit" [disabled]="submitting()">
                Send the link
              </button>
              <a routerLink="/sign-in">Back to sign in</a>
            </div>
          </form>
        }
      </mat-card-content>
    </mat-card>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetRequest {
  private readonly api = inject(AuthApi);

  protected readonly sentMessage = RESET_SENT_MESSAGE;
  protected readonly form = new FormGroup({
    email: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(emailSchema, 'Enter your e-mail address.')],
    }),
  });
  protected readonly submitting = signal(false);
  protected readonly sent = signal(false);
  protected readonly formError = signal<string | null>(null);

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.api.requestReset(this.form.controls.email.value).subscribe({
      next: () => this.sent.set(true),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }
}
