import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { ReviewSummary } from '../../../shared/schemas/review';
import { errorBody, settleReads, testProviders } from '../testing/test-providers';
import { ReviewSummaryCard } from './review-summary';

/** An invented summary of the invented demo school. */
const SUMMARY: ReviewSummary = {
  waiting: 2,
  oldest: [
    {
      id: 'u-1',
      title: 'Smart Gates',
      yearLevel: 6,
      term: 3,
      status: 'in-review',
      owner: { id: 't', name: 'Jordan Pell' },
      lessonCount: 4,
      waitingSince: '2026-07-20T09:00:00+09:30',
      daysWaiting: 3,
      version: 4,
    },
    {
      id: 'u-2',
      title: 'Rescue Rovers',
      yearLevel: 0,
      term: 3,
      status: 'in-review',
      owner: { id: 't', name: 'Jordan Pell' },
      lessonCount: 8,
      waitingSince: '2026-07-22T09:00:00+09:30',
      daysWaiting: 1,
      version: 2,
    },
  ],
  term: { number: 3, name: 'Term 3', year: 2026 },
  frameworks: [{ id: 'f-1', name: 'Digital Technologies', outcomes: 12, gaps: 1 }],
};

async function render() {
  TestBed.configureTestingModule({ providers: testProviders() });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(ReviewSummaryCard);
  fixture.detectChanges();
  await settleReads();
  return { backend, fixture, el: fixture.nativeElement as HTMLElement };
}

const text = (el: Element) => el.textContent!.replace(/\s+/g, ' ').trim();

describe('ReviewSummaryCard', () => {
  it('says how many units wait, links the oldest to their review pages, and counts the term’s gaps', async () => {
    const { backend, fixture, el } = await render();
    backend.expectOne('/api/review/summary').flush(SUMMARY);
    await settleReads();
    await fixture.whenStable();
    expect(text(el)).toContain('2 units wait for your review');
    const links = Array.from(el.querySelectorAll('li a'));
    expect(links.map((a) => a.getAttribute('href'))).toEqual([
      '/review/units/u-1',
      '/review/units/u-2',
    ]);
    const rows = Array.from(el.querySelectorAll('li')).map(text);
    expect(rows[0]).toContain('Year 6 · Jordan Pell · waiting 3 days');
    expect(rows[1]).toContain('Foundation · Jordan Pell · waiting 1 day');
    expect(text(el)).toContain(
      '1 of 12 outcomes of Digital Technologies has no unit in Term 3, 2026',
    );
    backend.verify();
  });

  it('says so when nothing waits, and when no term is set up', async () => {
    const { backend, fixture, el } = await render();
    backend
      .expectOne('/api/review/summary')
      .flush({ ...SUMMARY, waiting: 0, oldest: [], term: null });
    await settleReads();
    await fixture.whenStable();
    expect(text(el)).toContain('No unit waits for your review');
    expect(el.querySelector('li')).toBeNull();
    expect(text(el)).toContain('has no unit in any term');
    backend.verify();
  });

  it('shows why the summary did not load', async () => {
    const { backend, fixture, el } = await render();
    backend
      .expectOne('/api/review/summary')
      .flush(errorBody('forbidden', 'Only leads and admins review units.'), {
        status: 403,
        statusText: 'Forbidden',
      });
    await settleReads();
    await fixture.whenStable();
    expect(text(el)).toContain('Only leads and admins review units.');
    backend.verify();
  });
});
