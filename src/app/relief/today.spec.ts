import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { ReliefDay } from '../../../shared/schemas/sharing';
import { errorBody, settleReads, testProviders } from '../testing/test-providers';
import { Today } from './today';

/** An invented relief day: one lesson of the invented demo school, nothing left to prepare. */
const DAY: ReliefDay = {
  date: '2026-08-04',
  lessons: [
    {
      id: 'lesson-4',
      title: 'Sense the wall',
      unitTitle: 'Rescue Rovers',
      className: '4K',
      startsAt: '2026-08-04T11:10',
      endsAt: '2026-08-04T12:00',
      periodName: null,
      room: 'Room 12',
      reliefNotes: '',
      plannable: true,
      openTasks: [],
      activities: [],
    },
  ],
};

const KEY = 'trayplan.saved.relief.today';

describe('Today', () => {
  let fixture: ComponentFixture<Today>;
  let backend: HttpTestingController;

  beforeEach(() => {
    localStorage.removeItem(KEY);
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Today);
    // The day is a resource read: it goes out with the page's first check.
    fixture.detectChanges();
  });

  afterEach(() => {
    backend.verify();
    localStorage.removeItem(KEY);
  });

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';

  it('shows the live day and keeps a copy of it in this browser', async () => {
    backend.expectOne('/api/relief/today').flush(DAY);
    await fixture.whenStable();
    expect(text()).toContain('Sense the wall');
    expect(text()).toContain('Room 12');
    expect(text()).not.toContain('You are offline');
    expect(JSON.parse(localStorage.getItem(KEY)!).value).toEqual(DAY);
  });

  it('on a day without lessons, lists the next lessons assigned to them', async () => {
    backend.expectOne('/api/relief/today').flush({ date: '2026-08-03', lessons: [] });
    // The assigned lessons are a second read, started once the empty day is shown.
    await settleReads();
    const lesson = (id: string, date: string, title: string) => ({
      id,
      title,
      startsAt: `${date}T11:10`,
      endsAt: `${date}T12:00`,
      room: 'Room 12',
      unitId: 'unit-rovers',
      unitTitle: 'Rescue Rovers',
      className: '4K',
      reliefNotes: '',
    });
    backend.expectOne('/api/relief/lessons').flush({
      lessons: [
        lesson('lesson-1', '2026-07-21', 'Earlier cover'),
        lesson('lesson-4', '2026-08-04', 'Sense the wall'),
      ],
    });
    await fixture.whenStable();
    expect(text()).toContain('No lessons are assigned to you today.');
    const items = Array.from(
      (fixture.nativeElement as HTMLElement).querySelectorAll('.upcoming li'),
    ).map((li) => li.textContent!.replace(/\s+/g, ' ').trim());
    // Past lessons are left out; 4 August 2026 is a Tuesday (ISO 8601 calendar).
    expect(items).toEqual(['Sense the wall Tue 4 Aug, 11:10 am–12:00 pm · 4K · Rescue Rovers']);
    const link = (fixture.nativeElement as HTMLElement).querySelector('.upcoming a')!;
    expect(link.getAttribute('href')).toBe('/lessons/lesson-4');
  });

  it('offline, shows the saved copy and says from when', async () => {
    localStorage.setItem(KEY, JSON.stringify({ savedAt: '2026-08-04T07:30:00Z', value: DAY }));
    // Status 0: the server was not reached (Angular's HttpErrorResponse for a network error).
    backend.expectOne('/api/relief/today').error(new ProgressEvent('error'));
    await fixture.whenStable();
    expect(text()).toContain('You are offline. This is the copy saved in this browser on');
    expect(text()).toContain('Sense the wall');
  });

  it('offline without a saved copy, says so instead of loading for ever', async () => {
    backend.expectOne('/api/relief/today').error(new ProgressEvent('error'));
    await fixture.whenStable();
    expect(text()).toContain(
      'Trayplan cannot be reached, and this browser has no saved copy of today yet.',
    );
  });

  it("shows the server's message when it refuses", async () => {
    backend
      .expectOne('/api/relief/today')
      .flush(errorBody('forbidden', 'Only relief teachers have a Today page.'), {
        status: 403,
        statusText: 'Forbidden',
      });
    await fixture.whenStable();
    expect(text()).toContain('Only relief teachers have a Today page.');
  });
});
