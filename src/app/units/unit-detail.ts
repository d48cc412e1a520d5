import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import { UNIT_STATUS_LABELS, type Unit } from '../../../shared/schemas/units';
import { apiResource } from '../http/resource';
import { clockTime, dayLabel } from '../lessons/clock';
import { saveBlob } from '../files/transfer';
import { ReviewPanel } from '../review/review-panel';
import { reviewStepsFor } from '../review/review-labels';
import { yearLabel } from './labels';
import { UnitsApi, type UnitPrintable } from './units-api';
import { CopyDialog, copyDialogData } from './copy-dialog';
import { UnitHistory } from './unit-history';
import { UnitProvenance } from './unit-provenance';
import { UpstreamPanel } from './upstream-panel';
import { Session } from '../auth/session';
import { MatDialog } from '@angular/material/dialog';
import { itemTitle } from '../a11y/item-title';

/**
 * `/units/:id`: a unit's overview (Markdown, sanitised by ngx-markdown's default Angular
 * sanitiser), its outcomes and its lessons in order.
 */
@Component({
  selector: 'app-unit-detail',
  imports: [
    RouterLink,
    MarkdownComponent,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    UnitHistory,
    UnitProvenance,
    UpstreamPanel,
    ReviewPanel,
  ],
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
        @if (unit.basedOn; as basedOn) {
          <app-unit-provenance [basedOn]="basedOn" />
        }

        <div class="actions">
          @if (unit.canEdit) {
            <a matButton="filled" [routerLink]="['/units', unit.id, 'edit']">
              <mat-icon aria-hidden="true">edit</mat-icon>
              Edit unit
            </a>
            <a matButton="outlined" routerLink="/lessons/new" [queryParams]="{ unit: unit.id }">
              <mat-icon aria-hidden="true">add</mat-icon>
              Add lesson
            </a>
          }
          @if (canCopy()) {
            <button matButton="outlined" type="button" (click)="copy(unit)">
              <mat-icon aria-hidden="true">content_copy</mat-icon>
              Copy to my units
            </button>
          }
          <button
            matButton="outlined"
            type="button"
            [disabled]="!!download()"
            (click)="print('pack.pdf')"
          >
            <mat-icon aria-hidden="true">print</mat-icon>
            Print unit pack
          </button>
          <button
            matButton="outlined"
            type="button"
            [disabled]="!!download()"
            (click)="print('prep.ics')"
          >
            <mat-icon aria-hidden="true">event</mat-icon>
            Add prep to calendar
          </button>
        </div>
        @if (download(); as d) {
          <mat-progress-bar
            [mode]="d.fraction === null ? 'indeterminate' : 'determinate'"
            [value]="(d.fraction ?? 0) * 100"
            [attr.aria-label]="
              d.file === 'pack.pdf' ? 'Making the unit pack' : 'Making the prep calendar'
            "
          />
          <p class="muted" aria-live="polite">
            {{ d.file === 'pack.pdf' ? 'Making the unit pack…' : 'Making the prep calendar…' }}
          </p>
        }

        @if (unit.basedOn?.readable) {
          <app-upstream-panel [unitId]="unit.id" />
        }

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
              <li>
                <strong>{{ o.code }}</strong> {{ o.description }}
              </li>
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
                @if (l.termNote) {
                  <span class="term-note"
                    ><mat-icon aria-hidden="true" inline>event_busy</mat-icon>
                    {{ l.termNote }}</span
                  >
                }
              </li>
            }
          </ol>
        } @else {
          <p class="muted">No lessons yet.</p>
        }

        <app-review-panel [unit]="unit" [actions]="steps()" (changed)="read.set($event)" />
        <app-unit-history [unitId]="unit.id" />
      }
    </section>
  `,
  styles: `
    .term-note {
      display: block;
      color: var(--mat-sys-error);
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem 0.75rem;
      margin: 0.5rem 0 1rem;
    }
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
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);

  /** Route parameter `:id`. */
  readonly id = input.required<string>();

  protected readonly statusLabels = UNIT_STATUS_LABELS;
  private readonly role = computed(() => this.session.user()?.role ?? null);
  /** Teachers and leads copy a unit they read into their own (the server has the last word). */
  protected readonly canCopy = computed(() => {
    const role = this.role();
    return role === 'teacher' || role === 'lead';
  });
  protected readonly read = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.get(id),
  });
  protected readonly unit = computed(() => this.read.value() ?? null);
  private readonly titled = itemTitle('Unit', () => this.unit()?.title);
  protected readonly error = this.read.error;
  /** The review steps the signed-in person may take (the server decides again). */
  protected readonly steps = computed(() => {
    const unit = this.unit();
    const role = this.role();
    return unit && role ? reviewStepsFor(unit, role) : [];
  });
  /** The printable being made, and how far its download is (null: size unknown). */
  protected readonly download = signal<{ file: UnitPrintable; fraction: number | null } | null>(
    null,
  );

  /** Opens the copy dialog; "Open the copy" there navigates to the new unit. */
  protected copy(unit: Unit): void {
    this.dialog.open(CopyDialog, { data: copyDialogData(unit), width: '34rem' });
  }

  /** Downloads a printable and saves it under the name the server gave it. */
  protected print(file: UnitPrintable): void {
    const unit = this.unit();
    if (!unit) return;
    this.download.set({ file, fraction: null });
    this.api.download(unit.id, file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') this.download.set({ file, fraction: event.fraction });
        else {
          this.download.set(null);
          saveBlob(event.blob, event.name ?? fallbackName(unit, file));
        }
      },
      // The interceptor has shown the error in the snack-bar; only the progress bar stops here.
      error: () => this.download.set(null),
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

/** A name for a file whose response named none (the server normally does). */
function fallbackName(unit: Unit, file: UnitPrintable): string {
  const stem = unit.title
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');
  return `${stem || 'unit'}-${file === 'pack.pdf' ? 'unit-pack.pdf' : 'prep.ics'}`;
}
