import { HttpTestingController, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { Booking } from '../../../shared/schemas/bookings';
import { Session } from '../auth/session';
import { Blank, demoUser, testProviders } from '../testing/test-providers';
import { DEFAULT_PREP } from '../../../shared/schemas/school';
import { Bookings, conflictWords } from './bookings';

/** Every day of [from, to), with the bookings given on some of them (the API's answer). */
function range(from: string, to: string, byDate: Record<string, Booking[]> = {}) {
  const [y, m, d] = from.split('-').map(Number) as [number, number, number];
  const days: { date: string; bookings: Booking[] }[] = [];
  for (let i = 0; ; i++) {
    const date = new Date(Date.UTC(y, m - 1, d + i)).toISOString().slice(0, 10);
    if (date >= to) return { days };
    days.push({ date, bookings: byDate[date] ?? [] });
  }
}

/** Seven days from `monday`, with the bookings given on some of them. */
function week(monday: string, byDate: Record<string, Booking[]> = {}) {
  const [y, m, d] = monday.split('-').map(Number) as [number, number, number];
  return range(monday, new Date(Date.UTC(y, m - 1, d + 7)).toISOString().slice(0, 10), byDate);
}

const TERM_3 = { id: 't3', name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' };

function school(terms: (typeof TERM_3)[]) {
  return {
    id: 'school-kestrel-ridge',
    name: 'Kestrel Ridge Primary School',
    timezone: 'Australia/Adelaide',
    paperSize: 'A4',
    prep: { ...DEFAULT_PREP },
    terms,
    periods: [],
    nonTeachingDays: [],
    version: 1,
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
    readable: true,
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

  /**
   * Answers the opening reads: the school's terms, then the bookings from this week's Monday to
   * the end of the term (Term 3 ends Friday 25 September, so `to` is the 26th).
   */
  async function open(byDate: Record<string, Booking[]> = {}, terms = [TERM_3]): Promise<void> {
    backend.expectOne('/api/school').flush({ school: school(terms) });
    await settle(fixture);
    const to = terms.length ? '2026-09-26' : '2026-11-11';
    expectWeek('2026-08-03', to).flush(range('2026-08-03', to, byDate));
    await settle(fixture);
  }

  const button = (label: string) =>
    [...el().querySelectorAll('button')].find((b) => b.textContent?.includes(label))!;

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
    await open({ '2026-08-04': [lesson2, lesson9] });
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

  it('stays on this week and says so when nothing is booked this term', async () => {
    await open();
    expectWeek('2026-08-03', '2026-08-10').flush(week('2026-08-03'));
    await settle(fixture);
    expect(el().querySelector('.week-label')?.textContent).toContain('Monday 3 August');
    expect(el().textContent).toContain('No lessons book tubs this week.');
    expect(el().querySelector('.nothing-ahead')?.textContent).toContain(
      'No bookings this term (Term 3).',
    );
  });

  it('opens on the next week with a booking when this week has none', async () => {
    const later = booking('l5', 'Lesson 5', '2026-08-19T11:10', '2026-08-19T12:00', ['Tub 4']);
    // Nothing in the weeks of 3 and 10 August; the first booking is on Wednesday 19 August.
    await open({ '2026-08-19': [later] });
    expectWeek('2026-08-17', '2026-08-24').flush(week('2026-08-17', { '2026-08-19': [later] }));
    await settle(fixture);
    expect(el().querySelector('.week-label')?.textContent).toContain('Monday 17 August');
    expect(el().textContent).toContain('Lesson 5');
    expect(el().querySelector('.nothing-ahead')).toBeNull();
  });

  it('moves a week back and forth and returns to this week', async () => {
    await open({ '2026-08-05': [booking('w', 'Wed', '2026-08-05T09:00', '2026-08-05T09:50', [])] });
    expectWeek('2026-08-03', '2026-08-10').flush(week('2026-08-03'));
    await settle(fixture);
    expect(el().textContent).toContain('No lessons book tubs this week.');
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

describe('Bookings for the term', () => {
  let fixture: ComponentFixture<Bookings>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    jasmine.clock().install();
    jasmine.clock().mockDate(new Date('2026-08-05T02:30:00Z'));
    TestBed.configureTestingModule({
      providers: testProviders([{ path: 'lessons/:id', component: Blank }]),
    });
    TestBed.inject(Session).update(demoUser('admin'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Bookings);
    fixture.detectChanges();
  });

  afterEach(() => {
    jasmine.clock().uninstall();
    backend.verify();
  });

  async function chooseTerm(terms: (typeof TERM_3)[]): Promise<void> {
    backend.expectOne('/api/school').flush({ school: school(terms) });
    await settle(fixture);
    const to = terms.length ? '2026-09-26' : '2026-11-11';
    backend
      .expectOne((r) => r.url === '/api/bookings' && r.params.get('to') === to)
      .flush(range('2026-08-03', to));
    await settle(fixture);
    backend.expectOne((r) => r.url === '/api/bookings').flush(week('2026-08-03'));
    await settle(fixture);
    const toggle = [...el().querySelectorAll('mat-button-toggle button')].find(
      (b) => b.textContent?.trim() === 'Term',
    ) as HTMLButtonElement;
    toggle.click();
    await settle(fixture);
  }

  it('shows the whole term’s days that have bookings, double bookings in words', async () => {
    await chooseTerm([TERM_3]);
    const clash = {
      lessonId: 'b',
      title: 'Lesson B',
      className: '5C',
      startsAt: '2026-09-08T09:30',
      endsAt: '2026-09-08T10:20',
      tubs: ['Tub 2'],
      message: '',
    };
    const a = booking('a', 'Lesson A', '2026-09-08T09:00', '2026-09-08T09:50', ['Tub 2'], [clash]);
    const b = booking(
      'b',
      'Lesson B',
      '2026-09-08T09:30',
      '2026-09-08T10:20',
      ['Tub 2'],
      [{ ...clash, lessonId: 'a', title: 'Lesson A', className: '4B', startsAt: a.startsAt }],
    );
    // An admin reads no units: the lesson is named without its unit and without a link.
    const first = {
      ...booking('f', 'First week', '2026-07-21T11:10', '2026-07-21T12:00', ['Tub 1']),
      readable: false,
      unitTitle: '',
    };
    // Term 3 from Monday 20 July to Friday 25 September: `to` is Saturday the 26th.
    backend
      .expectOne(
        (r) =>
          r.url === '/api/bookings' &&
          r.params.get('from') === '2026-07-20' &&
          r.params.get('to') === '2026-09-26',
      )
      .flush(range('2026-07-20', '2026-09-26', { '2026-07-21': [first], '2026-09-08': [a, b] }));
    await settle(fixture);
    expect(el().querySelector('.term-label')?.textContent).toContain(
      'Term 3: Monday 20 July to Friday 25 September',
    );
    // Only the days with bookings, in date order; no week navigation.
    expect([...el().querySelectorAll('h3')].map((h) => h.textContent?.trim())).toEqual([
      'Tuesday 21 July',
      'Tuesday 8 September',
    ]);
    expect(el().querySelector('nav.week')).toBeNull();
    expect(el().textContent).toContain('3 lessons this term, 2 lessons double-booked.');
    const rows = [...el().querySelectorAll('tbody tr')];
    expect(rows[0]!.querySelector('a')).toBeNull();
    expect(rows[0]!.textContent).toContain('First week');
    expect(rows[1]!.querySelector('.conflict')?.textContent).toContain(
      'Double-booked: Tub 2 with “Lesson B” (5C, 9:30 am–10:20 am)',
    );
    expect(rows[1]!.querySelector('a')?.getAttribute('href')).toBe('/lessons/a');
  });

  it('steps to the previous and next term of the school settings, and back to this term', async () => {
    const TERM_2 = { id: 't2', name: 'Term 2', startsOn: '2026-04-20', endsOn: '2026-06-26' };
    const TERM_4 = { id: 't4', name: 'Term 4', startsOn: '2026-10-12', endsOn: '2026-12-11' };
    // Out of order in the settings: the view steps by date.
    await chooseTerm([TERM_4, TERM_3, TERM_2]);
    backend
      .expectOne((r) => r.url === '/api/bookings' && r.params.get('from') === '2026-07-20')
      .flush(range('2026-07-20', '2026-09-26'));
    await settle(fixture);
    expect(el().textContent).toContain('No bookings this term.');
    const button = (name: string) =>
      [...el().querySelectorAll<HTMLButtonElement>('nav.term-nav button')].find((b) =>
        b.textContent?.includes(name),
      )!;
    button('Previous term').click();
    await settle(fixture);
    // Term 2 ends Friday 26 June: `to` is Saturday the 27th.
    backend
      .expectOne(
        (r) =>
          r.url === '/api/bookings' &&
          r.params.get('from') === '2026-04-20' &&
          r.params.get('to') === '2026-06-27',
      )
      .flush(range('2026-04-20', '2026-06-27'));
    await settle(fixture);
    expect(el().querySelector('.term-label')?.textContent).toContain('Term 2: Monday 20 April');
    expect(el().textContent).toContain('No bookings in Term 2.');
    // The first term: the button stays focusable but says it cannot go further.
    expect(button('Previous term').getAttribute('aria-disabled')).toBe('true');
    button('This term').click();
    await settle(fixture);
    backend
      .expectOne((r) => r.url === '/api/bookings' && r.params.get('from') === '2026-07-20')
      .flush(range('2026-07-20', '2026-09-26'));
    await settle(fixture);
    expect(el().querySelector('.term-label')?.textContent).toContain('Term 3');
    button('Next term').click();
    await settle(fixture);
    backend
      .expectOne((r) => r.url === '/api/bookings' && r.params.get('from') === '2026-10-12')
      .flush(range('2026-10-12', '2026-12-12'));
    await settle(fixture);
    expect(el().textContent).toContain('No bookings in Term 4.');
    expect(button('Next term').getAttribute('aria-disabled')).toBe('true');
  });

  it('says when the school has no current or coming term', async () => {
    await chooseTerm([]);
    expect(el().textContent).toContain('No current or coming term is set in the school settings.');
    expect(el().querySelectorAll('h3').length).toBe(0);
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
