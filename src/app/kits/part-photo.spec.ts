import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpEventType } from '@angular/common/http';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MAX_PHOTO_BYTES, type Part } from '../../../shared/schemas/kits';
import { testProviders } from '../testing/test-providers';
import { PHOTO_TOO_LARGE_MESSAGE, PHOTO_WRONG_TYPE_MESSAGE, PartPhoto } from './part-photo';

const KIT_ID = '6b1f3c1e-2a4d-4c59-9a51-0c7f4e2b8d10';
const URL = `/api/kit-types/${KIT_ID}/parts/RB-WHL/photo`;
/** The 8-byte PNG signature (ISO/IEC 15948 / W3C PNG specification, section 5.2). */
const PNG_SIGNATURE = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/** An invented part of the invented demo kit type. */
const WHEEL: Part = {
  id: 'p4',
  code: 'RB-WHL',
  name: 'Wheel',
  colour: 'Black',
  category: 'wheel',
  qty: 4,
  compartment: 'D',
  small: false,
  chargeMinutes: null,
  hasPhoto: false,
};

describe('PartPhoto', () => {
  let fixture: ComponentFixture<PartPhoto>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let changed: Part[];

  async function setUp(part: Part, canEdit: boolean): Promise<void> {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PartPhoto);
    fixture.componentRef.setInput('kitTypeId', KIT_ID);
    fixture.componentRef.setInput('part', part);
    fixture.componentRef.setInput('canEdit', canEdit);
    changed = [];
    fixture.componentInstance.changed.subscribe((p) => changed.push(p));
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  const element = () => fixture.nativeElement as HTMLElement;

  async function settle(): Promise<void> {
    fixture.detectChanges();
    await fixture.whenStable();
  }

  it('shows the stored photo with the part name as its text, and no controls to a reader', async () => {
    await setUp({ ...WHEEL, hasPhoto: true }, false);
    const img = element().querySelector('img');
    expect(img?.getAttribute('src')).toBe(URL);
    expect(img?.getAttribute('alt')).toBe('Wheel');
    expect(await loader.getAllHarnesses(MatButtonHarness)).toEqual([]);
    expect(element().querySelector('input[type="file"]')).toBeNull();
  });

  it('offers PNG, JPEG and WebP only, and uploads multipart field "file" with progress', async () => {
    await setUp(WHEEL, true);
    expect(element().querySelector('img')).toBeNull();
    const picker = element().querySelector<HTMLInputElement>('input[type="file"]');
    expect(picker?.accept).toBe('image/png,image/jpeg,image/webp');
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Remove"]' })),
    ).toEqual([]);

    const photo = new File([PNG_SIGNATURE], 'wheel.png', { type: 'image/png' });
    fixture.componentInstance.pick([photo]);
    const request = backend.expectOne(URL);
    expect(request.request.method).toBe('PUT');
    expect(request.request.reportProgress).toBeTrue();
    const body = request.request.body as FormData;
    expect(body instanceof FormData).toBeTrue();
    const sent = body.get('file') as File;
    expect(sent.name).toBe('wheel.png');
    expect(new Uint8Array(await sent.arrayBuffer())).toEqual(PNG_SIGNATURE);

    request.event({ type: HttpEventType.UploadProgress, loaded: 2, total: 8 });
    await settle();
    const bar = await loader.getHarness(MatProgressBarHarness);
    // 2 of 8 bytes is 25 %.
    expect(await bar.getValue()).toBe(25);
    const upload = await loader.getHarness(
      MatButtonHarness.with({ selector: '[aria-label="Upload a photo of Wheel"]' }),
    );
    expect(await upload.isDisabled()).toBeTrue();

    request.flush({ part: { ...WHEEL, hasPhoto: true } }, { status: 201, statusText: 'Created' });
    expect(changed).toEqual([{ ...WHEEL, hasPhoto: true }]);
    await settle();
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toEqual([]);
  });

  it('says in plain words when the server finds the file is not a picture (415)', async () => {
    await setUp(WHEEL, true);
    // A PDF renamed to .png: the browser reports the name's type, the server sniffs the bytes.
    fixture.componentInstance.pick([new File(['%PDF-1.7'], 'wheel.png', { type: 'image/png' })]);
    backend.expectOne(URL).flush(
      {
        error: {
          code: 'unsupported-type',
          message: 'This file is a PDF file. Upload a PNG, JPEG or WebP file.',
        },
      },
      { status: 415, statusText: 'Unsupported Media Type' },
    );
    await settle();
    const alert = element().querySelector('[role="alert"]')?.textContent ?? '';
    expect(alert).toContain(PHOTO_WRONG_TYPE_MESSAGE);
    expect(alert).toContain('That file is not a PNG, JPEG or WebP picture');
    expect(changed).toEqual([]);
  });

  it('says the photo is too large when the server answers 413', async () => {
    await setUp(WHEEL, true);
    fixture.componentInstance.pick([new File([PNG_SIGNATURE], 'wheel.png', { type: 'image/png' })]);
    backend
      .expectOne(URL)
      .flush(
        { error: { code: 'too-large', message: 'The upload is too large.' } },
        { status: 413, statusText: 'Content Too Large' },
      );
    await settle();
    expect(element().querySelector('[role="alert"]')?.textContent).toContain('larger than 5 MB');
  });

  it('refuses a photo over 5 MB before sending it', async () => {
    await setUp(WHEEL, true);
    const big = new File([new Uint8Array(MAX_PHOTO_BYTES + 1)], 'wheel.jpg', {
      type: 'image/jpeg',
    });
    fixture.componentInstance.pick([big]);
    await settle();
    expect(element().querySelector('[role="alert"]')?.textContent).toContain(
      PHOTO_TOO_LARGE_MESSAGE,
    );
    backend.expectNone(URL);
  });

  it('removes a photo after asking', async () => {
    await setUp({ ...WHEEL, hasPhoto: true }, true);
    await (
      await loader.getHarness(
        MatButtonHarness.with({ selector: '[aria-label="Remove the photo of Wheel"]' }),
      )
    ).click();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Remove photo' }))).click();
    const request = backend.expectOne(URL);
    expect(request.request.method).toBe('DELETE');
    request.flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    expect(changed).toEqual([{ ...WHEEL, hasPhoto: false }]);
  });
});
