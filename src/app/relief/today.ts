import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { catchError, map, of, type Observable } from 'rxjs';
import { AppError } from '../errors/app-error';
import { saveBlob } from '../files/transfer';
import { apiResource } from '../http/resource';
import { clockTime, dayLabel } from '../lessons/clock';
import { type MaybeSaved } from '../offline/saved-copy';
import { SavedCopyNotice } from '../offline/saved-copy-notice';
import type { ReliefDay } from '../../../shared/schemas/sharing';
import { ReliefApi } from './relief-api';

type DayLesson = ReliefDay['lessons'][number];

/** How many of the next assigned lessons a day without lessons lists. */
const NEXT = 5;

/** What the page shows: the day (live or a saved copy), or why there is none. */
type Shown = (MaybeSaved<ReliefDay> & { problem: null }) | { problem: string };

/**
 * A relief teacher's "Today": each lesson assigned to them today in time order, with room,
 * class, notes, the prep tasks still open, build instructions and one button for the pack.
 * Offline, it shows the copy saved in this browser and says from when.
 */
@Component({
  selector: 'app-today',
  imports: [
    RouterLink,
    MarkdownComponent,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
    SavedCopyNotice,
  ],
  template: `
    <section class="page">
      <h1>Today</h1>
      <app-saved-copy-notice [savedAt]="savedAt()" />
      @if (problem(); as p) {
        <p role="alert">{{ p }}</p>
      } @else if (day(); as d) {
        <p class="muted">{{ dayName(d.date) }}</p>
        @if (d.lessons.length === 0) {
          <p>
            No lessons are assigned to you today.
            <a routerLink="/relief">All your lessons</a>
          </p>
          @if (upcoming().length) {
            <h2>Your next lessons</h2>
            <ul class="upcoming">
              @for (lesson of upcoming(); track lesson.id) {
                <li>
                  <a [routerLink]="['/lessons', lesson.id]">{{ lesson.title }}</a>
                  <span class="muted">
                    {{ when(lesson.startsAt, lesson.endsAt) }} · {{ lesson.className }} ·
                    {{ lesson.unitTitle }}
                  </span>
                </li>
              }
            </ul>
          }
        }
        <ol class="lessons">
          @for (lesson of d.lessons; track lesson.id) {
            <li>
              <mat-card appearance="outlined">
                <mat-card-content>
                  <h2>
                    {{ clock(lesson.startsAt) }}–{{ clock(lesson.endsAt) }} · {{ lesson.title }}
                  </h2>
                  <p class="facts">
                    Room: <strong>{{ lesson.room || 'not given' }}</strong> · Class:
                    <strong>{{ lesson.className }}</strong>
                    @if (lesson.periodName) {
                      · {{ lesson.periodName }}
                    }
                    · {{ lesson.unitTitle }}
                  </p>
                  @if (lesson.reliefNotes) {
                    <h3>Notes from the teacher</h3>
                    <markdown [data]="lesson.reliefNotes" />
                  }
                  <h3>Prep still to do</h3>
                  @if (lesson.openTasks.length) {
                    <ul>
                      @for (task of lesson.openTasks; track $index) {
                        <li>
                          {{ task.label }}: start by {{ clock(task.startBy) }}, done by
                          {{ clock(task.doneBy) }} ({{ task.minutes }} min)
                        </li>
                      }
                    </ul>
                  } @else {
                    <p class="muted">Nothing left to prepare.</p>
                  }
                  @if (hasInstructions(lesson)) {
                    <h3>Build instructions</h3>
                    <ul>
                      @for (activity of lesson.activities; track activity.id) {
                        @for (file of activity.attachments; track file.id) {
                          <li>
                            {{ activity.title }}:
                            <a [href]="'/api/activities/attachments/' + file.id" download>
                              {{ file.filename }}
                            </a>
                          </li>
                        }
                      }
                    </ul>
                  }
                  <div class="actions">
                    <button
                      matButton="filled"
                      type="button"
                      [disabled]="printing() !== null || !lesson.plannable"
                      (click)="print(lesson)"
                    >
                      <mat-icon aria-hidden="true">print</mat-icon>
                      Lesson pack
                    </button>
                    <a matButton="outlined" [routerLink]="['/lessons', lesson.id]">Open lesson</a>
                  </div>
                  @if (printing() === lesson.id) {
                    <mat-progress-bar mode="indeterminate" aria-label="Making the lesson pack" />
                  }
                </mat-card-content>
              </mat-card>
            </li>
          }
        </ol>
      } @else {
        <mat-progress-bar mode="indeterminate" aria-label="Loading today's lessons" />
      }
    </section>
  `,
  styles: `
    .lessons {
      list-style: none;
      padding: 0;
      display: grid;
      gap: 16px;
    }
    .upcoming li {
      margin-bottom: 8px;
    }
    .actions {
      display: flex;
      gap: 12px;
      margin-top: 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Today {
  private readonly relief = inject(ReliefApi);

  private readonly read = apiResource({ load: () => shown(this.relief.today()) });
  protected readonly day = computed(() => {
    const shown = this.read.value();
    return shown && shown.problem === null ? shown.value : null;
  });
  protected readonly savedAt = computed(() => {
    const shown = this.read.value();
    return shown && shown.problem === null ? shown.savedAt : null;
  });
  protected readonly problem = computed(() => this.read.value()?.problem ?? null);
  /**
   * A live day without lessons reads the person's assigned lessons, so their Home still shows
   * what is theirs: the next few from today on (offline, the saved day says enough).
   */
  private readonly assignedRead = apiResource({
    params: () => {
      const day = this.day();
      return day && day.lessons.length === 0 && this.savedAt() === null ? day.date : undefined;
    },
    load: (date: string) =>
      this.relief
        .lessons()
        .pipe(map(({ lessons }) => lessons.filter((l) => l.startsAt >= date).slice(0, NEXT))),
  });
  protected readonly upcoming = computed(() => this.assignedRead.value() ?? []);
  protected readonly printing = signal<string | null>(null);

  protected clock(value: string): string {
    return clockTime(value);
  }

  protected when(startsAt: string, endsAt: string): string {
    return `${dayLabel(startsAt, false)}, ${clockTime(startsAt)}–${clockTime(endsAt)}`;
  }

  protected dayName(date: string): string {
    return dayLabel(`${date}T00:00`);
  }

  protected hasInstructions(lesson: DayLesson): boolean {
    return lesson.activities.some((a) => a.attachments.length > 0);
  }

  protected print(lesson: DayLesson): void {
    if (this.printing()) return;
    this.printing.set(lesson.id);
    this.relief.pack(lesson.id).subscribe({
      next: (event) => {
        if (event.kind === 'done') {
          this.printing.set(null);
          saveBlob(event.blob, event.name ?? `${lesson.className}-lesson-pack.pdf`);
        }
      },
      error: () => this.printing.set(null),
    });
  }
}

/** A failed read is an answer this page words itself (offline with no saved copy, or else). */
function shown(day: Observable<MaybeSaved<ReliefDay>>): Observable<Shown> {
  return day.pipe(
    map((saved): Shown => ({ ...saved, problem: null })),
    catchError((e: unknown) =>
      of<Shown>({
        problem:
          e instanceof AppError && e.status === 0
            ? 'Trayplan cannot be reached, and this browser has no saved copy of today yet.'
            : e instanceof AppError
              ? e.message
              : 'Today could not be loaded.',
      }),
    ),
  );
}
