import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import {
  ControlContainer,
  FormControl,
  ReactiveFormsModule,
  type AbstractControl,
  type ValidationErrors,
} from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { merge, switchMap } from 'rxjs';
import {
  plainText,
  requiredText,
  termSchema,
  yearLevelSchema,
} from '../../../shared/schemas/units';
import { FieldErrorPipe } from '../forms/field-error';
import { zodValidator } from '../forms/validators';
import { TERMS, YEAR_LEVELS, yearLabel } from './labels';

/** A unit's title, year level, learning area and term, as form controls. */
export interface UnitFieldControls {
  title: FormControl<string>;
  yearLevel: FormControl<number | null>;
  learningArea: FormControl<string>;
  term: FormControl<number | null>;
}

/**
 * The controls of a unit's main fields, validated as the server's zod schema; the new-unit form
 * and the unit editor spread them into their own FormGroup and show them with `<app-unit-fields>`.
 */
export function unitFieldControls(): UnitFieldControls {
  return {
    title: new FormControl('', {
      nonNullable: true,
      validators: zodValidator(requiredText('a title', 200)),
    }),
    yearLevel: new FormControl<number | null>(null, {
      validators: zodValidator(yearLevelSchema, 'Choose a year level.'),
    }),
    learningArea: new FormControl('', {
      nonNullable: true,
      validators: zodValidator(plainText(100)),
    }),
    term: new FormControl<number | null>(null, {
      validators: zodValidator(termSchema.nullable()),
    }),
  };
}

/**
 * The unit's main fields inside the page's own form, whose FormGroup holds `unitFieldControls()`
 * under their names (laid out as the page's grid or stack).
 */
@Component({
  selector: 'app-unit-fields',
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    <mat-form-field class="wide">
      <mat-label>Title</mat-label>
      <input matInput formControlName="title" required />
      <mat-error>{{ errorsOf(fields().title) | fieldError }}</mat-error>
    </mat-form-field>
    <mat-form-field>
      <mat-label>Year level</mat-label>
      <mat-select formControlName="yearLevel" required>
        @for (level of yearLevels; track level) {
          <mat-option [value]="level">{{ year(level) }}</mat-option>
        }
      </mat-select>
      <mat-error>{{ errorsOf(fields().yearLevel) | fieldError }}</mat-error>
    </mat-form-field>
    <mat-form-field>
      <mat-label>Learning area</mat-label>
      <input matInput formControlName="learningArea" />
      <mat-error>{{ errorsOf(fields().learningArea) | fieldError }}</mat-error>
    </mat-form-field>
    <mat-form-field>
      <mat-label>Term</mat-label>
      <mat-select formControlName="term">
        <mat-option [value]="null">No term</mat-option>
        @for (t of terms; track t) {
          <mat-option [value]="t">Term {{ t }}</mat-option>
        }
      </mat-select>
      <mat-error>{{ errorsOf(fields().term) | fieldError }}</mat-error>
    </mat-form-field>
  `,
  styles: `
    :host {
      display: contents;
    }
    .wide {
      grid-column: 1 / -1;
    }
  `,
  // The fields join the page's own form (its FormGroupDirective), as if written in its template.
  viewProviders: [
    { provide: ControlContainer, useFactory: () => inject(ControlContainer, { skipSelf: true }) },
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitFields {
  readonly fields = input.required<UnitFieldControls>();

  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly terms = TERMS;
  /** The last event of any field (e.g. the page marking all touched on submit). */
  private readonly changed = toSignal(
    toObservable(this.fields).pipe(
      switchMap((f) =>
        merge(f.title.events, f.yearLevel.events, f.learningArea.events, f.term.events),
      ),
    ),
  );

  /**
   * A field's errors; reading `changed` re-renders this OnPush view when the page's form changes
   * the fields (e.g. marks them all touched on submit).
   */
  protected errorsOf(control: AbstractControl): ValidationErrors | null {
    this.changed();
    return control.errors;
  }

  protected year(level: number): string {
    return yearLabel(level);
  }
}
