import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import type { Tub } from '../../../shared/schemas/kits';
import { errorBody, testProviders } from '../testing/test-providers';
import { TubFormDialog, type TubFormData } from './tub-form-dialog';

const KIT_ID = '6b1f3c1e-2a4d-4c59-9a51-0c7f4e2b8d10';
const TUB_ID = '0d6a2b7e-91c4-4f0e-8a3b-5e2c7d9f1a24';

/** An invented tub of the invented demo kit type. */
function tub(over: Partial<Tub> = {}): Tub {
  return {
    id: TUB_ID,
    kitTypeId: KIT_ID,
    kitTypeName: 'Rover Builder Tub',
    label: 'Tub 8',
    controllerLabel: 'C8',
    status: 'ready',
    needsSorting: false,
    version: 2,
    missing: [],
    missingLines: 0,
    missingPieces: 0,
    lessonCount: 0,
    stock: {},
    ...over,
  };
}

describe('TubFormDialog', () => {
  let fixture: ComponentFixture<TubFormDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  async function setUp(data: TubFormData): Promise<void> {
    close = jasmine.createSpy('close');
    TestBed.configureTestingModule({
      providers: [
        ...testProviders(),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TubFormDialog);
    // The select's options open in the overlay, outside the fixture.
    loader = TestbedHarnessEnvironment.documentRootLoader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  const input = (label: string) =>
    loader.getHarness(MatInputHarness.with({ selector: `[formControlName="${label}"]` }));
  const field = (label: string) =>
    loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
  const button = (text: string) => loader.getHarness(MatButtonHarness.with({ text }));

  async function settle(): Promise<void> {
    fixture.detectChanges();
    await fixture.whenStable();
  }

  it('adds a tub with the status chosen in words and a blank controller label as null', async () => {
    await setUp({ kitTypeId: KIT_ID });
    const select = await loader.getHarness(MatSelectHarness);
    await select.open();
    const options = await select.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual([
      'Ready',
      'Needs sorting',
      'On loan',
      'Retired',
    ]);
    await select.clickOptions({ text: 'Needs sorting' });
    await (await input('label')).setValue('  Tub 9 ');
    await (await button('Add tub')).click();

    const request = backend.expectOne('/api/tubs');
    expect(request.request.method).toBe('POST');
    // tubCreateSchema trims the label and turns a blank controller label into null.
    expect(request.request.body).toEqual({
      kitTypeId: KIT_ID,
      label: 'Tub 9',
      controllerLabel: null,
      status: 'needs-sorting',
    });
    const saved = tub({ label: 'Tub 9', controllerLabel: null, status: 'needs-sorting' });
    request.flush({ tub: saved });
    expect(close).toHaveBeenCalledOnceWith(saved);
  });

  it('says what the schema says under a field and sends nothing while the form is invalid', async () => {
    await setUp({ kitTypeId: KIT_ID });
    await (await input('controllerLabel')).setValue('C'.repeat(61));
    await (await button('Add tub')).click();
    await settle();
    // The messages of tubCreateSchema in shared/schemas/kits.ts.
    expect(await (await field('Label')).getTextErrors()).toEqual([
      'Enter a label for the tub, like Tub 3.',
    ]);
    expect(await (await field('Controller label')).getTextErrors()).toEqual([
      'The controller label is at most 60 characters.',
    ]);
    backend.expectNone('/api/tubs');
    expect(close).not.toHaveBeenCalled();
  });

  it('puts a taken label (409 label-taken) under the label field', async () => {
    await setUp({ kitTypeId: KIT_ID });
    await (await input('label')).setValue('Tub 3');
    await (await button('Add tub')).click();
    backend
      .expectOne('/api/tubs')
      .flush(
        errorBody('label-taken', 'Another tub of this kit type already has this label.', [
          { path: 'label', message: 'Another tub of this kit type has this label.' },
        ]),
        { status: 409, statusText: 'Conflict' },
      );
    await settle();
    expect(await (await field('Label')).getTextErrors()).toEqual([
      'Another tub of this kit type has this label.',
    ]);
    expect(close).not.toHaveBeenCalled();
  });

  it('edits with the version read and only the fields changed', async () => {
    await setUp({ kitTypeId: KIT_ID, tub: tub() });
    expect(await (await input('label')).getValue()).toBe('Tub 8');
    await (await input('controllerLabel')).setValue('C12');
    await (await button('Save')).click();
    const request = backend.expectOne(`/api/tubs/${TUB_ID}`);
    expect(request.request.method).toBe('PATCH');
    expect(request.request.body).toEqual({ version: 2, controllerLabel: 'C12' });
    const saved = tub({ controllerLabel: 'C12', version: 3 });
    request.flush({ tub: saved });
    expect(close).toHaveBeenCalledOnceWith(saved);
  });

  it('on a stale edit (409) says what changed and re-applies on the new version', async () => {
    await setUp({ kitTypeId: KIT_ID, tub: tub() });
    await (await input('label')).setValue('Tub 8A');
    await (await button('Save')).click();
    // A colleague marked the tub on loan meanwhile (version 3).
    backend.expectOne(`/api/tubs/${TUB_ID}`).flush(
      {
        error: {
          code: 'stale-version',
          message: 'Someone changed this tub after you opened it.',
          current: tub({ status: 'on-loan', version: 3 }),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('your change was not saved');
    expect(alert?.textContent).toContain('Status is now “On loan” (it was “Ready”)');
    expect(await (await button('Save')).isDisabled()).toBeTrue();

    await (await button('Re-apply my change')).click();
    const again = backend.expectOne(`/api/tubs/${TUB_ID}`);
    // Only the label: the colleague's status stays.
    expect(again.request.body).toEqual({ version: 3, label: 'Tub 8A' });
    const saved = tub({ label: 'Tub 8A', status: 'on-loan', version: 4 });
    again.flush({ tub: saved });
    expect(close).toHaveBeenCalledOnceWith(saved);
  });

  it('on a stale edit, Reload shows the tub as saved now and drops the change', async () => {
    await setUp({ kitTypeId: KIT_ID, tub: tub() });
    await (await input('label')).setValue('Tub 8A');
    await (await button('Save')).click();
    backend.expectOne(`/api/tubs/${TUB_ID}`).flush(
      {
        error: {
          code: 'stale-version',
          message: 'Someone changed this tub after you opened it.',
          current: tub({ label: 'Tub 18', version: 3 }),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    await (await button('Reload')).click();
    expect(await (await input('label')).getValue()).toBe('Tub 18');
    expect((fixture.nativeElement as HTMLElement).querySelector('[role="alert"]')).toBeNull();
    // Unchanged now, so saving asks for a change instead of sending.
    await (await button('Save')).click();
    await settle();
    expect(fixture.nativeElement.textContent).toContain(
      'Change the label, the controller label or the status.',
    );
    backend.expectNone(`/api/tubs/${TUB_ID}`);
  });
});
