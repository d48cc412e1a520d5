import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { apiResource } from '../http/resource';
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
          @if (s.waiting === 0) {
            No unit waits for your review.
          } @else {
            <strong>{{ s.waiting }}</strong>
            {{ s.waiting === 1 ? 'unit waits' : 'units wait' }} for your review{{
              s.oldest.length < s.waiting ? '; the longest waiting:' : ':'
            }}
          }
        </p>
        @if (s.oldest.length) {
          <ul>
            @for (u of s.oldest; track u.id) {
              <li>
                <a [routerLink]="['/review/units', u.id]">{{ u.title }}</a>
                <span class="muted">
                  · {{ year(u.yearLevel) }} · {{ u.owner.name }} · waiting
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
            {{ s.term ? 'Term ' + s.term.number + ', ' + s.term.year : 'any term' }}.
          </p>
        }
        <div class="actions">
          <a matButton="filled" routerLink="/review">Open the review queue</a>
          <a matButton="outlined" routerLink="/coverage">See coverage</a>
        </div>
      } @else if (failed(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
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
  private readonly api = inject(ReviewApi);
  private readonly read = apiResource({ load: () => this.api.summary() });
  protected readonly summary = this.read.value;
  protected readonly failed = this.read.error;

  protected year(level: number): string {
    return yearLabel(level);
  }
}
