import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { Router, RouterLink } from '@angular/router';
import { AppError } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { formErrorMessage } from '../forms/server-errors';
import { UnitFields, unitFieldControls } from './unit-fields';
import { UnitsApi } from './units-api';

/** `/units/new`: the unit editor's main fields (title, year level, learning area, term). */
@Component({
  selector: 'app-unit-new',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, UnitFields],
  template: `
    <section class="page page-narrow">
      <h1>New unit</h1>
      @if (formError(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
      <form class="form-stack" [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <app-unit-fields [fields]="fields" />
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

  protected readonly saving = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly fields = unitFieldControls();
  protected readonly form = new FormGroup(this.fields);

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
