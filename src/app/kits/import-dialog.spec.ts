import { By } from '@angular/platform-browser';
import { CsvImport } from '../files/csv-import';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpEventType } from '@angular/common/http';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { MAX_CSV_BYTES } from '../../../shared/schemas/kits';
import { testProviders } from '../testing/test-providers';
import { ImportDialog, type ImportDialogData } from './import-dialog';

const KIT_ID = '6b1f3c1e-2a4d-4c59-9a51-0c7f4e2b8d10';
const URL = `/api/kit-types/${KIT_ID}/parts/import`;
/** An invented parts list in the CSV format of API.md, with an RFC 4180 quoted field. */
const CSV = 'code,name,qty\r\nRB-PEG,"Connector peg, grey",40\r\n';

describe('ImportDialog', () => {
  let fixture: ComponentFixture<ImportDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  beforeEach(async () => {
    close = jasmine.createSpy('close');
    const data: ImportDialogData = { kitTypeId: KIT_ID, kitTypeName: 'Rover Builder Tub' };
    TestBed.configureTestingModule({
      providers: [
        ...testProviders(),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ImportDialog);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  /** The dialog's shared CSV upload body (its file picker is a hidden input). */
  function csvImport(): CsvImport<unknown> {
    return fixture.debugElement.query(By.directive(CsvImport))
      .componentInstance as CsvImport<unknown>;
  }

  async function chooseAndImport(file: File): Promise<void> {
    csvImport().pick([file]);
    fixture.detectChanges();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).click();
  }

  it('sends the file as multipart field "file" and shows the upload progress', async () => {
    const importButton = await loader.getHarness(MatButtonHarness.with({ text: 'Import' }));
    expect(await importButton.isDisabled()).toBeTrue();
    await chooseAndImport(new File([CSV], 'rover-parts.csv', { type: 'text/csv' }));
    const request = backend.expectOne(URL);
    expect(request.request.method).toBe('POST');
    expect(request.request.reportProgress).toBeTrue();
    const body = request.request.body as FormData;
    expect(body instanceof FormData).toBeTrue();
    const sent = body.get('file') as File;
    expect(sent.name).toBe('rover-parts.csv');
    expect(await sent.text()).toBe(CSV);

    request.event({ type: HttpEventType.UploadProgress, loaded: 30, total: 120 });
    fixture.detectChanges();
    const bar = await loader.getHarness(MatProgressBarHarness);
    expect(await bar.getMode()).toBe('determinate');
    // 30 of 120 bytes is 25 %.
    expect(await bar.getValue()).toBe(25);
    expect(await importButton.isDisabled()).toBeTrue();

    request.flush({ imported: 1 });
    expect(close).toHaveBeenCalledOnceWith(1);
  });

  it('lists every bad row with line, column and reason, and says nothing was imported', async () => {
    await chooseAndImport(new File([CSV], 'rover-parts.csv', { type: 'text/csv' }));
    backend.expectOne(URL).flush(
      {
        error: {
          code: 'csv-rows',
          message: '2 lines need attention. Nothing was imported.',
          details: [
            { path: '', line: 3, column: 'qty', message: 'Use a whole number from 0 to 10000.' },
            { path: '', line: 5, column: 'category', message: 'Pick a category: controller, …' },
            { path: '', line: 5, column: 'code', message: 'Code RB-PEG is already on line 2.' },
          ],
        },
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    fixture.detectChanges();
    await fixture.whenStable();
    const table = await loader.getHarness(MatTableHarness);
    const cells = await table.getCellTextByIndex();
    expect(cells).toEqual([
      ['3', 'qty', 'Use a whole number from 0 to 10000.'],
      ['5', 'category', 'Pick a category: controller, …'],
      ['5', 'code', 'Code RB-PEG is already on line 2.'],
    ]);
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('Nothing was imported');
    expect(alert?.textContent).toContain('The parts list is unchanged');
    expect(close).not.toHaveBeenCalled();
    // The person can fix the file and try again.
    expect(
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).isDisabled(),
    ).toBeFalse();
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toEqual([]);
  });

  it('shows another failure (a wrong file type) without a rows table', async () => {
    await chooseAndImport(new File(['%PDF-1.7'], 'parts.csv', { type: 'text/csv' }));
    backend
      .expectOne(URL)
      .flush(
        { error: { code: 'unsupported-type', message: 'That file is not a CSV.' } },
        { status: 415, statusText: 'Unsupported Media Type' },
      );
    fixture.detectChanges();
    expect(fixture.nativeElement.textContent).toContain('That file is not a CSV.');
    expect(await loader.getAllHarnesses(MatTableHarness)).toEqual([]);
  });

  it('imports a corrected file chosen again under the same name (the picker is emptied after each choice)', async () => {
    const picker = (fixture.nativeElement as HTMLElement).querySelector(
      'input[type="file"]',
    ) as HTMLInputElement;
    const choose = (file: File) => {
      const transfer = new DataTransfer();
      transfer.items.add(file);
      picker.files = transfer.files;
      picker.dispatchEvent(new Event('change'));
      fixture.detectChanges();
    };
    choose(new File(['code,name,qty\r\nA,Axle,x\r\n'], 'parts.csv', { type: 'text/csv' }));
    // An emptied picker fires "change" again when the same file is chosen (HTML, the input
    // element's "change" event fires only when the selection changed).
    expect(picker.value).toBe('');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).click();
    backend.expectOne(URL).flush(
      {
        error: {
          code: 'csv-rows',
          message: '1 line needs attention. Nothing was imported.',
          details: [{ path: '', line: 2, column: 'qty', message: 'Use a whole number.' }],
        },
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    fixture.detectChanges();

    choose(new File([CSV], 'parts.csv', { type: 'text/csv' }));
    expect(picker.value).toBe('');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).click();
    const again = backend.expectOne(URL);
    expect(await ((again.request.body as FormData).get('file') as File).text()).toBe(CSV);
    again.flush({ imported: 1 });
    expect(close).toHaveBeenCalledOnceWith(1);
  });

  it('refuses a file over the 2 MB limit before sending it', async () => {
    const big = new File([new Uint8Array(MAX_CSV_BYTES + 1)], 'huge.csv', { type: 'text/csv' });
    csvImport().pick([big]);
    fixture.detectChanges();
    expect(fixture.nativeElement.textContent).toContain('larger than 2 MB');
    expect(
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).isDisabled(),
    ).toBeTrue();
    backend.expectNone(URL);
  });
});
