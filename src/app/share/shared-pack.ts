import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  signal,
  type OnInit,
} from '@angular/core';
import { MarkdownComponent } from 'ngx-markdown';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { Part } from '../../../shared/schemas/kits';
import type { SharedLesson } from '../../../shared/schemas/sharing';
import { ACTIVITY_KIND_LABELS } from '../../../shared/schemas/lessons';
import { AppError } from '../errors/app-error';
import { clockTime, dayLabel } from '../lessons/clock';
import { PullList } from '../lessons/pull-list';
import { Timeline } from '../lessons/timeline';
import { savedLabel } from '../offline/saved-copy';
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
    Timeline,
  ],
  templateUrl: './shared-pack.html',
  styleUrl: './shared-pack.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedPack implements OnInit {
  private readonly api = inject(ShareApi);

  /** The link's token, from the route (`/pack/:token`). */
  readonly token = input.required<string>();

  protected readonly shared = signal<SharedLesson | null>(null);
  protected readonly savedAt = signal<string | null>(null);
  protected readonly problem = signal<{ title: string; message: string } | null>(null);
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

  ngOnInit(): void {
    this.api.lesson(this.token()).subscribe({
      next: ({ value, savedAt }) => {
        this.shared.set(value);
        this.savedAt.set(savedAt);
      },
      error: (error: unknown) => this.problem.set(describe(error)),
    });
  }

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

/** What to tell a relief teacher whose link does not open. */
function describe(error: unknown): { title: string; message: string } {
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
