import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
  untracked,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule, type FormControl } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { combineLatest, debounceTime } from 'rxjs';
import type { Framework, Outcome } from '../../../shared/schemas/outcomes';
import type { UnitOutcome } from '../../../shared/schemas/units';
import { FieldErrorPipe } from '../forms/field-error';
import { apiResource } from '../http/resource';
import { UnitsApi } from './units-api';

/** One page of a framework's outcomes matching the words. */
interface SearchAnswer {
  outcomes: Outcome[];
  truncated: boolean;
}

/**
 * Outcomes picked from a framework: choose the framework, search its outcomes by code or words,
 * pick from the suggestions; the chosen ones show as chips that can be removed.
 */
@Component({
  selector: 'app-outcome-picker',
  imports: [
    ReactiveFormsModule,
    MatAutocompleteModule,
    MatChipsModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    <div class="picker">
      <mat-form-field class="framework">
        <mat-label>Framework</mat-label>
        <mat-select [value]="frameworkId()" (selectionChange)="frameworkId.set($event.value)">
          @for (f of frameworks(); track f.id) {
            <mat-option [value]="f.id">{{ f.name }}</mat-option>
          }
        </mat-select>
        @if (!frameworks().length) {
          <mat-hint>No outcomes framework is imported yet.</mat-hint>
        }
      </mat-form-field>
      <mat-form-field class="outcomes">
        <mat-label>Outcomes</mat-label>
        <mat-chip-grid #grid [formControl]="control()" aria-label="Chosen outcomes">
          @for (o of control().value; track o.id) {
            <mat-chip-row [value]="o" (removed)="remove(o)">
              {{ o.code }}
              <button matChipRemove type="button" [attr.aria-label]="'Remove ' + o.code">
                <mat-icon aria-hidden="true">cancel</mat-icon>
              </button>
            </mat-chip-row>
          }
        </mat-chip-grid>
        <input
          #search
          placeholder="Search by code or words"
          [matChipInputFor]="grid"
          [matAutocomplete]="auto"
          [disabled]="!frameworkId()"
          (input)="q.set(search.value)"
        />
        <mat-autocomplete
          #auto
          (optionSelected)="add($event.option.value); search.value = ''; q.set('')"
        >
          @for (o of options(); track o.id) {
            <mat-option [value]="o" [disabled]="isChosen(o)">
              <strong>{{ o.code }}</strong> {{ o.description }}
            </mat-option>
          }
          @if (truncated()) {
            <mat-option disabled>More outcomes match: type more words.</mat-option>
          }
        </mat-autocomplete>
        <mat-hint>Pick as many as the unit addresses.</mat-hint>
        <mat-error>{{ control().errors | fieldError }}</mat-error>
      </mat-form-field>
    </div>
  `,
  styles: `
    .picker {
      display: flex;
      flex-wrap: wrap;
      gap: 0 1rem;
    }
    .framework {
      width: min(100%, 16rem);
    }
    .outcomes {
      flex: 1 1 20rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutcomePicker {
  private readonly api = inject(UnitsApi);

  /** The form's control holding the chosen outcomes. */
  readonly control = input.required<FormControl<UnitOutcome[]>>();

  /** Errors are the interceptor's to show; the picker then offers nothing. */
  private readonly frameworksRead = apiResource({ load: () => this.api.frameworks() });
  protected readonly frameworks = computed<readonly Framework[]>(
    () => this.frameworksRead.value() ?? [],
  );
  /** The framework of the unit's first outcome, else the first; then the one picked. */
  protected readonly frameworkId = linkedSignal<readonly Framework[], string | null>({
    source: this.frameworks,
    computation: (list) => {
      const used = untracked(() => this.control().value[0]?.frameworkId);
      return list.find((f) => f.id === used)?.id ?? list[0]?.id ?? null;
    },
  });
  protected readonly q = signal('');
  /** The framework and words once typing pauses. */
  private readonly asked = toSignal(
    combineLatest([toObservable(this.frameworkId), toObservable(this.q)]).pipe(debounceTime(200)),
  );
  private readonly query = computed(
    () => {
      const [frameworkId, q] = this.asked() ?? [null, ''];
      return frameworkId ? { frameworkId, q } : undefined;
    },
    { equal: (a, b) => a?.frameworkId === b?.frameworkId && a?.q === b?.q },
  );
  /** Only the answer to the latest words counts (a newer search drops an older one). */
  private readonly search = apiResource({
    params: () => this.query(),
    load: ({ frameworkId, q }: { frameworkId: string; q: string }) =>
      this.api.outcomes(frameworkId, q),
  });
  /** The last answer, kept while the next search loads, so the open list does not close. */
  private readonly answer = linkedSignal<
    { value: SearchAnswer | undefined; loading: boolean },
    SearchAnswer | undefined
  >({
    source: () => ({ value: this.search.value(), loading: this.search.loading() }),
    computation: ({ value, loading }, previous) => value ?? (loading ? previous?.value : undefined),
  });
  protected readonly options = computed<readonly Outcome[]>(() => this.answer()?.outcomes ?? []);
  protected readonly truncated = computed(() => this.answer()?.truncated ?? false);

  protected isChosen(o: Outcome): boolean {
    return this.control().value.some((c) => c.id === o.id);
  }

  protected add(o: Outcome): void {
    if (this.isChosen(o)) return;
    this.set([...this.control().value, o]);
  }

  protected remove(o: UnitOutcome): void {
    this.set(this.control().value.filter((c) => c.id !== o.id));
  }

  private set(value: UnitOutcome[]): void {
    const control = this.control();
    control.setValue(value);
    control.markAsDirty();
    control.markAsTouched();
  }
}
