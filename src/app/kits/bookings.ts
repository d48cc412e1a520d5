import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { map, switchMap, type Observable } from 'rxjs';
import {
  BOOKINGS_MAX_DAYS,
  type Booking,
  type BookingsResponse,
} from '../../../shared/schemas/bookings';
import { clockSpan, SCHOOL_LOCALE } from '../../../shared/text/clock';
import { listWords, plural } from '../../../shared/text/plural';
import { addDays, mondayOf, today } from '../home/agenda-api';
import { apiResource } from '../http/resource';
import { KitsApi } from './kits-api';
import { dayAfter, termThatMatters } from './term-range';

/** The text when it is a calendar date that exists (`2026-02-30` is not), else undefined. */
function asDate(text: string | undefined): string | undefined {
  if (!text || !/^\d{4}-\d{2}-\d{2}$/.test(text)) return undefined;
  const [y, m, d] = text.split('-').map(Number) as [number, number, number];
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCMonth() === m - 1 && t.getUTCDate() === d && y >= 2000 ? text : undefined;
}

/** One day as the screen shows it: a heading and its bookings in time order. */
interface DayView {
  date: string;
  heading: string;
  bookings: Booking[];
}

const dayFormat = new Intl.DateTimeFormat(SCHOOL_LOCALE, {
  weekday: 'long',
  day: 'numeric',
  month: 'long',
  timeZone: 'UTC',
});

/** `Tuesday 2 March` of a calendar date (UTC in, UTC out: no shift into the reader's zone). */
export function dayHeading(date: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return dayFormat.format(Date.UTC(y, m - 1, d)).replace(',', '');
}

/**
 * `Double-booked: Tub 3 with “Lesson 9” (4B, 9:30 am–10:20 am)`: what clashes, in words, so the
 * mark never rests on its icon or colour alone.
 */
export function conflictWords(c: Booking['conflicts'][number]): string {
  return (
    `Double-booked: ${listWords(c.tubs)} with “${c.title}” ` +
    `(${c.className}, ${clockSpan(c.startsAt, c.endsAt)})`
  );
}

/** A booking's tubs under their kit type's name, so a name is not repeated for every tub. */
export function tubsByKit(b: Booking): { kitTypeName: string; labels: string }[] {
  const groups = new Map<string, string[]>();
  for (const t of b.tubs)
    groups.set(t.kitTypeName, [...(groups.get(t.kitTypeName) ?? []), t.label]);
  return [...groups].map(([kitTypeName, labels]) => ({ kitTypeName, labels: labels.join(', ') }));
}

/** The term the view is about: the current one, else the next (null when neither is set). */
export interface OpeningTerm {
  name: string;
  startsOn: string;
  endsOn: string;
}

/** The Monday of the first week of `answer` with a booking, or undefined when none has one. */
export function firstBookedWeek(answer: BookingsResponse): string | undefined {
  const day = answer.days.find((d) => d.bookings.length > 0);
  return day ? mondayOf(day.date) : undefined;
}

/** [from, to) of a term as the API takes it: at most BOOKINGS_MAX_DAYS days from its start. */
export function termRange(term: OpeningTerm): { from: string; to: string; cut: boolean } {
  const end = dayAfter(term.endsOn);
  const most = addDays(term.startsOn, BOOKINGS_MAX_DAYS);
  return { from: term.startsOn, to: end < most ? end : most, cut: end > most };
}

/** What the view opens on: the term that matters and whether anything is booked from now on. */
interface Opening {
  term: OpeningTerm | null;
  /** Every term set in the school settings, in date order (the term view steps through them). */
  terms: OpeningTerm[];
  /** The Monday of this week if it has a booking, else of the next week that has one. */
  firstWeek: string | undefined;
}

/**
 * `/kits/bookings`: which tubs every lesson of the school books, a week at a time or the whole
 * term. It opens on this week when something is booked in it, else on the next week that has a
 * booking (looking to the end of the current or next term, at most 100 days ahead).
 */
@Component({
  selector: 'app-bookings',
  imports: [
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  templateUrl: './bookings.html',
  styleUrl: './bookings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Bookings {
  private readonly api = inject(KitsApi);

  /** `?week=2026-08-04` opens on the week holding that date (a link to a week). */
  readonly week = input<string>();
  /** A week at a time, or the whole term. */
  protected readonly mode = signal<'week' | 'term'>('week');

  private readonly opening = apiResource({
    load: (): Observable<Opening> =>
      this.api.terms().pipe(
        map((terms) => [...terms].sort((a, b) => a.startsOn.localeCompare(b.startsOn))),
        switchMap((terms) => {
          const term = termThatMatters(terms, today());
          const from = mondayOf(today());
          const most = addDays(from, BOOKINGS_MAX_DAYS);
          const end = term ? dayAfter(term.endsOn) : most;
          return this.api
            .bookings(from, end < most ? end : most)
            .pipe(map((answer) => ({ term, terms, firstWeek: firstBookedWeek(answer) })));
        }),
      ),
  });
  /** Settled once the opening read has answered or failed (a failure opens on this week). */
  private readonly opened = computed(() => !this.opening.loading());
  /** The current or next term: what "this term" means on the screen. */
  protected readonly term = computed(() => this.opening.value()?.term ?? null);
  private readonly terms = computed(() => this.opening.value()?.terms ?? []);
  /** The term the term view shows: the current or next one, until another is chosen. */
  protected readonly shownTerm = linkedSignal<OpeningTerm | null>(() => this.term());
  private readonly shownIndex = computed(() => {
    const shown = this.shownTerm();
    return shown ? this.terms().findIndex((t) => t.startsOn === shown.startsOn) : -1;
  });
  protected readonly previousTerm = computed(() =>
    this.shownIndex() > 0 ? this.terms()[this.shownIndex() - 1]! : null,
  );
  protected readonly nextTerm = computed(() => {
    const i = this.shownIndex();
    return i >= 0 && i + 1 < this.terms().length ? this.terms()[i + 1]! : null;
  });
  /** Whether the term view shows the current or next term (else it names the term shown). */
  private readonly shownIsThisTerm = computed(
    () => this.shownTerm()?.startsOn === this.term()?.startsOn,
  );
  /** Nothing booked from this week to the end of the term (or 100 days). */
  protected readonly nothingAhead = computed(() => {
    const o = this.opening.value();
    return o !== undefined && o.firstWeek === undefined;
  });

  /** The Monday of the week shown. */
  protected readonly monday = linkedSignal(() =>
    mondayOf(asDate(this.week()) ?? this.opening.value()?.firstWeek ?? today()),
  );
  private readonly weekRead = apiResource({
    params: () => (this.opened() && this.mode() === 'week' ? this.monday() : undefined),
    load: (monday: string) => this.api.bookings(monday, addDays(monday, 7)),
  });
  private readonly termRead = apiResource({
    params: () => {
      const term = this.shownTerm();
      if (this.mode() !== 'term' || !term) return undefined;
      const { from, to } = termRange(term);
      return `${from}/${to}`;
    },
    load: (range: string) => {
      const [from, to] = range.split('/') as [string, string];
      return this.api.bookings(from, to);
    },
  });

  protected readonly loading = computed(
    () =>
      this.opening.loading() || (this.mode() === 'week' ? this.weekRead : this.termRead).loading(),
  );
  protected readonly error = computed(
    () =>
      (this.mode() === 'week' ? this.weekRead : this.termRead).error() ??
      (this.mode() === 'term' ? this.opening.error() : null),
  );

  protected readonly weekLabel = computed(
    () => `${dayHeading(this.monday())} to ${dayHeading(addDays(this.monday(), 6))}`,
  );
  protected readonly termLabel = computed(() => {
    const term = this.shownTerm();
    if (!term) return '';
    const { to, cut } = termRange(term);
    return (
      `${term.name}: ${dayHeading(term.startsOn)} to ${dayHeading(term.endsOn)}` +
      (cut ? ` (the first ${BOOKINGS_MAX_DAYS} days, to ${dayHeading(addDays(to, -1))})` : '')
    );
  });

  /**
   * A week: Monday to Friday always, a weekend day only when something is booked on it. The
   * term: the days that have bookings.
   */
  protected readonly days = computed<DayView[]>(() => {
    const week = this.mode() === 'week';
    const answer: BookingsResponse | undefined = (week ? this.weekRead : this.termRead).value();
    if (!answer) return [];
    return answer.days
      .filter((d, i) => d.bookings.length > 0 || (week && i % 7 < 5))
      .map((d) => ({ date: d.date, heading: dayHeading(d.date), bookings: d.bookings }));
  });

  protected readonly summary = computed(() => {
    const all = this.days().flatMap((d) => d.bookings);
    const clashes = all.filter((b) => b.conflict).length;
    const span =
      this.mode() === 'week'
        ? 'this week'
        : this.shownIsThisTerm()
          ? 'this term'
          : `in ${this.shownTerm()?.name ?? 'the term'}`;
    if (all.length === 0)
      return this.mode() === 'week' ? 'No lessons book tubs this week.' : `No bookings ${span}.`;
    return (
      `${plural(all.length, 'lesson')} ${span}` +
      (clashes ? `, ${plural(clashes, 'lesson')} double-booked.` : ', none double-booked.')
    );
  });

  protected readonly time = (b: Booking) => clockSpan(b.startsAt, b.endsAt);
  protected readonly tubsByKit = tubsByKit;
  protected readonly conflictWords = conflictWords;

  protected previousWeek(): void {
    this.monday.update((m) => addDays(m, -7));
  }

  protected nextWeek(): void {
    this.monday.update((m) => addDays(m, 7));
  }

  /** Steps the term view to another term of the school settings. */
  protected showTerm(term: OpeningTerm | null): void {
    if (term) this.shownTerm.set(term);
  }

  protected thisWeek(): void {
    this.monday.set(mondayOf(today()));
  }
}
