import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { Session } from '../auth/session';
import { demoUser, settleReads, testProviders } from '../testing/test-providers';
import { addDays, mondayOf, today, type Agenda } from './agenda-api';
import { Home } from './home';

const LESSON = {
  id: 'lesson-2',
  title: 'Drive train',
  unitId: 'unit-rovers',
  unitTitle: 'Rescue Rovers',
  className: '4K',
  startsAt: '2026-07-28T11:10',
  endsAt: '2026-07-28T12:00',
};

/** An invented week; the task times follow PREP-RULES.md's worked example (charge by 07:55). */
const WEEK: Agenda = {
  week: '2026-07-27',
  lessons: [{ ...LESSON, groups: 7, shortfalls: 1 }],
  tasks: [
    {
      kind: 'charge',
      key: 'charge:RB-001',
      label: 'Charge 7 × Controller',
      minutes: 180,
      startBy: '2026-07-28T07:55:00+09:30',
      doneBy: '2026-07-28T10:55:00+09:30',
      lesson: LESSON,
      tick: { at: '2026-07-28T07:50:00+09:30', by: { id: 'user-2', name: 'Sam Partner' } },
    },
    {
      kind: 'pull',
      key: 'pull',
      label: 'Pull parts for 7 groups',
      minutes: 12,
      startBy: '2026-07-28T10:58:00+09:30',
      doneBy: '2026-07-28T11:10:00+09:30',
      lesson: LESSON,
      tick: null,
    },
  ],
  attention: [{ lesson: LESSON, kind: 'shortfall', message: '1 × RB-001 short for group 7.' }],
  otherWeeks: { previous: '2026-07-20', next: '2026-08-03' },
};

/** A week without lessons, and the nearest weeks with some either side. */
const empty = (week: string, previous: string | null, next: string | null): Agenda => ({
  week,
  lessons: [],
  tasks: [],
  attention: [],
  otherWeeks: { previous, next },
});

describe('mondayOf and addDays', () => {
  it('finds the Monday of a week (ISO 8601 weeks start on Monday)', () => {
    // 2026-07-28 is a Tuesday, 2026-08-02 a Sunday (Python datetime.date(...).strftime('%a')).
    expect(mondayOf('2026-07-28')).toBe('2026-07-27');
    expect(mondayOf('2026-08-02')).toBe('2026-07-27');
    expect(mondayOf('2026-07-27')).toBe('2026-07-27');
    expect(addDays('2026-07-27', 7)).toBe('2026-08-03');
    expect(addDays('2026-03-02', -7)).toBe('2026-02-23');
  });
});

describe('Home', () => {
  let fixture: ComponentFixture<Home>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('teacher'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Home);
    loader = TestbedHarnessEnvironment.loader(fixture);
    // The week is a resource read: the page is stable only once its answer is flushed.
    fixture.detectChanges();
    await settleReads();
  });

  afterEach(() => backend.verify());

  const url = (week: string) => `/api/agenda?week=${week}&mine=true`;

  /**
   * Clicks a week button and answers the read it starts: the harness's click waits for the page
   * to be stable, which a resource read is not until its answer arrives.
   */
  async function clickAndAnswer(button: MatButtonHarness, week: string, body: Agenda) {
    const clicked = button.click();
    await settleReads();
    backend.expectOne(url(week)).flush(body);
    await clicked;
  }

  it('opens on this week when it holds a lesson of this person', async () => {
    const current = mondayOf(today());
    backend.expectOne(url(current)).flush({ ...WEEK, week: current });
    await fixture.whenStable();
    // No second read (afterEach verifies): the week with a lesson is the one that matters.
    expect((fixture.nativeElement as HTMLElement).querySelector('.lessons')!.textContent).toContain(
      'Drive train',
    );
  });

  it('opens on the next week with their lessons when this week has none', async () => {
    const current = mondayOf(today());
    const next = addDays(current, 21);
    backend.expectOne(url(current)).flush(empty(current, null, next));
    await settleReads();
    backend.expectOne(url(next)).flush(WEEK);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('h2')!.textContent).toContain(
      `Week of Mon ${Number(next.slice(8, 10))} `,
    );
    expect(el.querySelector('.lessons a')!.getAttribute('href')).toBe('/lessons/lesson-2');
    expect(el.querySelector('.lessons')!.textContent).toContain('Tue 28 Jul, 11:10 am–12:00 pm');
    const tasks = Array.from(el.querySelectorAll('.tasks li')).map((li) =>
      li.textContent!.replace(/\s+/g, ' ').trim(),
    );
    expect(tasks[0]).toContain('Tue 28 Jul, 7:55 am Charge 7 × Controller');
    expect(tasks[1]).toContain('10:58 am Pull parts');
    // The charge task was ticked on the lesson page; the pull is still to do.
    expect(tasks[0]).toContain('Done (Sam Partner)');
    expect(tasks[1]).not.toContain('Done');
    const ticked = Array.from(el.querySelectorAll('.tasks li.ticked'));
    expect(ticked.length).toBe(1);
    expect(el.querySelector('.attention')!.textContent).toContain('1 × RB-001 short for group 7.');
  });

  it('with no lessons ahead, stays on this week and points back to the last week with lessons', async () => {
    const current = mondayOf(today());
    backend.expectOne(url(current)).flush(empty(current, '2026-09-14', null));
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).textContent).toContain(
      'Nothing planned for you this week.',
    );
    await clickAndAnswer(
      await loader.getHarness(
        MatButtonHarness.with({
          text: 'Go back to your last week with lessons (week of Mon 14 Sep 2026)',
        }),
      ),
      '2026-09-14',
      WEEK,
    );
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('.lessons')!.textContent).toContain(
      'Drive train',
    );
  });

  // WCAG 2.2 SC 2.4.3 Focus Order: the link goes away with the empty week; focus moves to the week.
  it('the link to another week moves focus to the week shown', async () => {
    const current = mondayOf(today());
    backend.expectOne(url(current)).flush(empty(current, '2026-09-14', null));
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const link = [...el.querySelectorAll<HTMLButtonElement>('button')].find((b) =>
      /week of Mon 14 Sep 2026/.test(b.textContent ?? ''),
    )!;
    link.focus();
    link.click();
    await settleReads();
    backend.expectOne(url('2026-09-14')).flush({ ...WEEK, week: '2026-09-14' });
    await fixture.whenStable();
    expect(link.isConnected).toBeFalse();
    expect(document.activeElement).toBe(el.querySelector('h2.week-heading'));
    expect(document.activeElement?.textContent).toContain('14 Sep');
  });

  it('moves to the previous and next week', async () => {
    const current = mondayOf(today());
    backend.expectOne(url(current)).flush(WEEK);
    await fixture.whenStable();
    await clickAndAnswer(
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Next week"]' })),
      addDays(current, 7),
      WEEK,
    );
    await fixture.whenStable();
    const previous = () =>
      loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Previous week"]' }));
    await clickAndAnswer(await previous(), current, WEEK);
    await clickAndAnswer(await previous(), addDays(current, -7), WEEK);
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('h2')!.textContent).toContain(
      addDays(current, -7).slice(8, 10).replace(/^0/, ''),
    );
  });

  it('keeps the week shown while the next one loads', async () => {
    const current = mondayOf(today());
    backend.expectOne(url(current)).flush(WEEK);
    await fixture.whenStable();
    const next = await loader.getHarness(
      MatButtonHarness.with({ selector: '[aria-label="Next week"]' }),
    );
    const clicked = next.click();
    await settleReads();
    const el = fixture.nativeElement as HTMLElement;
    // The request for the next week is on its way: the old week stays, under a progress bar.
    const pending = backend.expectOne(url(addDays(current, 7)));
    expect(el.querySelector('.lessons')!.textContent).toContain('Drive train');
    expect(el.querySelector('mat-progress-bar')).not.toBeNull();
    // An empty week the person moved to stays shown (no jump: afterEach verifies no other read).
    pending.flush(empty(addDays(current, 7), current, addDays(current, 28)));
    await clicked;
    await fixture.whenStable();
    expect(el.textContent).toContain('Nothing planned for you this week.');
    expect(el.querySelector('mat-progress-bar')).toBeNull();
  });
});

describe('Home for a curriculum lead', () => {
  it('puts what waits for review and the term’s gaps above the week', async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('lead'));
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(Home);
    fixture.detectChanges();
    await settleReads();
    const current = mondayOf(today());
    backend.expectOne(`/api/agenda?week=${current}&mine=true`).flush(WEEK);
    backend.expectOne('/api/review/summary').flush({
      waiting: 1,
      oldest: [
        {
          id: 'unit-gates',
          title: 'Smart Gates',
          yearLevel: 6,
          term: 3,
          status: 'in-review',
          owner: { id: 'user-teacher', name: 'Jordan Pell' },
          lessonCount: 4,
          waitingSince: '2026-07-20T09:00:00+09:30',
          daysWaiting: 2,
          version: 3,
        },
      ],
      term: { number: 3, name: 'Term 3', year: 2026 },
      frameworks: [{ id: 'fw', name: 'Digital Technologies', outcomes: 10, gaps: 4 }],
    });
    await settleReads();
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const card = el.querySelector('app-review-summary')!;
    expect(card.textContent).toContain('1 unit waits for your review');
    expect(card.querySelector('a')!.getAttribute('href')).toBe('/review/units/unit-gates');
    expect(card.textContent!.replace(/\s+/g, ' ')).toContain(
      '4 of 10 outcomes of Digital Technologies have no unit in Term 3, 2026',
    );
    // The card comes before the week, so a lead sees it first.
    const week = el.querySelector('.week-nav')!;
    expect(card.compareDocumentPosition(week) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    backend.verify();
  });
});
