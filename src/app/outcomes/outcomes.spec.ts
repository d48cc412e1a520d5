import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Framework, Outcome } from '../../../shared/schemas/outcomes';
import { Session } from '../auth/session';
import { demoUser, settleReads, testProviders } from '../testing/test-providers';
import { OutcomesPage, importSummary } from './outcomes';

const DT = '3c9b1d2e-7f4a-4b8c-9d0e-1f2a3b4c5d6e';
const SCI = '7a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d';
/** The invented demo frameworks. */
const FRAMEWORKS: Framework[] = [
  {
    id: DT,
    name: 'Kestrel Ridge Design and Technologies',
    outcomeCount: 3,
    yearBands: ['Year 3', 'Year 4'],
    createdAt: '2026-01-27T00:00:00.000Z',
  },
  {
    id: SCI,
    name: 'Kestrel Ridge Science',
    outcomeCount: 0,
    yearBands: [],
    createdAt: '2026-01-27T00:00:00.000Z',
  },
];
const outcome = (code: string, description: string, strand: string, yearBand: string): Outcome => ({
  id: `id-${code}`,
  frameworkId: DT,
  code,
  description,
  strand,
  yearBand,
});
const ALL = [
  outcome('KR-DT3-01', 'Describe how a wheel and axle make a model move', 'Design', 'Year 3'),
  outcome(
    'KR-DT4-01',
    'Follow, test and fix a sequence of steps for a model',
    'Digital systems',
    'Year 4',
  ),
  outcome('KR-DT4-02', 'Use a sensor reading to change what a model does', 'Digital systems', ''),
];

/** Waits out the pause after typing (real time: the page debounces with a timer). */
const pause = () => new Promise((resolve) => setTimeout(resolve, 400));

describe('OutcomesPage', () => {
  let fixture: ComponentFixture<OutcomesPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  function search(params: Record<string, string>): TestRequest {
    return backend.expectOne((r) => {
      if (r.url !== '/api/outcomes') return false;
      const keys = r.params.keys().sort();
      return (
        JSON.stringify(keys) === JSON.stringify(Object.keys(params).sort()) &&
        keys.every((k) => r.params.get(k) === params[k])
      );
    }, JSON.stringify(params));
  }
  async function rows(): Promise<string[][]> {
    fixture.detectChanges();
    await fixture.whenStable();
    return (await loader.getHarness(MatTableHarness)).getCellTextByIndex();
  }

  /**
   * Does `act` and answers the search it starts: a harness's action waits for the page to be
   * stable, which a resource read is not until its answer arrives.
   */
  async function answer(act: Promise<void>, params: Record<string, string>, body: object) {
    await settleReads();
    search(params).flush(body);
    await act;
  }

  async function emptyRow(): Promise<string[] | undefined> {
    fixture.detectChanges();
    await fixture.whenStable();
    return (await (await loader.getHarness(MatTableHarness)).getNoDataRow())?.getCellTextByIndex();
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('lead'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OutcomesPage);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/outcomes/frameworks').flush({ frameworks: FRAMEWORKS });
    // The search is a resource read of the framework shown: it starts once the list has landed.
    await settleReads();
    search({ frameworkId: DT }).flush({ outcomes: ALL, truncated: false });
    fixture.detectChanges();
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  it("shows the first framework's outcomes with code, description, strand and year band", async () => {
    expect(await rows()).toEqual([
      ['KR-DT3-01', 'Describe how a wheel and axle make a model move', 'Design', 'Year 3'],
      [
        'KR-DT4-01',
        'Follow, test and fix a sequence of steps for a model',
        'Digital systems',
        'Year 4',
      ],
      ['KR-DT4-02', 'Use a sensor reading to change what a model does', 'Digital systems', '—'],
    ]);
    expect(fixture.nativeElement.textContent).toContain('3 outcomes');
    // A lead may create frameworks and import (the server's `outcomes.edit`).
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ text: /New framework/ })),
    ).toHaveSize(1);
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ text: /Import outcomes/ })),
    ).toHaveSize(1);
  });

  it('searches the words typed once typing pauses', async () => {
    const input = await loader.getHarness(MatInputHarness);
    await input.setValue('sensor model');
    backend.expectNone('/api/outcomes');
    await pause();
    await settleReads();
    search({ frameworkId: DT, q: 'sensor model' }).flush({ outcomes: [ALL[2]], truncated: false });
    expect(await rows()).toEqual([
      ['KR-DT4-02', 'Use a sensor reading to change what a model does', 'Digital systems', '—'],
    ]);
    expect(fixture.nativeElement.textContent).toContain('1 outcome');
  });

  it('searches at once on Enter, and not again when the typing pause ends', async () => {
    const input = await loader.getHarness(MatInputHarness);
    await input.setValue('wheel');
    const form = (fixture.nativeElement as HTMLElement).querySelector('form')!;
    const submit = new Event('submit', { cancelable: true });
    form.dispatchEvent(submit);
    expect(submit.defaultPrevented).withContext('no page reload').toBeTrue();
    await settleReads();
    search({ frameworkId: DT, q: 'wheel' }).flush({ outcomes: [], truncated: false });
    expect(await rows()).toEqual([]);
    expect(await emptyRow()).toEqual(['No outcome matches this search.']);
    await pause();
    await settleReads();
    backend.expectNone('/api/outcomes');
  });

  it('filters by year band and says when the list is cut short', async () => {
    const selects = await loader.getAllHarnesses(MatSelectHarness);
    await selects[1]!.open();
    expect(await Promise.all((await selects[1]!.getOptions()).map((o) => o.getText()))).toEqual([
      'All year bands',
      'Year 3',
      'Year 4',
    ]);
    await answer(
      selects[1]!.clickOptions({ text: 'Year 4' }),
      { frameworkId: DT, yearBand: 'Year 4' },
      { outcomes: [ALL[1]], truncated: true },
    );
    expect((await rows()).length).toBe(1);
    expect(fixture.nativeElement.textContent).toContain('Showing the first 500 outcomes');
  });

  it('switches framework and drops the year band of the last one', async () => {
    const [framework, band] = await loader.getAllHarnesses(MatSelectHarness);
    await answer(
      band!.clickOptions({ text: 'Year 3' }),
      { frameworkId: DT, yearBand: 'Year 3' },
      { outcomes: [ALL[0]], truncated: false },
    );
    await answer(
      framework!.clickOptions({ text: /Kestrel Ridge Science/ }),
      { frameworkId: SCI },
      { outcomes: [], truncated: false },
    );
    expect(await emptyRow()).toEqual(['This framework has no outcomes yet.']);
    expect(await band!.getValueText()).toBe('All year bands');
  });

  it('sums up an import in words', () => {
    expect(importSummary({ imported: 42, added: 40, updated: 2, removed: 0 })).toBe(
      'Imported 42 outcomes: 40 new, 2 changed, none removed.',
    );
  });
});
