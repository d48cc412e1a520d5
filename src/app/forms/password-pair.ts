import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import {
  FormControl,
  ReactiveFormsModule,
  type AbstractControl,
  type ValidationErrors,
  type ValidatorFn,
} from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { PASSWORD_MIN, newPasswordSchema } from '../../../shared/schemas/auth';
import { FieldErrorPipe } from './field-error';
import { zodValidator } from './validators';
import { merge, switchMap } from 'rxjs';

/** The words of a password pair: its two labels and what an empty field says. */
export interface PasswordWords {
  label: string;
  againLabel: string;
  empty: string;
  againEmpty: string;
}

/** Changing one's password (account) or choosing a new one (reset link). */
export const NEW_PASSWORD_WORDS: PasswordWords = {
  label: 'New password',
  againLabel: 'New password again',
  empty: 'Enter a new password.',
  againEmpty: 'Enter the new password again.',
};

/** A new member's first password (invitation). */
export const FIRST_PASSWORD_WORDS: PasswordWords = {
  label: 'Password',
  againLabel: 'Password again',
  empty: 'Choose a password.',
  againEmpty: 'Enter the password again.',
};

/** Shown under the second field when the two differ. */
export const PASSWORDS_DIFFER_MESSAGE = "The two passwords don't match.";

/** A password and its confirmation: two controls for the page's form, and their words. */
export interface PasswordPairControls {
  readonly password: FormControl<string>;
  readonly confirm: FormControl<string>;
  readonly words: PasswordWords;
}

/**
 * The controls of a password pair, validated by the shared schema; the confirmation is checked
 * again whenever the first password changes. Put both into the page's FormGroup (under any
 * names) and show them with `<app-password-pair [pair]="…" />`.
 */
export function passwordPair(words: PasswordWords): PasswordPairControls {
  const password = new FormControl('', {
    nonNullable: true,
    validators: [zodValidator(newPasswordSchema, words.empty)],
  });
  const same: ValidatorFn = (control) =>
    control.value === '' || control.value === password.value
      ? null
      : { mismatch: PASSWORDS_DIFFER_MESSAGE };
  const confirm = new FormControl('', {
    nonNullable: true,
    validators: [zodValidator(newPasswordSchema, words.againEmpty), same],
  });
  // Both controls live and go together, so this subscription ends with them.
  password.valueChanges.subscribe(() => confirm.updateValueAndValidity());
  return { password, confirm, words };
}

/** The two fields of a password pair, inside the page's own form. */
@Component({
  selector: 'app-password-pair',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, FieldErrorPipe],
  template: `
    <mat-form-field appearance="outline">
      <mat-label>{{ pair().words.label }}</mat-label>
      <input
        matInput
        type="password"
        [formControl]="pair().password"
        autocomplete="new-password"
        required
      />
      <mat-hint>At least {{ minLength }} characters. A short sentence works well.</mat-hint>
      <mat-error>{{ errorsOf(pair().password) | fieldError }}</mat-error>
    </mat-form-field>
    <mat-form-field appearance="outline">
      <mat-label>{{ pair().words.againLabel }}</mat-label>
      <input
        matInput
        type="password"
        [formControl]="pair().confirm"
        autocomplete="new-password"
        required
      />
      <mat-error>{{ errorsOf(pair().confirm) | fieldError }}</mat-error>
    </mat-form-field>
  `,
  styles: `
    :host {
      display: contents;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PasswordPair {
  readonly pair = input.required<PasswordPairControls>();
  protected readonly minLength = PASSWORD_MIN;
  /** The last touched/status/value event of either field (e.g. the page marking all touched). */
  private readonly changed = toSignal(
    toObservable(this.pair).pipe(switchMap((p) => merge(p.password.events, p.confirm.events))),
  );

  /**
   * A field's errors; reading `changed` re-renders this OnPush view when the page's form changes
   * the fields (e.g. marks them all touched on submit).
   */
  protected errorsOf(control: AbstractControl): ValidationErrors | null {
    this.changed();
    return control.errors;
  }
}
