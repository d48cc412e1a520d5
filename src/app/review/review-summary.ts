import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import type { ReviewSummary } from '../../../shared/schemas/review';
import { yearLabel } from '../units/labels';
import { ReviewApi } from './review-api';

/**
 * The lead's (and admin's) part of Home: how many units wait for review, the oldest of them, and
 * how many outcomes of each framework no unit of the current term covers.
 */
@Component({
  selector: 'app-review-summary',
  imports: [RouterLink, MatButtonModule],
  template: `
    <section class="summary" aria-labelledby="review-summary-heading">
      <h2 id="review-summary-heading">Review and coverage</h2>
      @if (summary(); as s) {
        <p>
          <strong>{{ s.waiting }}</strong>
          {{ s.waiting === 1 ? 'unit waits' : 'units wait' }} for your review.
        </p>
        @if (s.oldest.length) {
          <ul>
            @for (u of s.oldest; track u.id) {
              <li>
                <a [routerLink]="['/review/units', u.id]">{{ u.title }}</a>
                <span class="muted">
                  · {{ year(u.yearLevel) }} · {{ u.owner.name }} ·
                  {{ u.daysWaiting === 1 ? '1 day' : u.daysWaiting + ' days' }}
                </span>
              </li>
            }
          </ul>
        }
        @for (f of s.frameworks; track f.id) {
          <p>
            <strong>{{ f.gaps }}</strong> of {{ f.outcomes }} outcomes of {{ f.name }}
            {{ f.gaps === 1 ? 'has' : 'have' }} no unit in
            {{ s.term ? 'term ' + s.term.number + ' ' + s.term.year : 'any term' }}.
          </p>
        }
        <div class="actions">
          <a matButton="filled" routerLink="/review">Open the review queue</a>
          <a matButton="outlined" routerLink="/coverage">See coverage</a>
        </div>
      } @else if (failed()) {
        <p class="muted">The review summary could not be loaded.</p>
      } @else {
        <p class="muted">Loading…</p>
      }
    </section>
  `,
  styles: `
    .summary {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
      padding: 0.5rem 1rem 1rem;
      margin: 1rem 0;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewSummaryCard {
  protected readonly summary = signal<ReviewSummary | null>(null);
  protected readonly failed = signal(false);

  constructor() {
    inject(ReviewApi)
      .summary()
      .pipe(takeUntilDestroyed())
      .subscribe({
        next: (s) => this.summary.set(s),
        error: () => this.failed.set(true),
      });
  }

  protected year(level: number): string {
    return yearLabel(level);
  }
}
