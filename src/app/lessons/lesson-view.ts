import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  Injector,
  afterNextRender,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { LessonPrep, PrepSuggestion } from '../../../shared/prep/index';
import { lessonSchema, type Lesson } from '../../../shared/schemas/lessons';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { apiResource, sameAnswer } from '../http/resource';
import { SavedCopies } from '../offline/saved-copies';
import { SavedCopyNotice } from '../offline/saved-copy-notice';
import { Notifier } from '../errors/notifier';
import { CAUTIONS_DEFER, SAFETY_CAUTIONS } from './cautions';
import { BuildInstructions } from './build-instructions';
import { ShareLinks } from '../share/share-links';
import { LessonComments } from '../review/lesson-comments';
import { clockTime, dayLabel } from './clock';
import { groupSizeFor } from './group-size';
import { LessonsApi, type Printable } from './lessons-api';
import { saveBlob } from '../files/transfer';
import { transferFeedback } from '../a11y/transfer-feedback';
import { GroupBorrowsPipe } from './group-borrows';
import { PullList, type PartInfo } from './pull-list';
import { Timeline } from './timeline';
import { TrayBoard } from './tray-board';
import { PrepTasks } from './prep-tasks';
import { Session } from '../auth/session';
import { PluralPipe } from '../text/words';
import { itemTitle } from '../a11y/item-title';

type GroupsSuggestion = Extract<PrepSuggestion, { kind: 'groups' }>;

/** A stale edit: what the person asked for, kept to re-apply on the lesson as it is now. */
interface Conflict {
  groupSize: number;
  current: Lesson | null;
}

/** `/lessons/:id[?group=N]`: a lesson with its prep plan, recomputed after every change here. */
@Component({
  selector: 'app-lesson-view',
  imports: [
    PluralPipe,
    RouterLink,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    GroupBorrowsPipe,
    PullList,
    Timeline,
    BuildInstructions,
    ShareLinks,
    TrayBoard,
    PrepTasks,
    LessonComments,
    SavedCopyNotice,
  ],
  templateUrl: './lesson-view.html',
  styleUrl: './lesson-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LessonView {
  private readonly api = inject(LessonsApi);
  private readonly notifier = inject(Notifier);
  private readonly feedback = transferFeedback();
  private readonly injector = inject(Injector);
  private readonly session = inject(Session);

  /** Route parameter `:id`. */
  readonly id = input.required<string>();
  /** Query `?group=N`: the group whose pull list to scroll to. */
  readonly group = input<string | undefined>(undefined);

  private readonly lessonRead = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.lesson(id),
  });
  /** Unchanged plans (by value) keep the shown one, so ticks and scrolling stay put. */
  private readonly planRead = apiResource({
    params: () => this.id(),
    load: (id: string, mode) => this.api.prep(id, mode.quiet),
    equal: sameAnswer,
  });

  protected readonly cautions = SAFETY_CAUTIONS;
  protected readonly cautionsDefer = CAUTIONS_DEFER;
  protected readonly lesson = computed(() => this.lessonRead.value() ?? null);
  private readonly titled = itemTitle('Lesson', () => this.lesson()?.title);
  protected readonly plan = computed(() => this.planRead.value() ?? null);
  /** Names, colours and compartments of the plan's parts, as the prep answer gives them. */
  protected readonly parts = computed(
    (): ReadonlyMap<string, PartInfo> => new Map(Object.entries(this.plan()?.parts ?? {})),
  );
  /** The controller a group pairs with, in the pack's words (null: nothing to name). */
  protected controllerOf(plan: LessonPrep, group: number): string | null {
    return plan.controllers[String(group)] ?? null;
  }
  protected readonly loading = computed(() => this.lessonRead.loading() || this.planRead.loading());
  protected readonly loadError = computed(
    () => this.lessonRead.error() ?? this.planRead.error() ?? null,
  );
  /** When the lesson or its plan on screen is a copy the service worker saved (offline). */
  protected readonly savedAt = inject(SavedCopies).savedAt(() => {
    const base = `/api/lessons/${encodeURIComponent(this.id())}`;
    return [base, `${base}/prep`];
  });
  protected readonly saving = signal(false);
  protected readonly conflict = signal<Conflict | null>(null);
  protected readonly download = signal<{ file: Printable; fraction: number | null } | null>(null);
  /** Whether this person runs the lesson and ticks its prep tasks (as the policy decides). */
  protected readonly canRun = computed(
    () => !!this.lesson()?.canEdit || this.session.user()?.role === 'relief',
  );
  private scrolled = false;

  protected readonly groupSuggestions = computed(
    () => (this.plan()?.suggestions.filter((s) => s.kind === 'groups') ?? []) as GroupsSuggestion[],
  );
  protected readonly partSuggestions = computed(
    () => this.plan()?.suggestions.filter((s) => s.kind === 'part') ?? [],
  );

  constructor() {
    // Scroll to `?group=N` once the lesson and its plan are first shown.
    effect(() => {
      if (this.lesson() && this.plan()) untracked(() => this.scrollToGroup());
    });
    // The plan follows the lesson, its materials, the tubs and the school's settings, which other
    // people change elsewhere: read it again when the page comes back into view and every 20 s
    // while it is visible.
    const refresh = () => {
      if (document.visibilityState === 'visible' && !this.loading() && !this.saving()) {
        this.planRead.refresh();
      }
    };
    const timer = setInterval(refresh, 20_000);
    document.addEventListener('visibilitychange', refresh);
    window.addEventListener('focus', refresh);
    inject(DestroyRef).onDestroy(() => {
      clearInterval(timer);
      document.removeEventListener('visibilitychange', refresh);
      window.removeEventListener('focus', refresh);
    });
  }

  protected clock(value: string): string {
    return clockTime(value);
  }

  protected day(value: string): string {
    return dayLabel(value);
  }

  /** The group size a suggestion needs, or null when no size gives exactly that many groups. */
  protected sizeFor(suggestion: GroupsSuggestion): number | null {
    const lesson = this.lesson();
    return lesson ? groupSizeFor(lesson.class.studentCount, suggestion.groups) : null;
  }

  protected applyGroups(suggestion: GroupsSuggestion): void {
    const lesson = this.lesson();
    const groupSize = this.sizeFor(suggestion);
    if (!lesson || groupSize === null) return;
    this.saveGroupSize(lesson.version, groupSize);
  }

  /** After a 409: send the same change again on the version the server has now. */
  protected reapply(): void {
    const conflict = this.conflict();
    if (!conflict?.current) return;
    this.lessonRead.set(conflict.current);
    this.saveGroupSize(conflict.current.version, conflict.groupSize);
  }

  protected reload(): void {
    this.conflict.set(null);
    this.lessonRead.reload();
    this.planRead.reload();
  }

  protected print(file: Printable): void {
    if (this.download()) return;
    this.download.set({ file, fraction: null });
    const what = PRINTABLE_NAMES[file];
    const button = `[data-printable="${file}"]`;
    this.feedback.started(what);
    this.api.download(this.id(), file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') this.download.set({ file, fraction: event.fraction });
        else {
          this.download.set(null);
          saveBlob(event.blob, event.name ?? fileName(this.lesson(), file));
          this.feedback.finished(what, button);
        }
      },
      // The interceptor has shown the error.
      error: () => {
        this.download.set(null);
        this.feedback.failed(button);
      },
    });
  }

  private saveGroupSize(version: number, groupSize: number): void {
    this.saving.set(true);
    this.conflict.set(null);
    this.api.update(this.id(), { version, groupSize }).subscribe({
      next: (lesson) => {
        this.saving.set(false);
        this.lessonRead.set(lesson);
        this.notifier.info(`Group size is now ${groupSize}. The prep plan is recomputed.`);
        this.planRead.reload();
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const conflict = staleConflict(error, lessonSchema);
        if (conflict) this.conflict.set({ groupSize, current: conflict.current });
        else if (error instanceof AppError) this.notifier.error(error.message);
      },
    });
  }

  private scrollToGroup(): void {
    const group = this.group();
    if (!group || this.scrolled) return;
    this.scrolled = true;
    afterNextRender(
      () => document.getElementById(`group-${group}`)?.scrollIntoView({ block: 'start' }),
      { injector: this.injector },
    );
  }
}

/** How the announcements name each printable. */
const PRINTABLE_NAMES: Record<Printable, string> = {
  'pack.pdf': 'the lesson pack',
  'labels.pdf': 'the tray labels',
  'prep.ics': 'the prep tasks calendar file',
};

function fileName(lesson: Lesson | null, file: Printable): string {
  const base = (lesson?.title ?? 'lesson').replace(/[^\w-]+/g, '-').replace(/^-|-$/g, '');
  return `${base || 'lesson'}-${file}`;
}
