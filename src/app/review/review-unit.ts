import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  computed,
  inject,
  input,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import type { LessonPrepSummary } from '../../../shared/schemas/review';
import { UNIT_STATUS_LABELS } from '../../../shared/schemas/units';
import { apiResource } from '../http/resource';
import { dayLabel } from '../lessons/clock';
import { yearLabel } from '../units/labels';
import { ReviewApi } from './review-api';
import { ReviewPanel } from './review-panel';

/**
 * `/review/units/:id`: a unit as its reviewer needs it — overview, outcomes, each lesson's prep
 * (groups, shortfalls, pack-away) — beside the comments and the decision buttons.
 */
@Component({
  selector: 'app-review-unit',
  imports: [
    RouterLink,
    MarkdownComponent,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ReviewPanel,
  ],
  template: `
    <section class="page">
      <p><a routerLink="/review">Review queue</a></p>
      @if (!data() && !error()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the unit" />
      }
      @if (error(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
      @if (data(); as d) {
        <h1>{{ d.unit.title }}</h1>
        <p class="muted">
          {{ year(d.unit.yearLevel) }}
          @if (d.unit.term) {
            · Term {{ d.unit.term }}
          }
          @if (d.unit.learningArea) {
            · {{ d.unit.learningArea }}
          }
          · {{ statusLabels[d.unit.status] }} · by {{ d.unit.owner.name || d.unit.owner.email }}
        </p>
        <!-- On a narrow screen the decision comes after the whole unit: a way straight there. -->
        <button matButton type="button" class="jump" (click)="toDecision()">
          Go to comments and {{ d.actions.length ? 'the decision' : 'the status' }}
        </button>
        <div class="columns">
          <div class="main">
            <h2>Overview</h2>
            @if (d.unit.overview.trim()) {
              <markdown [data]="d.unit.overview" />
            } @else {
              <p class="muted">No overview.</p>
            }
            <h2>Outcomes</h2>
            @if (d.unit.outcomes.length) {
              <ul>
                @for (o of d.unit.outcomes; track o.id) {
                  <li>
                    <strong>{{ o.code }}</strong> {{ o.description }}
                  </li>
                }
              </ul>
            } @else {
              <p class="muted">No outcomes chosen.</p>
            }
            <h2>Lessons and their prep</h2>
            @if (d.lessons.length) {
              <ol class="lessons">
                @for (l of d.lessons; track l.id) {
                  <li>
                    <h3>{{ l.title }}</h3>
                    <p class="muted">{{ day(l.date) }} · {{ l.className }}</p>
                    @if (l.problems.length) {
                      <p><mat-icon aria-hidden="true">warning</mat-icon> Cannot be planned yet:</p>
                      <ul>
                        @for (p of l.problems; track $index) {
                          <li>{{ p }}</li>
                        }
                      </ul>
                    } @else {
                      <p>
                        {{ l.groups }} groups · planned {{ l.plannedMinutes }} of
                        {{ l.windowMinutes }} minutes · pack-away {{ l.packAwayMinutes }} minutes
                      </p>
                      <p>{{ shortfalls(l) }}</p>
                    }
                  </li>
                }
              </ol>
            } @else {
              <p class="muted">No lessons yet.</p>
            }
          </div>
          <app-review-panel
            class="side"
            [unit]="d.unit"
            [actions]="d.actions"
            (changed)="reload()"
          />
        </div>
      }
    </section>
  `,
  styles: `
    .columns {
      display: grid;
      grid-template-columns: minmax(0, 3fr) minmax(16rem, 2fr);
      gap: 1.5rem;
    }
    @media (max-width: 900px) {
      .columns {
        grid-template-columns: 1fr;
      }
    }
    .lessons h3 {
      margin: 0.75rem 0 0;
    }
    .lessons p {
      margin: 0.25rem 0;
    }
    mat-icon {
      vertical-align: middle;
    }
    .jump {
      display: none;
    }
    @media (max-width: 900px) {
      .jump {
        display: inline-flex;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewUnitPage {
  private readonly api = inject(ReviewApi);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  /** Route parameter `:id`. */
  readonly id = input.required<string>();

  protected readonly statusLabels = UNIT_STATUS_LABELS;
  private readonly read = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.unit(id),
  });
  protected readonly data = computed(() => this.read.value() ?? null);
  protected readonly error = this.read.error;

  /** After a step the buttons change with the status: read the unit again. */
  protected reload(): void {
    this.read.reload();
  }

  protected toDecision(): void {
    const heading = this.host.nativeElement.querySelector<HTMLElement>('#review-heading');
    heading?.scrollIntoView({ block: 'start' });
    heading?.focus({ preventScroll: true });
  }

  protected year(level: number): string {
    return yearLabel(level);
  }

  protected day(date: string): string {
    return dayLabel(`${date}T00:00`, false);
  }

  protected shortfalls(l: LessonPrepSummary): string {
    if (l.shortfalls.length === 0) return 'No shortfalls: every group’s parts are in the tubs.';
    return `Short: ${l.shortfalls.map((s) => `${s.missing} × ${s.name}`).join(', ')}.`;
  }
}
