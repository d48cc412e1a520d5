import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { map, tap } from 'rxjs';
import type { TrayLine, TrayLineUpdate, TrayView } from '../../../shared/schemas/trays';
import { AppError } from '../errors/app-error';
import { apiResource } from '../http/resource';
import { clockTime, dayLabel } from '../lessons/clock';
import { CAUTIONS_DEFER, SAFETY_CAUTIONS } from '../lessons/cautions';
import { TrayApi } from './tray-api';
import { TapQueue } from './tray-queue';

/** How often waiting taps are tried again while the network is away. */
const RETRY_MS = 5_000;

/**
 * A group's tray page, opened from the QR code on its tray label: the pull list with out and
 * back ticks and a missing count per line. Each tap is saved at once; taps made offline wait in
 * the browser and are sent, in order, when the network returns (and after a reload).
 */
@Component({
  selector: 'app-tray-page',
  imports: [RouterLink, MatButtonModule, MatIconModule],
  templateUrl: './tray-page.html',
  styleUrl: './tray-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrayPage {
  private readonly api = inject(TrayApi);

  /** The token from the address (`/tray/:token`). */
  readonly token = input.required<string>();

  /** This token's taps not yet saved on the server, kept in the browser across reloads. */
  private readonly queue = computed(() => new TapQueue(`trayplan.tray.${this.token()}`));
  /** The group's tray as read, then as tapped here (each tap shows at once). */
  private readonly read = apiResource({
    params: () => this.token(),
    load: (token: string) =>
      this.api.tray(token).pipe(
        // Taps that were not saved yet still show as tapped.
        map((view) =>
          this.queue()
            .all()
            .reduce((shown, t) => applyTap(shown, t.partCode, t.change), view),
        ),
        // The page works: send what is waiting.
        tap(() => this.flush()),
      ),
  });
  protected readonly view = computed(() => this.read.value() ?? null);
  /** A tap the server refused for good (the read's own failure otherwise). */
  private readonly refused = signal<string | null>(null);
  protected readonly problem = computed(() => this.refused() ?? this.read.error());
  /** Taps not yet saved on the server. */
  protected readonly waiting = linkedSignal(() => this.queue().length);
  protected readonly offline = signal(false);
  private sending = false;
  private retry: ReturnType<typeof setTimeout> | null = null;

  protected readonly small = computed(() => this.view()?.group.lines.some((l) => l.small) ?? false);
  protected readonly batteries = computed(() => {
    const v = this.view();
    return !!v && (v.group.controllerLabel !== null || v.group.lines.some((l) => l.rechargeable));
  });
  protected readonly cautions = computed(() =>
    SAFETY_CAUTIONS.filter(
      (c) =>
        (c.title === 'Small parts' && this.small()) ||
        (c.title === 'Batteries and charging' && this.batteries()) ||
        c.title === 'Overheating',
    ),
  );
  protected readonly defer = CAUTIONS_DEFER;
  protected readonly counts = computed(() => {
    const lines = this.view()?.group.lines ?? [];
    return {
      out: lines.filter((l) => l.out).length,
      back: lines.filter((l) => l.back).length,
      total: lines.length,
    };
  });

  constructor() {
    const online = () => {
      this.offline.set(false);
      this.flush();
    };
    globalThis.addEventListener?.('online', online);
    inject(DestroyRef).onDestroy(() => {
      globalThis.removeEventListener?.('online', online);
      if (this.retry) clearTimeout(this.retry);
    });
  }

  protected when(view: TrayView): string {
    const { startsAt, endsAt } = view.lesson;
    return `${dayLabel(startsAt)}, ${clockTime(startsAt)}–${clockTime(endsAt)}`;
  }

  /** Pieces that come from another tub than the group's home tub (they go back there). */
  protected borrows(line: TrayLine): { tub: string; qty: number }[] {
    const home = this.view()?.group.homeTub;
    return line.sources.filter((s) => s.tub !== home && s.qty > 0);
  }

  protected toggle(line: TrayLine, field: 'out' | 'back'): void {
    this.tap(line, { [field]: !line[field] });
  }

  protected step(line: TrayLine, by: number): void {
    const missing = Math.min(line.qty, Math.max(0, line.missing + by));
    if (missing !== line.missing) this.tap(line, { missing });
  }

  private tap(line: TrayLine, change: TrayLineUpdate): void {
    const view = this.view();
    if (!view) return;
    this.read.set(applyTap(view, line.partCode, change));
    const queue = this.queue();
    queue.push({ partCode: line.partCode, change });
    this.waiting.set(queue.length);
    this.flush();
  }

  /** Sends the waiting taps one at a time, oldest first. */
  private flush(): void {
    const queue = this.queue();
    const oldest = queue.peek();
    if (!oldest || this.sending) return;
    this.sending = true;
    this.api.saveLine(this.token(), oldest.partCode, oldest.change).subscribe({
      next: () => {
        this.sending = false;
        queue.shift();
        this.waiting.set(queue.length);
        this.offline.set(false);
        this.flush();
      },
      error: (err: AppError) => {
        this.sending = false;
        if (err.status === 0 || err.status >= 500 || err.status === 429) {
          // Not reached (or busy): keep the tap and try again later.
          this.offline.set(true);
          if (this.retry) clearTimeout(this.retry);
          this.retry = setTimeout(() => this.flush(), RETRY_MS);
          return;
        }
        // Refused for good (the code was replaced, the lesson's day is over, the plan changed).
        queue.shift();
        this.waiting.set(queue.length);
        this.refused.set(err.message);
        this.flush();
      },
    });
  }
}

/** The view with one tap applied to one line. */
export function applyTap(view: TrayView, partCode: string, change: TrayLineUpdate): TrayView {
  return {
    ...view,
    group: {
      ...view.group,
      lines: view.group.lines.map((l) => (l.partCode === partCode ? { ...l, ...change } : l)),
    },
  };
}
