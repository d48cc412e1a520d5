import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { catchError, of, switchMap, tap } from 'rxjs';
import { ROLE_LABELS } from '../../../shared/schemas/common';
import { Session } from '../auth/session';
import { clockTime, dayLabel } from '../lessons/clock';
import { AgendaApi, DEMO_WEEK, addDays, mondayOf, today, type Agenda } from './agenda-api';

/** The first page after sign-in: the signed-in person's week of lessons and prep. */
@Component({
  selector: 'app-home',
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './home.html',
  styleUrl: './home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Home {
  private readonly api = inject(AgendaApi);
  protected readonly user = inject(Session).user;
  protected readonly roleLabel = computed(() => {
    const user = this.user();
    return user ? ROLE_LABELS[user.role] : '';
  });

  protected readonly demoWeek = DEMO_WEEK;
  protected readonly week = signal(mondayOf(today()));
  protected readonly agenda = signal<Agenda | null>(null);
  protected readonly loading = signal(true);
  protected readonly empty = computed(() => {
    const a = this.agenda();
    return !!a && a.lessons.length === 0 && a.tasks.length === 0;
  });

  constructor() {
    // switchMap: clicking through weeks quickly never lets an older week's answer win.
    toObservable(this.week)
      .pipe(
        tap(() => this.loading.set(true)),
        switchMap((week) => this.api.week(week).pipe(catchError(() => of(null)))),
        takeUntilDestroyed(),
      )
      .subscribe((agenda) => {
        this.loading.set(false);
        if (agenda) this.agenda.set(agenda);
      });
  }

  protected move(weeks: number): void {
    this.week.update((w) => addDays(w, weeks * 7));
  }

  protected goTo(week: string): void {
    this.week.set(mondayOf(week));
  }

  protected weekLabel(): string {
    const w = this.week();
    return `${dayLabel(`${w}T00:00`, false)} – ${dayLabel(`${addDays(w, 6)}T00:00`)}`;
  }

  protected day(value: string): string {
    return dayLabel(value, false);
  }

  protected clock(value: string): string {
    return clockTime(value);
  }
}
