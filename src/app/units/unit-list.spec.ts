import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { MatTabGroupHarness } from '@angular/material/tabs/testing';
import type { UnitSummary } from '../../../shared/schemas/units';
import { settleReads, testProviders } from '../testing/test-providers';
import { UnitList } from './unit-list';

/** Invented units of the invented demo school. */
function summary(overrides: Partial<UnitSummary>): UnitSummary {
  return {
    id: 'u-1',
    title: 'Rescue Rovers',
    yearLevel: 4,
    learningArea: 'Digital Technologies',
    term: 3,
    status: 'draft',
    visibility: 'school',
    owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
    lessonCount: 8,
    version: 1,
    updatedAt: '2026-07-20T09:00:00+09:30',
    canEdit: true,
    ...overrides,
  };
}

const MINE = [
  summary({}),
  summary({
    id: 'u-2',
    title: 'Smart Gates',
    yearLevel: 0,
    term: null,
    status: 'endorsed',
    lessonCount: 4,
  }),
];

describe('UnitList', () => {
  let fixture: ComponentFixture<UnitList>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UnitList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    // The lists are resource reads: the page is stable only once their answers are flushed.
    await settleReads();
    backend.expectOne('/api/school/teachers').flush({
      teachers: [{ id: 'owner-sam', name: 'Sam Kowhai', email: 'teacher@kestrel-ridge.example' }],
    });
    backend.expectOne('/api/units?scope=mine').flush({ units: MINE });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  /**
   * Does `act` and answers the list read it starts: a harness's action waits for the page to be
   * stable, which a resource read is not until its answer arrives.
   */
  async function answer(act: Promise<void>, url: string, units: UnitSummary[]): Promise<void> {
    await settleReads();
    backend.expectOne(url).flush({ units });
    await act;
  }

  it('shows my units in a table', async () => {
    const rows = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(rows['title'].text).toEqual(['Rescue Rovers', 'Smart Gates']);
    expect(rows['area'].text).toEqual(['Digital Technologies', 'Digital Technologies']);
    expect(rows['yearLevel'].text).toEqual(['Year 4', 'Foundation']);
    expect(rows['term'].text).toEqual(['Term 3', '—']);
    expect(rows['status'].text).toEqual(['Draft', 'Endorsed']);
    expect(rows['lessons'].text).toEqual(['8', '4']);
    const link = (fixture.nativeElement as HTMLElement).querySelector('td a')!;
    expect(link.getAttribute('href')).toBe('/units/u-1');
  });

  it('loads the school library from its tab', async () => {
    const tabs = await loader.getHarness(MatTabGroupHarness);
    await answer(tabs.selectTab({ label: 'School library' }), '/api/units?scope=library', [
      summary({ id: 'u-9', title: 'Bridges That Hold', canEdit: false }),
    ]);
    await fixture.whenStable();
    const rows = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(rows['title'].text).toEqual(['Bridges That Hold']);
  });

  it('sends the year level, term, status, owner and search filters', async () => {
    const [year, term, status, owner] = await loader.getAllHarnesses(MatSelectHarness);
    await year.open();
    await answer(year.clickOptions({ text: 'Year 4' }), '/api/units?scope=mine&yearLevel=4', MINE);
    await term.open();
    await answer(
      term.clickOptions({ text: 'Term 3' }),
      '/api/units?scope=mine&yearLevel=4&term=3',
      MINE,
    );
    await status.open();
    await answer(
      status.clickOptions({ text: 'Endorsed' }),
      '/api/units?scope=mine&yearLevel=4&term=3&status=endorsed',
      [MINE[1]],
    );
    await owner.open();
    await answer(
      owner.clickOptions({ text: 'Sam Kowhai' }),
      '/api/units?scope=mine&yearLevel=4&term=3&status=endorsed&owner=owner-sam',
      [MINE[1]],
    );
    const search = await loader.getHarness(MatInputHarness.with({ selector: '[type=search]' }));
    // setValue types letter by letter; the resource cancels all but the last request.
    await answer(
      search.setValue('gates'),
      '/api/units?scope=mine&yearLevel=4&term=3&status=endorsed&owner=owner-sam&q=gates',
      [MINE[1]],
    );
    await fixture.whenStable();
    const rows = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();
    expect(rows['title'].text).toEqual(['Smart Gates']);
  });

  it('says so when nothing matches', async () => {
    const search = await loader.getHarness(MatInputHarness.with({ selector: '[type=search]' }));
    await answer(search.setValue('x'), '/api/units?scope=mine&q=x', []);
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).textContent).toContain(
      'No unit matches these filters.',
    );
  });
});
