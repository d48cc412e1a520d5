import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AppError } from '../errors/app-error';
import { formErrorMessage, showFieldError } from '../forms/server-errors';
import { NEW_PASSWORD_WORDS, PasswordPair, passwordPair } from '../forms/password-pair';
import { AuthApi } from './auth-api';

/** Shown when a reset link was already used or has run out. */
export const RESET_LINK_INVALID_MESSAGE = 'This reset link has expired or has already been used.';

/** `/reset/:token`: sets a new password from the link in the reset e-mail. */
@Component({
  selector: 'app-reset-complete',
  imports: [
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    RouterLink,
    PasswordPair,
  ],
  templateUrl: './reset-complete.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetComplete {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);

  /** From the route. */
  readonly token = input.required<string>();

  protected readonly invalidMessage = RESET_LINK_INVALID_MESSAGE;
  protected readonly newPassword = passwordPair(NEW_PASSWORD_WORDS);
  protected readonly form = new FormGroup({
    password: this.newPassword.password,
    confirm: this.newPassword.confirm,
  });
  protected readonly submitting = signal(false);
  protected readonly linkInvalid = signal(false);
  protected readonly formError = signal<string | null>(null);

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    this.api.completeReset(this.token(), this.form.controls.password.value).subscribe({
      next: () =>
        void this.router.navigate(['/sign-in'], { queryParams: { notice: 'password-reset' } }),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        if (error.code === 'token-invalid' || error.details.some((d) => d.path === 'token')) {
          this.linkInvalid.set(true);
        } else if (error.code === 'password-common' && error.details.length === 0) {
          showFieldError(this.form, 'password', error.message);
        } else {
          this.formError.set(formErrorMessage(this.form, error));
        }
      },
    });
  }
}
