import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  linkedSignal,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { ROLE_LABELS } from '../../../shared/schemas/common';
import { Session } from '../auth/session';
import { apiResource } from '../http/resource';
import { focusAfter } from '../a11y/focus-after';
import { clockTime, dayLabel } from '../lessons/clock';
import { ReviewSummaryCard } from '../review/review-summary';
import { AgendaApi, addDays, mondayOf, today, type Agenda } from './agenda-api';

/** The first page after sign-in: the signed-in person's week of lessons and prep. */
@Component({
  selector: 'app-home',
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, ReviewSummaryCard],
  templateUrl: './home.html',
  styleUrl: './home.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Home {
  private readonly api = inject(AgendaApi);
  private readonly focus = focusAfter();
  protected readonly user = inject(Session).user;
  protected readonly roleLabel = computed(() => {
    const user = this.user();
    return user ? ROLE_LABELS[user.role] : '';
  });
  /** Leads and admins review units: what waits for them and the term's gaps come first. */
  protected readonly reviews = computed(() => {
    const role = this.user()?.role;
    return role === 'lead' || role === 'admin';
  });

  protected readonly week = signal(mondayOf(today()));
  /**
   * Until the person moves, Home looks for the week that matters: this week when it holds one
   * of their lessons, else the next week that does (never a later one).
   */
  private opening = true;
  /** The week's agenda; a newer week replaces an older one's answer still on its way. */
  private readonly read = apiResource({
    params: () => this.week(),
    load: (week: string) => this.api.week(week),
  });
  /** The week shown: the last one read, kept while the next loads (or if it fails to). */
  protected readonly agenda = linkedSignal<Agenda | undefined, Agenda | null>({
    source: this.read.value,
    computation: (agenda, previous) => agenda ?? previous?.value ?? null,
  });
  protected readonly loading = this.read.loading;
  /** The empty week's pointer: the next week with lessons, else the last one. */
  protected readonly elsewhere = computed(() => {
    const weeks = this.agenda()?.otherWeeks;
    if (weeks?.next) return { week: weeks.next, label: 'Go to your next week with lessons' };
    if (weeks?.previous)
      return { week: weeks.previous, label: 'Go back to your last week with lessons' };
    return null;
  });
  protected readonly empty = computed(() => {
    const a = this.agenda();
    return !!a && a.lessons.length === 0 && a.tasks.length === 0;
  });

  constructor() {
    effect(() => {
      const first = this.read.value();
      if (!first || !this.opening) return;
      this.opening = false;
      if (first.lessons.length === 0 && first.otherWeeks.next)
        untracked(() => this.week.set(first.otherWeeks.next!));
    });
  }

  protected move(weeks: number): void {
    this.opening = false;
    this.week.update((w) => addDays(w, weeks * 7));
  }

  protected goTo(week: string): void {
    this.opening = false;
    this.week.set(mondayOf(week));
    // The link goes away once the week's lessons arrive: focus moves to the week shown (SC 2.4.3).
    this.focus('.week-heading');
  }

  protected weekOf(week: string): string {
    return dayLabel(`${week}T00:00`);
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
