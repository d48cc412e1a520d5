import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatDialog } from '@angular/material/dialog';
import { filter, switchMap, type Subscription } from 'rxjs';
import { confirm } from '../forms/confirm-dialog';
import { groupDone, type TrayBoard as Board } from '../../../shared/schemas/trays';
import { Notifier } from '../errors/notifier';
import { clockTime } from './clock';
import { TrayBoardApi } from './tray-board-api';

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

  readonly lessonId = input.required<string>();
  /** The plan's pack-away start, ISO 8601 with the school's offset. */
  readonly packAwayStartsAt = input<string | null>(null);
  /** Part code → name, for the missing lists. */
  readonly partNames = input<ReadonlyMap<string, string>>(new Map());
  /** Whether this person runs the lesson (may replace codes and record the pack-away). */
  readonly canRun = input(false);
  /** Asks the lesson page to open the pack-away audit with the groups' missing counts. */
  readonly recordPackAway = output<Board>();

  protected readonly board = signal<Board | null>(null);
  protected readonly now = signal(Date.now());
  protected readonly doneCount = computed(
    () => this.board()?.groups.filter((g) => groupDone(g)).length ?? 0,
  );
  protected readonly done = groupDone;
  protected readonly clock = clockTime;
  protected readonly countdownText = computed(() => {
    const at = this.packAwayStartsAt();
    if (!at) return null;
    const left = (Date.parse(at) - this.now()) / 1000;
    return left > 0
      ? `Pack-away starts at ${clockTime(at)}: in ${countdown(left)}`
      : `Pack-away started at ${clockTime(at)}, ${countdown(-left)} ago`;
  });

  constructor() {
    let stream: Subscription | null = null;
    effect(() => {
      const id = this.lessonId();
      untracked(() => {
        stream?.unsubscribe();
        stream = this.api.live(id).subscribe((b) => this.board.set(b));
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
        switchMap(() => this.api.revoke(this.lessonId())),
      )
      .subscribe((r) => {
        this.notifier.info(
          `${r.revoked} tray ${r.revoked === 1 ? 'code' : 'codes'} stopped. Print the labels again.`,
        );
      });
  }

  protected record(): void {
    const b = this.board();
    if (b) this.recordPackAway.emit(b);
  }
}
