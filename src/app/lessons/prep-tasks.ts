import {
  ChangeDetectionStrategy,
  Component,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatCheckboxModule } from '@angular/material/checkbox';
import type { PrepTask } from '../../../shared/prep/index';
import type { PrepTick } from '../../../shared/schemas/prep-ticks';
import { clockOn } from './clock';
import { LessonsApi } from './lessons-api';

/**
 * A lesson's prep tasks as a checklist shared by its teachers: a tick is saved on the server at
 * once (every teacher of the lesson, the Home agenda and a reload see it), keyed by the task's
 * key so it stays when the counts change. Readers who do not run the lesson see the ticks only.
 */
@Component({
  selector: 'app-prep-tasks',
  imports: [MatCheckboxModule],
  templateUrl: './prep-tasks.html',
  styleUrl: './prep-tasks.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PrepTasks {
  private readonly api = inject(LessonsApi);

  readonly lessonId = input.required<string>();
  /** The lesson's local start (`2026-07-28T11:10`): earlier days are named beside a time. */
  readonly lessonStartsAt = input.required<string>();
  readonly tasks = input.required<readonly PrepTask[]>();
  /** The ticks as the prep answer gave them. */
  readonly ticks = input.required<readonly PrepTick[]>();
  /** Whether this person runs the lesson (its authors and its relief teacher) and may tick. */
  readonly canTick = input(false);

  /** The ticks shown: the server's, changed at once by a tap and replaced by the save's answer. */
  protected readonly shown = linkedSignal(
    (): ReadonlyMap<string, PrepTick> => new Map(this.ticks().map((t) => [t.taskKey, t])),
  );
  /** Keys whose save is on its way (their box waits for the answer). */
  protected readonly saving = signal<ReadonlySet<string>>(new Set());

  protected time(value: string): string {
    return clockOn(value, this.lessonStartsAt());
  }

  protected toggle(task: PrepTask, done: boolean): void {
    const before = this.shown();
    const next = new Map(before);
    if (done) next.set(task.key, { taskKey: task.key, at: new Date().toISOString(), by: null });
    else next.delete(task.key);
    this.shown.set(next);
    this.mark(task.key, true);
    this.api.setPrepTick(this.lessonId(), task.key, done).subscribe({
      next: ({ ticks }) => {
        this.mark(task.key, false);
        this.shown.set(new Map(ticks.map((t) => [t.taskKey, t])));
      },
      // The interceptor has shown the error; the box goes back to what the server holds.
      error: () => {
        this.mark(task.key, false);
        this.shown.set(before);
      },
    });
  }

  private mark(key: string, on: boolean): void {
    this.saving.update((keys) => {
      const next = new Set(keys);
      if (on) next.add(key);
      else next.delete(key);
      return next;
    });
  }
}
