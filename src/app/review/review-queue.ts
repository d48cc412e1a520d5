import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { QueueRow } from '../../../shared/schemas/review';
import { apiResource } from '../http/resource';
import { TERMS, YEAR_LEVELS, yearLabel } from '../units/labels';
import { ReviewApi, type QueueFilters } from './review-api';

/** `/review`: units waiting for a decision, oldest first, for leads and admins. */
@Component({
  selector: 'app-review-queue',
  imports: [
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
  ],
  template: `
    <section class="page">
      <div class="heading">
        <h1>Review</h1>
        <a matButton="outlined" routerLink="/coverage">
          <mat-icon aria-hidden="true">grid_on</mat-icon>
          Outcome coverage
        </a>
      </div>
      <p class="muted">Units sent for review, waiting longest first.</p>

      <div class="filters">
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Waiting for</mat-label>
          <mat-select [value]="status()" (selectionChange)="status.set($event.value)">
            <mat-option value="in-review">Your decision (in review)</mat-option>
            <mat-option value="changes-requested">The teacher (changes requested)</mat-option>
          </mat-select>
        </mat-form-field>
        <mat-form-field subscriptSizing="dynamic" floatLabel="always">
          <mat-label>Year level</mat-label>
          <mat-select
            placeholder="Any"
            [value]="yearLevel()"
            (selectionChange)="yearLevel.set($event.value)"
          >
            <mat-option [value]="null">Any</mat-option>
            @for (level of yearLevels; track level) {
              <mat-option [value]="level">{{ year(level) }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field subscriptSizing="dynamic" floatLabel="always">
          <mat-label>Term</mat-label>
          <mat-select placeholder="Any" [value]="term()" (selectionChange)="term.set($event.value)">
            <mat-option [value]="null">Any</mat-option>
            @for (t of terms; track t) {
              <mat-option [value]="t">Term {{ t }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
      </div>

      @if (loading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the review queue" />
      }
      <div class="table-wrap">
        <table mat-table [dataSource]="rows()">
          <caption class="visually-hidden">
            Units waiting for review
          </caption>
          <ng-container matColumnDef="title">
            <th mat-header-cell *matHeaderCellDef>Unit</th>
            <td mat-cell *matCellDef="let row">
              <a [routerLink]="['/review/units', row.id]">{{ row.title }}</a>
              <!-- On a phone the columns below fold into this line. -->
              <span class="row-meta">
                {{ year(row.yearLevel) }} · {{ row.term ? 'Term ' + row.term : 'no term' }} ·
                {{ row.owner.name }} · {{ row.lessonCount }}
                {{ row.lessonCount === 1 ? 'lesson' : 'lessons' }}
              </span>
            </td>
          </ng-container>
          <ng-container matColumnDef="yearLevel">
            <th mat-header-cell *matHeaderCellDef>Year</th>
            <td mat-cell *matCellDef="let row">{{ year(row.yearLevel) }}</td>
          </ng-container>
          <ng-container matColumnDef="term">
            <th mat-header-cell *matHeaderCellDef>Term</th>
            <td mat-cell *matCellDef="let row">{{ row.term ? 'Term ' + row.term : '—' }}</td>
          </ng-container>
          <ng-container matColumnDef="owner">
            <th mat-header-cell *matHeaderCellDef>Owner</th>
            <td mat-cell *matCellDef="let row">{{ row.owner.name }}</td>
          </ng-container>
          <ng-container matColumnDef="lessons">
            <th mat-header-cell *matHeaderCellDef>Lessons</th>
            <td mat-cell *matCellDef="let row">{{ row.lessonCount }}</td>
          </ng-container>
          <ng-container matColumnDef="waiting">
            <th mat-header-cell *matHeaderCellDef>Waiting</th>
            <td mat-cell *matCellDef="let row">{{ waiting(row) }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
          <tr class="mat-mdc-row" *matNoDataRow>
            <td class="mat-mdc-cell empty" [attr.colspan]="columns.length">
              @if (!loading()) {
                Nothing is waiting here.
              }
            </td>
          </tr>
        </table>
      </div>
    </section>
  `,
  styles: `
    .heading {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 0.5rem 1rem;
    }
    .heading h1 {
      margin: 0;
    }
    .filters {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem 1rem;
      margin: 1rem 0;
    }
    .filters mat-form-field {
      width: 15rem;
    }
    .table-wrap {
      overflow-x: auto;
    }
    table {
      width: 100%;
      min-width: 40rem;
    }
    .row-meta {
      display: none;
    }
    @media (max-width: 600px) {
      table {
        min-width: 0;
      }
      .mat-column-yearLevel,
      .mat-column-term,
      .mat-column-owner,
      .mat-column-lessons {
        display: none;
      }
      .row-meta {
        display: block;
        font-size: 0.85rem;
        color: var(--mat-sys-on-surface-variant);
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewQueue {
  private readonly api = inject(ReviewApi);

  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly terms = TERMS;
  protected readonly columns = ['title', 'yearLevel', 'term', 'owner', 'lessons', 'waiting'];
  protected readonly status = signal<QueueFilters['status']>('in-review');
  protected readonly yearLevel = signal<number | null>(null);
  protected readonly term = signal<number | null>(null);
  private readonly filters = computed<QueueFilters>(() => ({
    status: this.status(),
    yearLevel: this.yearLevel(),
    term: this.term(),
  }));
  /** The queue of the filters; a quick change of filters never lets an older answer win. */
  private readonly read = apiResource({
    params: () => this.filters(),
    load: (filters: QueueFilters) => this.api.queue(filters),
  });
  protected readonly loading = this.read.loading;
  /** The rows shown: the last ones read, kept while the next load runs (or if it fails). */
  protected readonly rows = linkedSignal<QueueRow[] | undefined, QueueRow[]>({
    source: this.read.value,
    computation: (rows, previous) => rows ?? previous?.value ?? [],
  });

  protected year(level: number): string {
    return yearLabel(level);
  }

  protected waiting(row: QueueRow): string {
    if (row.daysWaiting === 0) return 'Today';
    return row.daysWaiting === 1 ? '1 day' : `${row.daysWaiting} days`;
  }
}
