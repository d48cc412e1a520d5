import { HttpTestingController } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import type { QueueRow } from '../../../shared/schemas/review';
import { settleReads, testProviders } from '../testing/test-providers';
import { ReviewQueue } from './review-queue';

/** Invented units of the invented demo school, oldest first as the server sends them. */
const ROWS: QueueRow[] = [
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
    yearLevel: 4,
    term: 3,
    status: 'in-review',
    owner: { id: 't', name: 'Jordan Pell' },
    lessonCount: 8,
    waitingSince: '2026-07-23T09:00:00+09:30',
    daysWaiting: 0,
    version: 2,
  },
];

describe('ReviewQueue', () => {
  it('lists what waits, oldest first, with links to each review page; filters ask again', async () => {
    TestBed.configureTestingModule({ providers: [testProviders()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(ReviewQueue);
    fixture.detectChanges();
    const first = backend.expectOne((r) => r.url === '/api/review/queue');
    expect(first.request.params.get('status')).toBe('in-review');
    first.flush({ units: ROWS });
    await fixture.whenStable();
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    const links = Array.from(el.querySelectorAll('td a')).map((a) => [
      a.textContent,
      a.getAttribute('href'),
    ]);
    expect(links).toEqual([
      ['Smart Gates', '/review/units/u-1'],
      ['Rescue Rovers', '/review/units/u-2'],
    ]);
    expect(el.textContent).toContain('3 days');
    expect(el.textContent).toContain('Today');

    const loader = TestbedHarnessEnvironment.loader(fixture);
    const year = await loader.getHarness(
      MatSelectHarness.with({ selector: '.filters mat-form-field:nth-child(2) mat-select' }),
    );
    await year.open();
    // The harness waits for the page to be stable, which a read is not until its answer arrives.
    const clicked = year.clickOptions({ text: 'Year 6' });
    await settleReads();
    const again = backend.expectOne((r) => r.url === '/api/review/queue');
    expect(again.request.params.get('yearLevel')).toBe('6');
    again.flush({ units: [ROWS[0]] });
    await clicked;
  });
});
