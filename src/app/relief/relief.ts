import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { clockTime, dayLabel } from '../lessons/clock';
import { saveBlob } from '../files/transfer';
import { apiResource } from '../http/resource';
import { transferFeedback } from '../a11y/transfer-feedback';
import { ReliefApi, type ReliefLesson } from './relief-api';

/** A relief teacher's page: each assigned lesson with its notes, a link and its lesson pack. */
@Component({
  selector: 'app-relief',
  imports: [
    RouterLink,
    MarkdownComponent,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  templateUrl: './relief.html',
  styleUrl: './relief.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Relief {
  private readonly api = inject(ReliefApi);
  private readonly feedback = transferFeedback();

  private readonly read = apiResource({ load: () => this.api.lessons() });
  /** Null while loading; a failed read (shown by the error interceptor) lists none. */
  protected readonly lessons = computed<ReliefLesson[] | null>(() =>
    this.read.error() ? [] : (this.read.value()?.lessons ?? null),
  );
  /** The lesson whose pack is being made, with its progress (null when the size is unknown). */
  protected readonly printing = signal<{ id: string; fraction: number | null } | null>(null);

  protected when(lesson: ReliefLesson): string {
    return `${dayLabel(lesson.startsAt)}, ${clockTime(lesson.startsAt)}–${clockTime(lesson.endsAt)}`;
  }

  protected print(lesson: ReliefLesson): void {
    if (this.printing()) return;
    this.printing.set({ id: lesson.id, fraction: null });
    const what = `the lesson pack for ${lesson.title}`;
    const button = `[data-print="${lesson.id}"]`;
    this.feedback.started(what);
    this.api.pack(lesson.id).subscribe({
      next: (event) => {
        if (event.kind === 'progress')
          this.printing.set({ id: lesson.id, fraction: event.fraction });
        else {
          this.printing.set(null);
          saveBlob(event.blob, event.name ?? `${lesson.className}-lesson-pack.pdf`);
          this.feedback.finished(what, button);
        }
      },
      // The error interceptor shows what went wrong.
      error: () => {
        this.printing.set(null);
        this.feedback.failed(button);
      },
    });
  }
}
