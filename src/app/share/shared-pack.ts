import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MarkdownComponent } from 'ngx-markdown';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { Part } from '../../../shared/schemas/kits';
import type { SharedLesson } from '../../../shared/schemas/sharing';
import { ACTIVITY_KIND_LABELS } from '../../../shared/schemas/lessons';
import { catchError, map, of, type Observable } from 'rxjs';
import { AppError } from '../errors/app-error';
import { apiResource } from '../http/resource';
import { clockTime, dayLabel } from '../lessons/clock';
import { PullList } from '../lessons/pull-list';
import { Timeline } from '../lessons/timeline';
import { savedLabel, type MaybeSaved } from '../offline/saved-copy';
import { SavedCopyNotice } from '../offline/saved-copy-notice';
import { ShareApi } from './share-api';

/**
 * The page a share link opens (`/pack/:token`), for a relief teacher without an account: the
 * lesson as the relief page shows it (timeline, pull lists, notes, cautions, build instructions)
 * and the lesson pack. When offline it shows this browser's saved copy and says from when.
 */
@Component({
  selector: 'app-shared-pack',
  imports: [
    MarkdownComponent,
    MatButtonModule,
    MatCardModule,
    MatIconModule,
    MatProgressBarModule,
    PullList,
    SavedCopyNotice,
    Timeline,
  ],
  templateUrl: './shared-pack.html',
  styleUrl: './shared-pack.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedPack {
  private readonly api = inject(ShareApi);

  /** The link's token, from the route (`/pack/:token`). */
  readonly token = input.required<string>();

  /** The lesson (live or this browser's saved copy), or why the link does not open. */
  private readonly read = apiResource({
    params: () => this.token(),
    load: (token: string) => shown(this.api.lesson(token)),
  });
  protected readonly shared = computed(() => {
    const shown = this.read.value();
    return shown && shown.problem === null ? shown.value : null;
  });
  protected readonly savedAt = computed(() => {
    const shown = this.read.value();
    return shown && shown.problem === null ? shown.savedAt : null;
  });
  protected readonly problem = computed(() => this.read.value()?.problem ?? null);
  protected readonly kindLabels = ACTIVITY_KIND_LABELS;

  /** The parts the pull lists name, in the shape the pull-list table reads. */
  protected readonly parts = computed(() => {
    const map = new Map<string, Part>();
    for (const p of this.shared()?.parts ?? []) {
      map.set(p.code, {
        id: p.code,
        code: p.code,
        name: p.name,
        colour: p.colour,
        compartment: p.compartment,
        category: 'other',
        qty: 0,
        small: p.small,
        chargeMinutes: null,
        hasPhoto: false,
      });
    }
    return map as ReadonlyMap<string, Part>;
  });

  protected when(lesson: SharedLesson['lesson']): string {
    return `${dayLabel(lesson.startsAt)}, ${clockTime(lesson.startsAt)}–${clockTime(lesson.endsAt)}`;
  }

  protected saved(at: string): string {
    return savedLabel(at);
  }

  protected packUrl(): string {
    return this.api.packUrl(this.token());
  }

  protected attachmentUrl(id: string): string {
    return this.api.attachmentUrl(this.token(), id);
  }

  protected size(bytes: number): string {
    return bytes >= 1024 * 1024
      ? `${(bytes / 1024 / 1024).toFixed(1)} MB`
      : `${Math.max(1, Math.round(bytes / 1024))} kB`;
  }
}

interface Problem {
  title: string;
  message: string;
}

/** What the page shows: the lesson, or why there is none. */
type Shown = (MaybeSaved<SharedLesson> & { problem: null }) | { problem: Problem };

/** A link that does not open is an answer this page words itself, not a failed load. */
function shown(lesson: Observable<MaybeSaved<SharedLesson>>): Observable<Shown> {
  return lesson.pipe(
    map((saved): Shown => ({ ...saved, problem: null })),
    catchError((error: unknown) => of<Shown>({ problem: describe(error) })),
  );
}

/** What to tell a relief teacher whose link does not open. */
function describe(error: unknown): Problem {
  const e = error instanceof AppError ? error : null;
  if (e?.status === 410) return { title: 'This link no longer works', message: e.message };
  if (e?.status === 404) return { title: 'This link is not known', message: e.message };
  if (e?.status === 0) {
    return {
      title: 'No connection',
      message:
        'Trayplan cannot be reached and this browser has no saved copy of this lesson. ' +
        'Open the link again once you are online.',
    };
  }
  return { title: 'The lesson could not be opened', message: e?.message ?? 'Try again soon.' };
}
