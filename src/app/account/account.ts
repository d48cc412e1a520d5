import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  signal,
  untracked,
} from '@angular/core';
import { FormControl, FormGroup, FormGroupDirective, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { passwordChangeSchema } from '../../../shared/schemas/auth';
import { ROLE_LABELS, personNameSchema } from '../../../shared/schemas/common';
import { Session } from '../auth/session';
import { AppError } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage, showFieldError } from '../forms/server-errors';
import { NEW_PASSWORD_WORDS, PasswordPair, passwordPair } from '../forms/password-pair';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { AccountApi } from './account-api';
import { CalendarFeed } from './calendar-feed';
import { ReminderSettings } from './reminder-settings';

/** Shown under "Current password" when it is wrong. */
export const WRONG_PASSWORD_MESSAGE = "That isn't your current password.";

/** `/account`: the user's name and password, their reminder e-mails and calendar feed. */
@Component({
  selector: 'app-account',
  imports: [
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    FieldErrorPipe,
    PasswordPair,
    CalendarFeed,
    ReminderSettings,
  ],
  templateUrl: './account.html',
  styleUrl: './account.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Account {
  private readonly api = inject(AccountApi);
  private readonly session = inject(Session);
  private readonly notifier = inject(Notifier);

  protected readonly user = this.session.user;
  protected readonly roleLabels = ROLE_LABELS;

  protected readonly nameForm = new FormGroup({
    name: new FormControl(this.session.user()?.name ?? '', {
      nonNullable: true,
      validators: [zodValidator(personNameSchema, 'Enter your name.')],
    }),
  });
  protected readonly savingName = signal(false);
  protected readonly nameError = signal<string | null>(null);

  protected readonly newPassword = passwordPair(NEW_PASSWORD_WORDS);
  protected readonly passwordForm = new FormGroup({
    currentPassword: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(passwordChangeSchema.shape.currentPassword)],
    }),
    newPassword: this.newPassword.password,
    confirm: this.newPassword.confirm,
  });
  protected readonly savingPassword = signal(false);
  protected readonly passwordError = signal<string | null>(null);

  /** The account as the server has it now (the session's copy may be hours old). */
  private readonly read = apiResource({ load: () => this.api.get() });

  constructor() {
    effect(() => {
      const user = this.read.value();
      if (!user) return;
      untracked(() => {
        this.session.update(user);
        // A name the user has started typing is theirs; only an untouched field follows.
        if (this.nameForm.pristine) this.nameForm.setValue({ name: user.name });
      });
    });
  }

  protected saveName(): void {
    this.nameError.set(null);
    if (this.nameForm.invalid) {
      this.nameForm.markAllAsTouched();
      return;
    }
    this.savingName.set(true);
    this.api.rename(this.nameForm.controls.name.value).subscribe({
      next: (user) => {
        this.savingName.set(false);
        this.session.update(user);
        this.nameForm.reset({ name: user.name });
        this.notifier.info('Your name is saved.');
      },
      error: (error: unknown) => {
        this.savingName.set(false);
        if (!(error instanceof AppError)) throw error;
        this.nameError.set(formErrorMessage(this.nameForm, error));
      },
    });
  }

  protected changePassword(directive: FormGroupDirective): void {
    this.passwordError.set(null);
    if (this.passwordForm.invalid) {
      this.passwordForm.markAllAsTouched();
      return;
    }
    this.savingPassword.set(true);
    const { currentPassword, newPassword } = this.passwordForm.getRawValue();
    this.api.changePassword(currentPassword, newPassword).subscribe({
      next: () => {
        this.savingPassword.set(false);
        // resetForm also clears the "submitted" state, so the empty fields show no errors.
        directive.resetForm();
        this.notifier.info('Your password is changed.');
      },
      error: (error: unknown) => {
        this.savingPassword.set(false);
        if (!(error instanceof AppError)) throw error;
        if (error.code === 'wrong-password') {
          showFieldError(this.passwordForm, 'currentPassword', WRONG_PASSWORD_MESSAGE);
        } else if (error.code === 'password-common' && error.details.length === 0) {
          showFieldError(this.passwordForm, 'newPassword', error.message);
        } else {
          this.passwordError.set(
            formErrorMessage(this.passwordForm, error, undefined, { password: 'newPassword' }),
          );
        }
      },
    });
  }
}
