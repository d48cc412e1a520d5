import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import { UNIT_STATUS_LABELS, type Unit } from '../../../shared/schemas/units';
import { clockTime, dayLabel } from '../lessons/clock';
import { yearLabel } from './labels';
import { UnitsApi } from './units-api';

/**
 * `/units/:id`: a unit's overview (Markdown, sanitised by ngx-markdown's default Angular
 * sanitiser), its outcomes and its lessons in order.
 */
@Component({
  selector: 'app-unit-detail',
  imports: [RouterLink, MarkdownComponent, MatProgressBarModule],
  template: `
    <section class="page">
      @if (!unit() && !error()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the unit" />
      }
      @if (error(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
      @if (unit(); as unit) {
        <p><a routerLink="/units">Units</a></p>
        <h1>{{ unit.title }}</h1>
        <p class="muted">
          {{ year(unit.yearLevel) }}
          @if (unit.learningArea) {
            · {{ unit.learningArea }}
          }
          @if (unit.term) {
            · Term {{ unit.term }}
          }
          · {{ statusLabels[unit.status] }} · by {{ unit.owner.name || unit.owner.email }}
        </p>

        <h2>Overview</h2>
        @if (unit.overview.trim()) {
          <markdown class="overview" [data]="unit.overview" />
        } @else {
          <p class="muted">No overview yet.</p>
        }

        <h2>Outcomes</h2>
        @if (unit.outcomes.length) {
          <ul>
            @for (o of unit.outcomes; track o.id) {
              <li><strong>{{ o.code }}</strong> {{ o.description }}</li>
            }
          </ul>
        } @else {
          <p class="muted">No outcomes chosen yet.</p>
        }

        <h2>Lessons</h2>
        @if (unit.lessons.length) {
          <ol class="lessons">
            @for (l of unit.lessons; track l.id) {
              <li>
                <a [routerLink]="['/lessons', l.id]">{{ l.title }}</a>
                <span class="muted">
                  {{ day(l.startsAt) }}, {{ clock(l.startsAt) }}–{{ clock(l.endsAt) }} ·
                  {{ l.className }}
                </span>
              </li>
            }
          </ol>
        } @else {
          <p class="muted">No lessons yet.</p>
        }
      }
    </section>
  `,
  styles: `
    .lessons li {
      margin-bottom: 0.25rem;
    }
    .lessons .muted {
      margin-inline-start: 0.5rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitDetail {
  private readonly api = inject(UnitsApi);

  /** Route parameter `:id`. */
  readonly id = input.required<string>();

  protected readonly statusLabels = UNIT_STATUS_LABELS;
  protected readonly unit = signal<Unit | null>(null);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const id = this.id();
      this.unit.set(null);
      this.error.set(null);
      this.api.get(id).subscribe({
        next: (unit) => this.unit.set(unit),
        error: (e: unknown) => this.error.set(e instanceof Error ? e.message : 'Not loaded.'),
      });
    });
  }

  protected year(level: number): string {
    return yearLabel(level);
  }

  protected day(value: string): string {
    return dayLabel(value);
  }

  protected clock(value: string): string {
    return clockTime(value);
  }
}
