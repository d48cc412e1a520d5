import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import {
  LEAD_MINUTE_CHOICES,
  reminderPreferencesSchema,
  reminderPreferencesUpdateSchema,
  type ReminderPreferences,
} from '../../../shared/schemas/reminders';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { AccountApi } from './account-api';

/** Said when a save meets a newer version (another tab or window saved first). */
export const REMINDERS_CHANGED =
  'Your reminders were changed in another window since this page opened. They now show what ' +
  'was saved there: choose again and save.';

/**
 * The account page's reminder e-mails, each off until turned on: "start charging … by …" a
 * chosen lead time before each charge task of the person's lessons, and a morning summary of
 * the day's prep at a chosen time on the school's clock. Saved with the version read.
 */
@Component({
  selector: 'app-reminder-settings',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatSlideToggleModule,
    FieldErrorPipe,
  ],
  templateUrl: './reminder-settings.html',
  styles: `
    mat-slide-toggle {
      display: block;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReminderSettings {
  private readonly api = inject(AccountApi);
  private readonly notifier = inject(Notifier);

  protected readonly read = apiResource({ load: () => this.api.reminders() });
  protected readonly leadChoices = LEAD_MINUTE_CHOICES;
  protected readonly saving = signal(false);
  protected readonly conflict = signal<string | null>(null);

  protected readonly form = new FormGroup({
    chargeReminders: new FormControl(false, { nonNullable: true }),
    leadMinutes: new FormControl(30, {
      nonNullable: true,
      validators: [zodValidator(reminderPreferencesUpdateSchema.shape.leadMinutes)],
    }),
    morningSummary: new FormControl(false, { nonNullable: true }),
    summaryTime: new FormControl('07:00', {
      nonNullable: true,
      validators: [zodValidator(reminderPreferencesUpdateSchema.shape.summaryTime)],
    }),
  });

  constructor() {
    // The form shows what the server holds, after the read and after each save.
    effect(() => {
      const saved = this.read.value();
      if (saved) this.show(saved);
    });
  }

  protected save(): void {
    const saved = this.read.value();
    if (!saved || this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    this.conflict.set(null);
    this.api.saveReminders({ version: saved.version, ...this.form.getRawValue() }).subscribe({
      next: (current) => {
        this.saving.set(false);
        this.read.set(current);
        this.notifier.info('Reminders saved.');
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const stale = staleConflict(error, reminderPreferencesSchema);
        if (stale) {
          this.conflict.set(REMINDERS_CHANGED);
          if (stale.current) this.read.set(stale.current);
          else this.read.reload();
        } else if (error instanceof AppError) this.notifier.error(error.message);
        else this.notifier.errorNotShownYet(error);
      },
    });
  }

  private show(saved: ReminderPreferences): void {
    const { version: _version, ...values } = saved;
    this.form.reset(values);
  }
}
