import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import {
  plainText,
  requiredText,
  termSchema,
  yearLevelSchema,
} from '../../../shared/schemas/units';
import { AppError } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { TERMS, YEAR_LEVELS, yearLabel } from './labels';
import { UnitsApi } from './units-api';

/** `/units/new`: title, year level, learning area and term, then the new unit's page. */
@Component({
  selector: 'app-unit-new',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    <section class="page page-narrow">
      <h1>New unit</h1>
      @if (formError(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
      <form class="form-stack" [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <mat-form-field>
          <mat-label>Title</mat-label>
          <input matInput formControlName="title" required />
          <mat-error>{{ form.controls.title.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Year level</mat-label>
          <mat-select formControlName="yearLevel" required>
            @for (level of yearLevels; track level) {
              <mat-option [value]="level">{{ year(level) }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ form.controls.yearLevel.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Learning area</mat-label>
          <input matInput formControlName="learningArea" />
          <mat-error>{{ form.controls.learningArea.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Term</mat-label>
          <mat-select formControlName="term">
            <mat-option [value]="null">No term</mat-option>
            @for (t of terms; track t) {
              <mat-option [value]="t">Term {{ t }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ form.controls.term.errors | fieldError }}</mat-error>
        </mat-form-field>
        <div class="form-actions">
          <button matButton="filled" type="submit" [disabled]="saving()">Create unit</button>
          <a matButton routerLink="/units">Cancel</a>
        </div>
      </form>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitNew {
  private readonly api = inject(UnitsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly terms = TERMS;
  protected readonly saving = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    title: ['', zodValidator(requiredText('a title', 200))],
    yearLevel: [null as number | null, zodValidator(yearLevelSchema, 'Choose a year level.')],
    learningArea: ['', zodValidator(plainText(100))],
    term: [null as number | null, zodValidator(termSchema.nullable())],
  });

  protected year(level: number): string {
    return yearLabel(level);
  }

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.saving.set(true);
    this.api
      .create({
        title: v.title.trim(),
        yearLevel: v.yearLevel!,
        learningArea: v.learningArea.trim(),
        term: v.term,
      })
      .subscribe({
        next: (unit) => {
          this.notifier.info(`“${unit.title}” is created.`);
          void this.router.navigate(['/units', unit.id]);
        },
        error: (error: unknown) => {
          this.saving.set(false);
          if (error instanceof AppError) this.formError.set(formErrorMessage(this.form, error));
        },
      });
  }
}
