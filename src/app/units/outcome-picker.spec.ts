import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatAutocompleteHarness } from '@angular/material/autocomplete/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatChipGridHarness } from '@angular/material/chips/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { Unit } from '../../../shared/schemas/units';
import { settleReads, testProviders } from '../testing/test-providers';
import { UnitEditor } from './unit-editor';

/** Outcome ids are UUIDs: the form validates them as `distinctIds` does. */
const O1 = '0b6f1c2e-4a57-4d4e-9a51-6d1f3c2b7a01';
const O2 = '0b6f1c2e-4a57-4d4e-9a51-6d1f3c2b7a02';

/** An invented framework, outcomes and unit of the invented demo school. */
const FRAMEWORK = {
  id: 'f-1',
  name: 'Kestrel Ridge Technologies',
  outcomeCount: 2,
  yearBands: ['3–4'],
  createdAt: '2026-06-01T09:00:00+09:30',
};
const DT401 = {
  id: O1,
  frameworkId: 'f-1',
  code: 'DT4-01',
  description: 'Name the parts of a machine.',
  strand: 'Knowledge',
  yearBand: '3–4',
};
const DT402 = {
  id: O2,
  frameworkId: 'f-1',
  code: 'DT4-02',
  description: 'Follow and describe steps.',
  strand: 'Processes',
  yearBand: '3–4',
};
const UNIT: Unit = {
  id: 'u-1',
  title: 'Rescue Rovers',
  yearLevel: 4,
  learningArea: '',
  term: 3,
  status: 'draft',
  visibility: 'private',
  owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
  version: 7,
  updatedAt: '2026-07-20T09:00:00+09:30',
  canEdit: true,
  overview: '',
  copiedFromId: null,
  createdAt: '2026-07-01T09:00:00+09:30',
  coauthors: [],
  outcomes: [DT401],
  lessons: [],
  isOwner: true,
  basedOn: null,
};

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Waits out the search box's debounce (up to 2 s) for the one request to `url`. */
async function request(backend: HttpTestingController, url: string) {
  for (let i = 0; i < 40; i++) {
    const found = backend.match(url);
    if (found.length) {
      expect(found.length).toBe(1);
      return found[0]!;
    }
    await sleep(50);
  }
  return backend.expectOne(url);
}

describe('OutcomePicker in the unit editor', () => {
  it('searches the framework, adds the picked outcome as a chip and saves the ids', async () => {
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(UnitEditor);
    fixture.componentRef.setInput('id', 'u-1');
    const loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(UNIT);
    backend.expectOne('/api/school/teachers').flush({ teachers: [] });
    // The picker's reads are resources: each is answered before the page is stable again.
    await settleReads();
    backend.expectOne('/api/outcomes/frameworks').flush({ frameworks: [FRAMEWORK] });
    (await request(backend, '/api/outcomes?frameworkId=f-1')).flush({
      outcomes: [DT401, DT402],
      truncated: false,
    });
    await fixture.whenStable();

    const chips = await loader.getHarness(MatChipGridHarness);
    expect(await Promise.all((await chips.getRows()).map((r) => r.getText()))).toEqual(['DT4-01']);

    const search = await loader.getHarness(MatAutocompleteHarness);
    const typed = search.enterText('steps');
    (await request(backend, '/api/outcomes?frameworkId=f-1&q=steps')).flush({
      outcomes: [DT402],
      truncated: false,
    });
    await typed;
    await fixture.whenStable();
    const picked = search.selectOption({ text: /DT4-02/ });
    // Clearing the search box asks for the whole framework again.
    (await request(backend, '/api/outcomes?frameworkId=f-1')).flush({
      outcomes: [],
      truncated: false,
    });
    await picked;
    expect(await Promise.all((await chips.getRows()).map((r) => r.getText()))).toEqual([
      'DT4-01',
      'DT4-02',
    ]);

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save changes' }))).click();
    const req = backend.expectOne('/api/units/u-1');
    expect(req.request.body).toEqual({ version: 7, outcomeIds: [O1, O2] });
    req.flush({ ...UNIT, version: 8, outcomes: [DT401, DT402] });
    backend.verify();
  });
});
