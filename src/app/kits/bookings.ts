import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Booking, BookingsResponse } from '../../../shared/schemas/bookings';
import { clockSpan, SCHOOL_LOCALE } from '../../../shared/text/clock';
import { listWords, plural } from '../../../shared/text/plural';
import { addDays, mondayOf, today } from '../home/agenda-api';
import { apiResource } from '../http/resource';
import { KitsApi } from './kits-api';

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

/** `/kits/bookings`: which tubs every lesson of the school books, a week at a time. */
@Component({
  selector: 'app-bookings',
  imports: [RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './bookings.html',
  styleUrl: './bookings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Bookings {
  private readonly api = inject(KitsApi);

  /** The Monday of the week shown; the current week first. */
  protected readonly monday = signal(mondayOf(today()));
  private readonly read = apiResource({
    params: () => this.monday(),
    load: (monday: string) => this.api.bookings(monday, addDays(monday, 7)),
  });
  protected readonly loading = this.read.loading;
  protected readonly error = this.read.error;

  protected readonly weekLabel = computed(
    () => `${dayHeading(this.monday())} to ${dayHeading(addDays(this.monday(), 6))}`,
  );

  /** Monday to Friday always; a weekend day only when something is booked on it. */
  protected readonly days = computed<DayView[]>(() => {
    const answer: BookingsResponse | undefined = this.read.value();
    if (!answer) return [];
    return answer.days
      .filter((d, i) => i % 7 < 5 || d.bookings.length > 0)
      .map((d) => ({ date: d.date, heading: dayHeading(d.date), bookings: d.bookings }));
  });

  protected readonly summary = computed(() => {
    const all = this.days().flatMap((d) => d.bookings);
    const clashes = all.filter((b) => b.conflict).length;
    if (all.length === 0) return 'No lessons book tubs this week.';
    return (
      `${plural(all.length, 'lesson')} this week` +
      (clashes ? `, ${plural(clashes, 'lesson')} double-booked.` : ', none double-booked.')
    );
  });

  protected readonly time = (b: Booking) => clockSpan(b.startsAt, b.endsAt);
  protected readonly conflictWords = conflictWords;

  protected previousWeek(): void {
    this.monday.update((m) => addDays(m, -7));
  }

  protected nextWeek(): void {
    this.monday.update((m) => addDays(m, 7));
  }

  protected thisWeek(): void {
    this.monday.set(mondayOf(today()));
  }
}
