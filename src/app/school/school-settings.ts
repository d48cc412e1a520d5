import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  effect,
  inject,
  signal,
  untracked,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import {
  DEFAULT_PREP,
  PAPER_SIZES,
  schoolSettingsSchema,
  schoolSettingsUpdateSchema,
  timeZoneNames,
  type SchoolSettings,
} from '../../../shared/schemas/school';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { apiResource } from '../http/resource';
import { SchemaIssues, revalidate } from './schema-issues';
import { SchoolApi } from './school-api';
import {
  PREP_FIELDS,
  SettingsFormBuilder,
  changedParts,
  listInWords,
  reapply,
  settingsBody,
  toBody,
  type SettingsBody,
  type SettingsRaw,
} from './settings-model';
import type { HasUnsavedChanges } from '../forms/unsaved-changes';

/** A save the server refused because someone else saved first. */
interface StaleSave {
  /** The settings as saved now, or null when the answer did not carry them. */
  current: SchoolSettings | null;
  /** What the other person changed, in words. */
  changed: string;
  /** The body this person tried to save. */
  mine: SettingsBody;
}

/** At most this many zones are offered at once; typing narrows the list. */
const MAX_ZONE_OPTIONS = 80;

/** `/school`: the school's settings, calendar and prep allowances, saved all at once (admins). */
@Component({
  selector: 'app-school-settings',
  imports: [
    ReactiveFormsModule,
    MatAutocompleteModule,
    MatButtonModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatRadioModule,
    FieldErrorPipe,
  ],
  templateUrl: './school-settings.html',
  styleUrl: './school-settings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class SchoolSettingsPage implements HasUnsavedChanges {
  private readonly api = inject(SchoolApi);
  private readonly notifier = inject(Notifier);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  private readonly issues = new SchemaIssues(schoolSettingsUpdateSchema, (raw) => ({
    version: 1,
    ...toBody(raw as SettingsRaw),
  }));
  protected readonly build = new SettingsFormBuilder(this.issues.validator);
  protected readonly form = this.build.form();
  protected readonly prepFields = PREP_FIELDS;
  protected readonly defaults = DEFAULT_PREP;
  protected readonly paperSizes = PAPER_SIZES;

  /** The settings as saved; each answer (the first, or Try again) fills the form. */
  private readonly read = apiResource({ load: () => this.api.get() });
  protected readonly loading = this.read.loading;
  protected readonly loadFailed = this.read.error;
  protected readonly saving = signal(false);
  protected readonly message = signal<string | null>(null);
  protected readonly stale = signal<StaleSave | null>(null);
  protected readonly dirty = signal(false);

  /** The version the form was read at; PUT sends it back. */
  private version = 1;
  /** The saved settings the form started from, as a body, to tell what changed. */
  private baseline: SettingsBody | null = null;

  /** The server's zone names; the browser's own until they arrive (or if they do not). */
  private readonly zonesRead = apiResource({ load: () => this.api.timezones() });
  private readonly zones = computed<readonly string[]>(
    () => this.zonesRead.value() ?? timeZoneNames(),
  );
  private readonly zoneText = toSignal(this.form.controls.timezone.valueChanges, {
    initialValue: '',
  });
  /** Zones whose name has every typed word ("adel", "europe lon"); spaces match underscores. */
  protected readonly zoneOptions = computed(() => {
    const words = this.zoneText()
      .toLowerCase()
      .replace(/_/g, ' ')
      .split(/[\s/]+/)
      .filter(Boolean);
    const all = this.zones();
    if (words.length === 0 || all.includes(this.zoneText())) return all.slice(0, MAX_ZONE_OPTIONS);
    return all
      .filter((z) => {
        const name = z.toLowerCase().replace(/_/g, ' ');
        return words.every((w) => name.includes(w));
      })
      .slice(0, MAX_ZONE_OPTIONS);
  });

  constructor() {
    this.form.valueChanges.pipe(takeUntilDestroyed(inject(DestroyRef))).subscribe(() => {
      // One edit can settle or cause a problem elsewhere (an overlap, a date listed twice).
      revalidate(this.form);
      this.dirty.set(this.hasUnsavedChanges());
    });
    effect(() => {
      const saved = this.read.value();
      if (saved) untracked(() => this.apply(saved));
    });
  }

  /** Whether the form differs from what was loaded or last saved. */
  hasUnsavedChanges(): boolean {
    return this.baseline !== null && !sameJson(this.baseline, toBody(this.form.getRawValue()));
  }

  /** The browser's own "leave site?" question when the tab is closed with unsaved changes. */
  onBeforeUnload(event: BeforeUnloadEvent): void {
    if (this.hasUnsavedChanges()) event.preventDefault();
  }

  protected load(): void {
    this.read.reload();
  }

  protected save(): void {
    this.message.set(null);
    revalidate(this.form);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.message.set('Some fields need attention: each one says what to change.');
      this.focusFirstProblem();
      return;
    }
    const mine = toBody(this.form.getRawValue());
    this.saving.set(true);
    this.api.save({ version: this.version, ...mine }).subscribe({
      next: (s) => {
        this.saving.set(false);
        this.apply(s);
        this.notifier.info('The school settings are saved.');
      },
      error: (e: unknown) => {
        this.saving.set(false);
        this.failed(e, mine);
      },
    });
  }

  /** Drops this person's change and shows the settings as saved now. */
  protected reload(): void {
    const current = this.stale()?.current;
    this.stale.set(null);
    this.message.set(null);
    if (current) this.apply(current);
    else this.load();
  }

  /** Lays this person's change over the settings saved now and saves it on their version. */
  protected reapplyMine(): void {
    const refused = this.stale();
    if (!refused?.current || !this.baseline) return;
    const now = settingsBody(refused.current);
    const merged = reapply(this.baseline, refused.mine, now);
    this.stale.set(null);
    this.version = refused.current.version;
    this.baseline = now;
    this.build.fill(this.form, merged);
    this.save();
  }

  protected addTerm(): void {
    this.form.controls.terms.push(this.build.term());
  }
  protected addPeriod(): void {
    const periods = this.form.controls.periods;
    // A new period starts where the last one ends, which is the usual case.
    const last = periods.at(periods.length - 1)?.controls.endsAt.value ?? '';
    periods.push(this.build.period({ startsAt: last }));
  }
  protected addDay(): void {
    this.form.controls.nonTeachingDays.push(this.build.day());
  }
  protected removeTerm(i: number): void {
    this.form.controls.terms.removeAt(i);
  }
  protected removePeriod(i: number): void {
    this.form.controls.periods.removeAt(i);
  }
  protected removeDay(i: number): void {
    this.form.controls.nonTeachingDays.removeAt(i);
  }
  /** Moves a bell period up (-1) or down (+1) the list. */
  protected movePeriod(i: number, by: -1 | 1): void {
    const periods = this.form.controls.periods;
    const j = i + by;
    if (j < 0 || j >= periods.length) return;
    const row = periods.at(i);
    periods.removeAt(i, { emitEvent: false });
    periods.insert(j, row);
  }

  /** The label of a row for screen readers ("Term 2"). */
  protected rowLabel(kind: string, i: number): string {
    return `${kind} ${i + 1}`;
  }

  /** The default of an allowance in words ("Default: 5 minutes."). */
  protected defaultText(field: (typeof PREP_FIELDS)[number]): string {
    return `Default: ${this.defaults[field.key]} ${field.unit}.`;
  }

  private apply(s: SchoolSettings): void {
    this.version = s.version;
    this.baseline = settingsBody(s);
    this.issues.clearServer();
    this.build.fill(this.form, s);
    revalidate(this.form);
    this.form.markAsPristine();
    this.form.markAsUntouched();
    this.dirty.set(false);
  }

  private failed(e: unknown, mine: SettingsBody): void {
    if (!(e instanceof AppError)) {
      this.message.set(UNKNOWN_MESSAGE);
      return;
    }
    const conflict = staleConflict(e, schoolSettingsSchema);
    if (conflict) {
      const current = conflict.current;
      const parts =
        current && this.baseline ? changedParts(this.baseline, settingsBody(current)) : [];
      this.stale.set({ current, changed: listInWords(parts), mine });
      return;
    }
    if (e.details.length > 0) {
      const leftOver = this.issues.showServer(this.form, e.details);
      this.message.set(
        leftOver.length
          ? leftOver.join(' ')
          : 'Some fields need attention: each one says what to change.',
      );
      this.focusFirstProblem();
      return;
    }
    this.message.set(e.message);
  }

  private focusFirstProblem(): void {
    // After the view shows the messages, so the field is marked invalid for assistive technology.
    setTimeout(() => {
      const field = this.host.nativeElement.querySelector<HTMLElement>(
        'input.ng-invalid, mat-radio-group.ng-invalid input',
      );
      field?.focus();
    });
  }
}

function sameJson(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}
