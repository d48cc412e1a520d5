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
import { OUTCOME_CSV_MAX_BYTES } from '../../../shared/schemas/outcomes';
import { testProviders } from '../testing/test-providers';
import { OutcomeImportDialog, type OutcomeImportData } from './import-dialog';

const FRAMEWORK_ID = '3c9b1d2e-7f4a-4b8c-9d0e-1f2a3b4c5d6e';
const URL = `/api/outcomes/frameworks/${FRAMEWORK_ID}/import`;
/** An invented outcomes file; the description is an RFC 4180 quoted field holding a comma. */
const CSV =
  'code,description,strand,year_band\r\n' +
  'KR-DT4-01,"Follow, test and fix a sequence of steps for a model",Digital systems,Year 4\r\n';

describe('OutcomeImportDialog', () => {
  let fixture: ComponentFixture<OutcomeImportDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  beforeEach(async () => {
    close = jasmine.createSpy('close');
    const data: OutcomeImportData = {
      frameworkId: FRAMEWORK_ID,
      frameworkName: 'Kestrel Ridge Design and Technologies',
    };
    TestBed.configureTestingModule({
      providers: [
        ...testProviders(),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OutcomeImportDialog);
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

  async function importButton(): Promise<MatButtonHarness> {
    return loader.getHarness(MatButtonHarness.with({ text: 'Import' }));
  }
  async function chooseAndImport(file: File): Promise<void> {
    csvImport().pick([file]);
    fixture.detectChanges();
    await (await importButton()).click();
  }

  it('sends the file as multipart field "file", shows progress and closes with the result', async () => {
    expect(await (await importButton()).isDisabled()).toBeTrue();
    await chooseAndImport(new File([CSV], 'outcomes.csv', { type: 'text/csv' }));
    const request = backend.expectOne(URL);
    expect(request.request.method).toBe('POST');
    const sent = (request.request.body as FormData).get('file') as File;
    expect(sent.name).toBe('outcomes.csv');
    expect(await sent.text()).toBe(CSV);

    request.event({ type: HttpEventType.UploadProgress, loaded: 45, total: 60 });
    fixture.detectChanges();
    const bar = await loader.getHarness(MatProgressBarHarness);
    expect(await bar.getMode()).toBe('determinate');
    // 45 of 60 bytes is 75 %.
    expect(await bar.getValue()).toBe(75);

    const result = { imported: 1, added: 1, updated: 0, removed: 0 };
    request.flush(result);
    expect(close).toHaveBeenCalledOnceWith(result);
  });

  it('lists every bad row (line, column, reason) of a 422 and says nothing was imported', async () => {
    await chooseAndImport(new File([CSV], 'outcomes.csv', { type: 'text/csv' }));
    // The messages are those of shared/schemas/outcomes.ts and server/planning/outcomes-csv.ts.
    backend.expectOne(URL).flush(
      {
        error: {
          code: 'bad-rows',
          message: 'Some rows of the file need fixing. Nothing was imported.',
          details: [
            { path: 'file', line: 3, column: 'code', message: 'Enter a code.' },
            { path: 'file', line: 4, column: 'description', message: 'Enter a description.' },
            { path: 'file', line: 7, column: 'code', message: 'A code is at most 40 characters.' },
            { path: 'file', line: 9, message: 'This line has 5 fields; the header has 4.' },
          ],
        },
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    fixture.detectChanges();
    await fixture.whenStable();
    const table = await loader.getHarness(MatTableHarness);
    expect(await table.getCellTextByIndex()).toEqual([
      ['3', 'code', 'Enter a code.'],
      ['4', 'description', 'Enter a description.'],
      ['7', 'code', 'A code is at most 40 characters.'],
      ['9', '—', 'This line has 5 fields; the header has 4.'],
    ]);
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('Nothing was imported.');
    expect(alert?.textContent).toContain('The framework is unchanged');
    expect(close).not.toHaveBeenCalled();
    expect(await (await importButton()).isDisabled()).toBeFalse();
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toEqual([]);
  });

  it('says nothing was imported even when the server words a 422 otherwise', async () => {
    await chooseAndImport(new File([CSV], 'outcomes.csv', { type: 'text/csv' }));
    backend.expectOne(URL).flush(
      {
        error: {
          code: 'bad-rows',
          message: 'One line needs fixing.',
          details: [
            {
              path: 'file',
              line: 1,
              column: 'description',
              message: 'The header has no “description” column.',
            },
          ],
        },
      },
      { status: 422, statusText: 'Unprocessable Content' },
    );
    fixture.detectChanges();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('One line needs fixing. Nothing was imported.');
  });

  it('shows a wrong file type without a rows table', async () => {
    await chooseAndImport(new File(['%PDF-1.7'], 'outcomes.csv', { type: 'text/csv' }));
    backend
      .expectOne(URL)
      .flush(
        { error: { code: 'unsupported-type', message: 'This file is a PDF file, not a CSV.' } },
        { status: 415, statusText: 'Unsupported Media Type' },
      );
    fixture.detectChanges();
    expect(fixture.nativeElement.textContent).toContain('This file is a PDF file, not a CSV.');
    expect(await loader.getAllHarnesses(MatTableHarness)).toEqual([]);
  });

  it('refuses a file over the 2 MB limit before sending it', async () => {
    const big = new File([new Uint8Array(OUTCOME_CSV_MAX_BYTES + 1)], 'huge.csv');
    csvImport().pick([big]);
    fixture.detectChanges();
    expect(fixture.nativeElement.textContent).toContain('larger than 2 MB');
    expect(await (await importButton()).isDisabled()).toBeTrue();
    backend.expectNone(URL);
  });
});
