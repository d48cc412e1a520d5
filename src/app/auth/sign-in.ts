import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { signInSchema } from '../../../shared/schemas/auth';
import { emailSchema } from '../../../shared/schemas/common';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { SIGN_IN_NOTICES, signInFailureMessage } from './messages';
import { safeReturnUrl } from './return-url';
import { Session } from './session';

/** `/sign-in`: e-mail and password; goes back to where the user was heading. */
@Component({
  selector: 'app-sign-in',
  imports: [
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    RouterLink,
    FieldErrorPipe,
  ],
  templateUrl: './sign-in.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly query = toSignal(inject(ActivatedRoute).queryParamMap, { requireSync: true });

  protected readonly form = new FormGroup({
    email: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(emailSchema, 'Enter your e-mail address.')],
    }),
    password: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(signInSchema.shape.password)],
    }),
  });
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly notice = computed(
    () => SIGN_IN_NOTICES[this.query().get('notice') ?? ''] ?? null,
  );

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    const returnUrl = safeReturnUrl(this.query().get('returnUrl'));
    // The shared schema trims and lower-cases the address, as the server does.
    this.session.signIn(signInSchema.parse(this.form.getRawValue())).subscribe({
      next: () => void this.router.navigateByUrl(returnUrl),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        this.formError.set(formErrorMessage(this.form, error, signInFailureMessage));
      },
    });
  }
}
