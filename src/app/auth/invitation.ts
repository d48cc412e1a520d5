import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';
import { catchError, map, of, throwError, type Observable } from 'rxjs';
import type { InvitationInfo } from '../../../shared/schemas/auth';
import { ROLE_LABELS, personNameSchema } from '../../../shared/schemas/common';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage, showFieldError } from '../forms/server-errors';
import { FIRST_PASSWORD_WORDS, PasswordPair, passwordPair } from '../forms/password-pair';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { AuthApi } from './auth-api';
import { Session } from './session';

/** Shown for an invitation that has run out or was already accepted. */
export const INVITATION_INVALID_MESSAGE =
  'This invitation has expired or has already been used. Ask your school admin to send a new one.';

/** What the invitation's read found: one to accept, or one that cannot be used any more. */
type Found = { state: 'ready'; info: InvitationInfo } | { state: 'invalid' };

type Load = Found | { state: 'loading' } | { state: 'failed'; message: string };

/** `/invitation/:token`: a new member sets their name and password and is signed in. */
@Component({
  selector: 'app-invitation',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatProgressBarModule,
    FieldErrorPipe,
    PasswordPair,
  ],
  templateUrl: './invitation.html',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Invitation {
  private readonly api = inject(AuthApi);
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  /** From the route. */
  readonly token = input.required<string>();

  protected readonly roleLabels = ROLE_LABELS;
  protected readonly invalidMessage = INVITATION_INVALID_MESSAGE;
  /** The invitation, read again if the route's token changes. */
  private readonly read = apiResource({
    params: () => this.token(),
    load: (token: string) => found(this.api.invitation(token)),
  });
  protected readonly load = computed<Load>(() => {
    const error = this.read.error();
    if (error) return { state: 'failed', message: error };
    return this.read.value() ?? { state: 'loading' };
  });
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly firstPassword = passwordPair(FIRST_PASSWORD_WORDS);
  protected readonly form = new FormGroup({
    name: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(personNameSchema, 'Enter your name as colleagues know it.')],
    }),
    password: this.firstPassword.password,
    confirm: this.firstPassword.confirm,
  });

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.submitting.set(true);
    const { name, password } = this.form.getRawValue();
    this.session.acceptInvitation(this.token(), { name, password }).subscribe({
      next: () => void this.router.navigateByUrl('/'),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        if (isInvalid(error)) {
          this.read.set({ state: 'invalid' });
        } else if (error.code === 'password-common' && error.details.length === 0) {
          showFieldError(this.form, 'password', error.message);
        } else {
          this.formError.set(formErrorMessage(this.form, error));
        }
      },
    });
  }
}

/** An expired, used or unknown invitation is an answer the page shows, not a failed load. */
function found(info: Observable<InvitationInfo>): Observable<Found> {
  return info.pipe(
    map((info): Found => ({ state: 'ready', info })),
    catchError((error: unknown) =>
      isInvalid(error) ? of<Found>({ state: 'invalid' }) : throwError(() => error),
    ),
  );
}

function isInvalid(error: unknown): boolean {
  return error instanceof AppError && (error.status === 404 || error.code === 'invitation-invalid');
}
