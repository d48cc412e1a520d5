import { HttpTestingController, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { Booking } from '../../../shared/schemas/bookings';
import { Session } from '../auth/session';
import { Blank, demoUser, testProviders } from '../testing/test-providers';
import { Bookings, conflictWords } from './bookings';

/** Seven days from `monday`, with the bookings given on some of them. */
function week(monday: string, byDate: Record<string, Booking[]> = {}) {
  const [y, m, d] = monday.split('-').map(Number) as [number, number, number];
  return {
    days: Array.from({ length: 7 }, (_, i) => {
      const date = new Date(Date.UTC(y, m - 1, d + i)).toISOString().slice(0, 10);
      return { date, bookings: byDate[date] ?? [] };
    }),
  };
}

function booking(
  id: string,
  title: string,
  from: string,
  to: string,
  tubs: string[],
  clashWith: Booking['conflicts'] = [],
): Booking {
  return {
    lessonId: id,
    lessonTitle: title,
    unitTitle: 'Moving machines',
    className: '4B',
    startsAt: from,
    endsAt: to,
    tubs: tubs.map((label) => ({ id: `tub-${label}`, label, kitTypeName: 'Rover Builder Tub' })),
    conflict: clashWith.length > 0,
    conflicts: clashWith,
  };
}

/** Lets a flushed answer land and the screen render it. */
async function settle(fixture: ComponentFixture<Bookings>): Promise<void> {
  await new Promise((resolve) => requestAnimationFrame(resolve));
  TestBed.tick();
  fixture.detectChanges();
}

describe('Bookings', () => {
  let fixture: ComponentFixture<Bookings>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  function expectWeek(from: string, to: string): TestRequest {
    return backend.expectOne(
      (r) =>
        r.url === '/api/bookings' && r.params.get('from') === from && r.params.get('to') === to,
    );
  }

  beforeEach(() => {
    jasmine.clock().install();
    // Wednesday 5 August 2026, noon in Adelaide: the week shown starts on Monday 3 August.
    jasmine.clock().mockDate(new Date('2026-08-05T02:30:00Z'));
    TestBed.configureTestingModule({
      providers: testProviders([{ path: 'lessons/:id', component: Blank }]),
    });
    TestBed.inject(Session).update(demoUser('teacher'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Bookings);
    fixture.detectChanges();
  });

  afterEach(() => {
    jasmine.clock().uninstall();
    backend.verify();
  });

  it('opens on the current week and marks a double booking in words, not colour alone', async () => {
    const lesson9 = booking('l9', 'Lesson 9', '2026-08-04T09:30', '2026-08-04T10:20', ['Tub 3']);
    const lesson2 = booking(
      'l2',
      'Lesson 2',
      '2026-08-04T09:00',
      '2026-08-04T09:50',
      ['Tub 1', 'Tub 3'],
      [
        {
          lessonId: 'l9',
          title: 'Lesson 9',
          className: '5C',
          startsAt: '2026-08-04T09:30',
          endsAt: '2026-08-04T10:20',
          tubs: ['Tub 3'],
          message: 'unused here',
        },
      ],
    );
    // The ISO week of 5 August 2026 runs Monday 3 to Sunday 9; `to` is the day after.
    expectWeek('2026-08-03', '2026-08-10').flush(
      week('2026-08-03', { '2026-08-04': [lesson2, lesson9] }),
    );
    await settle(fixture);
    const rows = [...el().querySelectorAll('tbody tr')];
    expect(rows.length).toBe(2);
    expect(rows[0]!.textContent).toContain('9:00 am–9:50 am');
    expect(rows[0]!.textContent).toContain('Tub 1');
    const clash = rows[0]!.querySelector('.conflict');
    expect(clash?.textContent).toContain(
      'Double-booked: Tub 3 with “Lesson 9” (5C, 9:30 am–10:20 am)',
    );
    expect(clash?.querySelector('mat-icon')?.getAttribute('aria-hidden')).toBe('true');
    expect(rows[1]!.querySelector('.conflict')).toBeNull();
    const link = rows[0]!.querySelector('a');
    expect(link?.getAttribute('href')).toBe('/lessons/l2');
    // Monday to Friday always; the empty weekend is left out.
    const headings = [...el().querySelectorAll('h3')].map((h) => h.textContent?.trim());
    expect(headings).toEqual([
      'Monday 3 August',
      'Tuesday 4 August',
      'Wednesday 5 August',
      'Thursday 6 August',
      'Friday 7 August',
    ]);
    expect(el().textContent).toContain('2 lessons this week, 1 lesson double-booked.');
  });

  it('moves a week back and forth and returns to this week', async () => {
    expectWeek('2026-08-03', '2026-08-10').flush(week('2026-08-03'));
    await settle(fixture);
    expect(el().textContent).toContain('No lessons book tubs this week.');
    const button = (label: string) =>
      [...el().querySelectorAll('button')].find((b) => b.textContent?.includes(label))!;
    button('Next week').click();
    await settle(fixture);
    const saturday = booking('s', 'Club day', '2026-08-15T10:00', '2026-08-15T11:00', ['Tub 2']);
    expectWeek('2026-08-10', '2026-08-17').flush(week('2026-08-10', { '2026-08-15': [saturday] }));
    await settle(fixture);
    expect(el().querySelector('.week-label')?.textContent).toContain('Monday 10 August');
    // A weekend day shows when something is booked on it.
    expect(el().textContent).toContain('Saturday 15 August');
    expect(el().textContent).toContain('Club day');
    button('Previous week').click();
    await settle(fixture);
    expectWeek('2026-08-03', '2026-08-10').flush(week('2026-08-03'));
    await settle(fixture);
    button('Previous week').click();
    await settle(fixture);
    expectWeek('2026-07-27', '2026-08-03').flush(week('2026-07-27'));
    await settle(fixture);
    button('This week').click();
    await settle(fixture);
    expectWeek('2026-08-03', '2026-08-10').flush(week('2026-08-03'));
    await settle(fixture);
    expect(el().querySelector('.week-label')?.textContent).toContain('Monday 3 August');
  });
});

describe('conflictWords', () => {
  it('names every shared tub in one sentence', () => {
    expect(
      conflictWords({
        lessonId: 'x',
        title: 'Gears',
        className: '6A',
        startsAt: '2026-08-04T13:00',
        endsAt: '2026-08-04T13:50',
        tubs: ['Tub 1', 'Tub 2', 'Tub 10'],
        message: '',
      }),
    ).toBe('Double-booked: Tub 1, Tub 2 and Tub 10 with “Gears” (6A, 1:00 pm–1:50 pm)');
  });
});
