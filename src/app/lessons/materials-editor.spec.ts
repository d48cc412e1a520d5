import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatAutocompleteHarness } from '@angular/material/autocomplete/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import type { Part } from '../../../shared/schemas/kits';
import { MATERIAL_ONE_OF_MESSAGE, type Activity } from '../../../shared/schemas/lessons';
import { errorBody, testProviders } from '../testing/test-providers';
import { ActivityEditor } from './activity-editor';
import { PICK_PART_MESSAGE } from './materials-editor';

/** Invented parts of the invented demo kit type (demo data only). */
function part(code: string, name: string, small = false): Part {
  return {
    id: `part-${code}`,
    code,
    name,
    colour: null,
    category: 'other',
    qty: 1,
    compartment: null,
    small,
    chargeMinutes: null,
    hasPhoto: false,
  };
}
const PARTS: Part[] = [
  part('RB-CTRL', 'Rover controller'),
  part('RB-MOT', 'Drive motor'),
  part('RB-PEG', 'Connector peg', true),
];

function saved(body: Partial<Activity>): Activity {
  return {
    id: 'act-1',
    lessonId: 'lesson-1',
    version: 1,
    position: 1,
    title: 'Build the chassis',
    kind: 'build',
    minutes: 20,
    materials: [],
    attachments: [],
    ...body,
  };
}

describe('MaterialsEditor (in the activity editor)', () => {
  let fixture: ComponentFixture<ActivityEditor>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ActivityEditor);
    fixture.componentRef.setInput('lessonId', 'lesson-1');
    fixture.componentRef.setInput('parts', PARTS);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function field(label: string | RegExp): Promise<MatFormFieldHarness> {
    return loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
  }

  async function input(label: string | RegExp): Promise<MatInputHarness> {
    return (await field(label)).getControl(MatInputHarness) as Promise<MatInputHarness>;
  }

  async function click(text: RegExp): Promise<void> {
    await (await loader.getHarness(MatButtonHarness.with({ text }))).click();
  }

  it('picks a part by its name and sends its code; a consumable line sends `consumable`', async () => {
    await (await input('Activity title')).setValue('Build the chassis');
    await click(/Add a kit part/);
    const auto = await loader.getHarness(MatAutocompleteHarness);
    await auto.enterText('controller');
    // Typing a name narrows the list to the parts whose code or name contains it.
    const options = await auto.getOptions();
    expect(options.length).toBe(1);
    await auto.selectOption({ text: /Rover controller/ });
    expect(await auto.getValue()).toBe('RB-CTRL · Rover controller');

    await click(/Add a consumable/);
    await (await input('Consumable')).setValue('Masking tape');
    const qtys = await loader.getAllHarnesses(
      MatInputHarness.with({ selector: '[formControlName="qty"]' }),
    );
    await qtys[1]!.setValue('2');
    const pers = await loader.getAllHarnesses(
      MatSelectHarness.with({ selector: '[formControlName="per"]' }),
    );
    await pers[1]!.open();
    await pers[1]!.clickOptions({ text: 'per class' });
    // A part comes back at pack-away by default; a consumable does not.
    const returnable = await loader.getAllHarnesses(MatCheckboxHarness);
    expect(await returnable[0]!.isChecked()).toBeTrue();
    expect(await returnable[1]!.isChecked()).toBeFalse();

    await click(/Add activity/);
    const req = backend.expectOne('/api/lessons/lesson-1/activities');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      title: 'Build the chassis',
      kind: 'build',
      minutes: 10,
      materials: [
        { partCode: 'RB-CTRL', qty: 1, per: 'group', returnable: true },
        { consumable: 'Masking tape', qty: 2, per: 'class', returnable: false },
      ],
    });
    req.flush(saved({ title: 'Build the chassis' }));
  });

  it('finds a part by its code too', async () => {
    await click(/Add a kit part/);
    const auto = await loader.getHarness(MatAutocompleteHarness);
    await auto.enterText('rb-mo');
    const options = await auto.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual(['RB-MOT · Drive motor']);
  });

  it('sends nothing while a line has typed text but no part picked, an empty consumable or a bad quantity', async () => {
    await (await input('Activity title')).setValue('Test drive');
    await click(/Add a kit part/);
    await (await loader.getHarness(MatAutocompleteHarness)).enterText('not a part');
    await click(/Add a consumable/);
    const qtys = await loader.getAllHarnesses(
      MatInputHarness.with({ selector: '[formControlName="qty"]' }),
    );
    // 0–10000 is the range of `materialInputSchema` in shared/schemas/lessons.ts.
    await qtys[0]!.setValue('10001');
    await click(/Add activity/);
    backend.expectNone('/api/lessons/lesson-1/activities');

    expect(await (await field(/Part \(code or name\)/)).getTextErrors()).toEqual([
      PICK_PART_MESSAGE,
    ]);
    expect(await (await field('Consumable')).getTextErrors()).toEqual([
      'Enter what the consumable is.',
    ]);
    const [partQty] = await loader.getAllHarnesses(
      MatFormFieldHarness.with({ floatingLabelText: 'Quantity' }),
    );
    expect(await partQty!.getTextErrors()).toEqual(['Use a whole number from 0 to 10000.']);
  });

  it('shows a server detail about a line under that line', async () => {
    await (await input('Activity title')).setValue('Test drive');
    await click(/Add a kit part/);
    const auto = await loader.getHarness(MatAutocompleteHarness);
    await auto.enterText('peg');
    await auto.selectOption({ text: /Connector peg/ });
    await click(/Add activity/);
    backend
      .expectOne('/api/lessons/lesson-1/activities')
      .flush(
        errorBody('invalid-request', 'Check the details.', [
          { path: 'materials.0.partCode', message: MATERIAL_ONE_OF_MESSAGE },
        ]),
        { status: 400, statusText: 'Bad Request' },
      );
    fixture.detectChanges();
    expect(await (await field(/Part \(code or name\)/)).getTextErrors()).toEqual([
      MATERIAL_ONE_OF_MESSAGE,
    ]);
  });
});
