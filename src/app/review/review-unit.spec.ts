import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { ReviewUnit } from '../../../shared/schemas/review';
import type { Unit } from '../../../shared/schemas/units';
import { settleReads, testProviders } from '../testing/test-providers';
import { ReviewUnitPage } from './review-unit';

/** An invented unit of the invented demo school, waiting for a lead's decision. */
const UNIT: Unit = {
  id: 'u-1',
  title: 'Rescue Rovers',
  yearLevel: 4,
  learningArea: 'Digital Technologies',
  term: 3,
  status: 'in-review',
  visibility: 'school',
  owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
  version: 5,
  updatedAt: '2026-07-20T09:00:00+09:30',
  canEdit: false,
  overview: '',
  copiedFromId: null,
  basedOn: null,
  createdAt: '2026-07-01T09:00:00+09:30',
  coauthors: [],
  outcomes: [],
  lessons: [],
  isOwner: false,
};

function page(unit: Unit, actions: ReviewUnit['actions']): ReviewUnit {
  return {
    unit,
    actions,
    lessons: [
      {
        id: 'l-1',
        title: 'Meet the rover',
        date: '2026-07-21',
        className: '4K',
        groups: 6,
        shortfalls: [{ partCode: 'RV-101', name: 'Drive motor', missing: 2 }],
        packAwayMinutes: 8,
        plannedMinutes: 45,
        windowMinutes: 50,
        problems: [],
      },
    ],
  };
}

describe('ReviewUnitPage', () => {
  it('shows the unit with its lessons’ prep, and reads it again after a step', async () => {
    TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(ReviewUnitPage);
    fixture.componentRef.setInput('id', 'u-1');
    fixture.detectChanges();
    backend.expectOne('/api/review/units/u-1').flush(page(UNIT, ['request-changes', 'endorse']));
    await settleReads();
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const text = () => (el.textContent ?? '').replace(/\s+/g, ' ');
    expect(el.querySelector('h1')?.textContent).toBe('Rescue Rovers');
    expect(text()).toContain('6 groups · planned 45 of 50 minutes · pack-away 8 minutes');
    expect(text()).toContain('Short: 2 × Drive motor.');
    expect(el.querySelector('.status')?.textContent).toBe('In review');

    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Endorse' }))).click();
    const endorsed: Unit = { ...UNIT, status: 'endorsed', version: 6 };
    backend.expectOne('/api/units/u-1/review').flush(endorsed);
    // The buttons change with the status: the page reads the unit (and its comments) again.
    await settleReads();
    backend.expectOne('/api/review/units/u-1').flush(page(endorsed, ['reopen']));
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    expect(el.querySelector('.status')?.textContent).toBe('Endorsed');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Endorse' }))).toEqual([]);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Reopen' }))).toHaveSize(1);
    backend.verify();
  });
});
