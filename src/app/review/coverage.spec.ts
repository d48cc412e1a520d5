import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { Coverage } from '../../../shared/schemas/review';
import { Session } from '../auth/session';
import { demoUser, settleReads, testProviders } from '../testing/test-providers';
import { CoveragePage } from './coverage';

/** An invented framework and units of the invented demo school. */
const MATRIX: Coverage = {
  framework: { id: 'f-1', name: 'KR Digital Technologies (demo)' },
  columns: [
    { yearLevel: 4, term: 2 },
    { yearLevel: 4, term: 3 },
  ],
  outcomes: [
    {
      id: 'o-1',
      code: 'KRDT-4.1',
      description: 'Follows steps.',
      strand: 'Processes',
      cells: [
        { yearLevel: 4, term: 2, units: [] },
        {
          yearLevel: 4,
          term: 3,
          units: [{ id: 'u-1', title: 'Rescue Rovers', status: 'endorsed' }],
        },
      ],
    },
    {
      id: 'o-2',
      code: 'KRDT-4.2',
      description: 'Tests a design.',
      strand: 'Processes',
      cells: [
        { yearLevel: 4, term: 2, units: [] },
        { yearLevel: 4, term: 3, units: [] },
      ],
    },
  ],
};

const FRAMEWORKS = {
  frameworks: [
    {
      id: 'f-1',
      name: 'KR Digital Technologies (demo)',
      outcomeCount: 2,
      yearBands: ['3-4'],
      createdAt: '2026-01-01T00:00:00+10:30',
    },
  ],
};

async function render() {
  TestBed.configureTestingModule({ providers: [testProviders()] });
  TestBed.inject(Session).update(demoUser('lead'));
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(CoveragePage);
  fixture.detectChanges();
  backend.expectOne('/api/outcomes/frameworks').flush(FRAMEWORKS);
  // Not whenStable: the page is not stable until the matrix read it starts has its answer.
  await settleReads();
  const req = backend.expectOne((r) => r.url === '/api/coverage');
  expect(req.request.params.get('frameworkId')).toBe('f-1');
  expect(req.request.params.get('status')).toBe('any');
  req.flush(MATRIX);
  await fixture.whenStable();
  fixture.detectChanges();
  return { fixture, backend, el: fixture.nativeElement as HTMLElement };
}

describe('CoveragePage', () => {
  it('draws outcomes by strand against year level × term, gaps written out', async () => {
    const { el } = await render();
    const heads = Array.from(el.querySelectorAll('thead th')).map((th) => th.textContent?.trim());
    expect(heads).toEqual(['Outcome', 'Year 4', 'T2', 'T3']);
    expect(el.querySelector('tbody .strand')?.textContent).toContain('Processes');
    const cells = Array.from(el.querySelectorAll('tbody td')).map((td) => td.textContent?.trim());
    expect(cells).toEqual(['Gap', '1', 'Gap', 'Gap']);
    expect(el.querySelectorAll('td.gap').length).toBe(3);
    // One outcome has no unit in any column.
    expect(el.textContent).toContain('1 with no unit');
  });

  it('lists a cell’s units when it is clicked', async () => {
    const { el, fixture } = await render();
    const button = el.querySelector<HTMLButtonElement>(
      'button[aria-label="KRDT-4.1, Year 4 term 3: 1 unit"]',
    );
    button!.click();
    fixture.detectChanges();
    const link = el.querySelector<HTMLAnchorElement>('.picked a');
    expect(link?.textContent).toBe('Rescue Rovers');
    expect(link?.getAttribute('href')).toBe('/units/u-1');
    // The list sits above the matrix: the clicked cell stays marked and focus moves to the list.
    await fixture.whenStable();
    expect(button!.getAttribute('aria-pressed')).toBe('true');
    const heading = el.querySelector('#picked-heading')!;
    expect(heading.textContent).toContain('KRDT-4.1 in Year 4, Term 3');
    expect(document.activeElement).toBe(heading);
  });
});
