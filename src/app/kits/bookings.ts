import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
} from '@angular/core';
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

  /** `?week=2026-08-04` opens on the week holding that date (a link to a week); else this week. */
  readonly week = input<string>();
  /** The Monday of the week shown. */
  protected readonly monday = linkedSignal(() => mondayOf(asDate(this.week()) ?? today()));
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
  protected readonly tubsByKit = tubsByKit;
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
