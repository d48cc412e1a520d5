import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatDialog } from '@angular/material/dialog';
import { filter, switchMap, type Subscription } from 'rxjs';
import { confirm } from '../forms/confirm-dialog';
import type { PrepPlan } from '../../../shared/prep/index';
import type { Lesson } from '../../../shared/schemas/lessons';
import { groupDone, type TrayBoard as Board } from '../../../shared/schemas/trays';
import { Session } from '../auth/session';
import { PackAwayDialog, type PackAwayData } from './pack-away-dialog';
import { prefillPackAway } from './pack-away';
import { Notifier } from '../errors/notifier';
import { clockTime } from './clock';
import { TrayBoardApi } from './tray-board-api';

/** `2026-07-28`: the browser's own date (the school's, for a teacher at school). */
function localDay(ms: number): string {
  const d = new Date(ms);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** `mm:ss` (or `h:mm:ss`) of a number of seconds. */
export function countdown(seconds: number): string {
  const s = Math.max(0, Math.floor(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const pad = (n: number) => String(n).padStart(2, '0');
  return h ? `${h}:${pad(m)}:${pad(s % 60)}` : `${m}:${pad(s % 60)}`;
}

/**
 * The teacher's pack-away board on the lesson page: every group's tray as a card (lines out,
 * lines back, missing), live from the server's event stream, groups that have ticked every line
 * back marked done, and the countdown to the plan's pack-away start.
 */
@Component({
  selector: 'app-tray-board',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './tray-board.html',
  styleUrl: './tray-board.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrayBoard {
  private readonly api = inject(TrayBoardApi);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);

  readonly lesson = input.required<Lesson>();
  /** The lesson's plan as shown on the page, with its part names. */
  readonly plan = input.required<PrepPlan & { partNames?: Record<string, string> }>();

  protected readonly board = signal<Board | null>(null);
  protected readonly now = signal(Date.now());
  protected readonly doneCount = computed(
    () => this.board()?.groups.filter((g) => groupDone(g)).length ?? 0,
  );
  protected readonly done = groupDone;
  protected readonly clock = clockTime;
  private readonly partNames = computed(() => new Map(Object.entries(this.plan().partNames ?? {})));
  /** Whether the lesson is today (the board is live only then). */
  protected readonly today = computed(
    () => this.lesson().startsAt.slice(0, 10) === localDay(this.now()),
  );
  /** The lesson's id alone, so an edit of the lesson does not open the stream again. */
  private readonly lessonId = computed(() => this.lesson().id);
  /** Who runs the lesson: its authors, and its relief teacher (the only relief who reads it). */
  protected readonly canRun = computed(
    () => this.lesson().canEdit || this.session.user()?.role === 'relief',
  );
  protected readonly countdownText = computed(() => {
    const at = this.plan().timeline.packAwayStartsAt;
    if (!at) return null;
    // A count only on the lesson's day: a lesson weeks away (or long past) gives the time alone.
    if (!this.today()) return `Pack-away starts at ${clockTime(at)}.`;
    const left = (Date.parse(at) - this.now()) / 1000;
    return left > 0
      ? `Pack-away starts at ${clockTime(at)}: in ${countdown(left)}`
      : `Pack-away started at ${clockTime(at)}, ${countdown(-left)} ago`;
  });

  constructor() {
    let stream: Subscription | null = null;
    effect(() => {
      const id = this.lessonId();
      const live = this.today();
      untracked(() => {
        stream?.unsubscribe();
        stream = (live ? this.api.live(id) : this.api.board(id)).subscribe((b) =>
          this.board.set(b),
        );
      });
    });
    const tick = setInterval(() => this.now.set(Date.now()), 1000);
    inject(DestroyRef).onDestroy(() => {
      stream?.unsubscribe();
      clearInterval(tick);
    });
  }

  protected name(code: string): string {
    return this.partNames().get(code) ?? code;
  }

  protected revoke(): void {
    confirm(this.dialog, {
      title: 'Replace the tray codes?',
      message:
        'Every tray label printed so far stops working. Print the labels again for new codes.',
      confirm: 'Replace codes',
      cancel: 'Keep them',
      danger: true,
    })
      .pipe(
        filter(Boolean),
        switchMap(() => this.api.revoke(this.lesson().id)),
      )
      .subscribe((r) => {
        this.notifier.info(
          `${r.revoked} tray ${r.revoked === 1 ? 'code' : 'codes'} stopped. Print the labels again.`,
        );
      });
  }

  protected record(): void {
    const board = this.board();
    if (!board) return;
    const data: PackAwayData = {
      lessonId: this.lesson().id,
      tubs: prefillPackAway(this.plan(), board, this.lesson().tubs),
      partNames: this.partNames(),
    };
    this.dialog
      .open<PackAwayDialog, PackAwayData, boolean>(PackAwayDialog, { data, width: '40rem' })
      .afterClosed()
      .pipe(filter(Boolean))
      .subscribe(() =>
        this.notifier.info('Pack-away recorded: the tubs’ stock and the next plans now follow it.'),
      );
  }
}
