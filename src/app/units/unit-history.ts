import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { apiResource } from '../http/resource';
import { ReuseApi } from './reuse-api';

/** A unit's history, newest first: when, who, and what changed in a few words. */
@Component({
  selector: 'app-unit-history',
  imports: [DatePipe, MatProgressBarModule],
  template: `
    <h2>History</h2>
    @if (history.loading() && !history.value()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading the history" />
    }
    @if (history.error(); as message) {
      <p class="form-error" role="alert">{{ message }}</p>
    }
    @if (history.value(); as events) {
      @if (events.length) {
        <ol class="history">
          @for (e of events; track $index) {
            <li>
              <time class="muted" [attr.datetime]="e.at">{{ e.at | date: 'd MMM y, h:mm a' }}</time>
              <span class="who">{{ e.actor.name }}</span>
              <span>{{ e.summary }}</span>
            </li>
          }
        </ol>
      } @else {
        <p class="muted">Nothing recorded yet.</p>
      }
    }
  `,
  styles: `
    .history {
      list-style: none;
      padding: 0;
      margin: 0;
    }
    .history li {
      display: grid;
      grid-template-columns: 11rem 10rem 1fr;
      gap: 0.5rem;
      padding: 0.35rem 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .who {
      font-weight: 600;
    }
    @media (max-width: 640px) {
      .history li {
        grid-template-columns: 1fr;
        gap: 0;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitHistory {
  private readonly api = inject(ReuseApi);

  readonly unitId = input.required<string>();

  protected readonly history = apiResource({
    params: () => this.unitId(),
    load: (id) => this.api.history(id),
  });
}
