import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { Router } from '@angular/router';
import type { Unit } from '../../../shared/schemas/units';
import { Blank, errorBody, testProviders } from '../testing/test-providers';
import { UnitNew } from './unit-new';

/** The server's answer for the invented new unit. */
function createdUnit(): Unit {
  return {
    id: 'u-new',
    title: 'Rescue Rovers',
    yearLevel: 4,
    learningArea: '',
    term: 3,
    status: 'draft',
    visibility: 'private',
    owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
    version: 1,
    updatedAt: '2026-07-01T09:00:00+09:30',
    canEdit: true,
    overview: '',
    copiedFromId: null,
    createdAt: '2026-07-01T09:00:00+09:30',
    coauthors: [],
    outcomes: [],
    lessons: [],
    isOwner: true,
    basedOn: null,
  };
}

describe('UnitNew', () => {
  let fixture: ComponentFixture<UnitNew>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: testProviders([{ path: 'units/:id', component: Blank }]),
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UnitNew);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function fill(title: string): Promise<void> {
    await (await loader.getHarness(MatInputHarness.with({ placeholder: '' }))).setValue(title);
    const [year, term] = await loader.getAllHarnesses(MatSelectHarness);
    await year.open();
    await year.clickOptions({ text: 'Year 4' });
    await term.open();
    await term.clickOptions({ text: 'Term 3' });
  }

  it('shows the schema’s messages and sends nothing while a field is wrong', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create unit' }))).click();
    const fields = await loader.getAllHarnesses(MatFormFieldHarness);
    // The messages of requiredText('a title') and the year level's emptyMessage.
    expect(await fields[0].getTextErrors()).toEqual(['Enter a title.']);
    expect(await fields[1].getTextErrors()).toEqual(['Choose a year level.']);
    backend.expectNone('/api/units');
  });

  it('posts the unit and opens its page', async () => {
    await fill('Rescue Rovers');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create unit' }))).click();
    const req = backend.expectOne('/api/units');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      title: 'Rescue Rovers',
      yearLevel: 4,
      learningArea: '',
      term: 3,
    });
    req.flush(createdUnit(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(TestBed.inject(Router).url).toBe('/units/u-new');
  });

  it('puts the server’s field errors under their fields', async () => {
    await fill('Rescue Rovers');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create unit' }))).click();
    backend
      .expectOne('/api/units')
      .flush(errorBody('validation', 'Check the fields.', [{ path: 'title', message: 'Taken.' }]), {
        status: 400,
        statusText: 'Bad Request',
      });
    await fixture.whenStable();
    const [title] = await loader.getAllHarnesses(MatFormFieldHarness);
    expect(await title.getTextErrors()).toEqual(['Taken.']);
  });
});
