import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { LiveAnnouncer } from '@angular/cdk/a11y';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import type { Tub } from '../../../shared/schemas/kits';
import { settleReads, testProviders } from '../testing/test-providers';
import { TubDialog, type TubDialogData } from './tub-dialog';

/** Tub 5 of the invented demo kit: one wheel missing of four, so three in stock. */
const TUB: Tub = {
  id: 'tub-5',
  kitTypeId: 'kit-1',
  kitTypeName: 'Rover Builder Tub',
  label: 'Tub 5',
  controllerLabel: 'C5',
  status: 'ready',
  needsSorting: false,
  version: 2,
  missing: [{ partCode: 'RB-WHL', partName: 'Wheel', count: 1 }],
  missingLines: 1,
  missingPieces: 1,
  lessonCount: 8,
  stock: { 'RB-PEG': 40, 'RB-WHL': 3 },
};

describe('TubDialog', () => {
  let fixture: ComponentFixture<TubDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  async function setUp(canAudit: boolean): Promise<void> {
    close = jasmine.createSpy('close');
    const data: TubDialogData = {
      tubId: 'tub-5',
      canAudit,
      parts: [
        { code: 'RB-PEG', name: 'Connector peg', qty: 40 },
        { code: 'RB-WHL', name: 'Wheel', qty: 4 },
      ],
    };
    TestBed.configureTestingModule({
      providers: [
        ...testProviders(),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TubDialog);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/tubs/tub-5').flush({ tub: TUB });
    backend.expectOne('/api/tubs/tub-5/audits').flush({
      audits: [
        {
          id: 'a1',
          tubId: 'tub-5',
          lessonId: null,
          userName: 'Jordan Pell',
          missing: [{ partCode: 'RB-WHL', count: 1 }],
          found: [],
          note: 'After lesson 1.',
          createdAt: '2026-07-21T12:05:00+09:30',
        },
      ],
    });
    fixture.detectChanges();
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  function rowText(part: string): string {
    const rows = [...(fixture.nativeElement as HTMLElement).querySelectorAll('tbody tr')];
    const row = rows.find((r) => r.textContent?.includes(part));
    return row ? [...row.children].map((c) => c.textContent?.trim()).join('|') : '';
  }

  it('shows stock and missing per part, and the history', async () => {
    await setUp(true);
    expect(rowText('Wheel (RB-WHL)')).toBe('Wheel (RB-WHL)|3|1||');
    expect(rowText('Connector peg')).toBe('Connector peg (RB-PEG)|40|0||');
    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    expect(text).toContain('Missing: 1 × Wheel');
    expect(text).toContain('After lesson 1.');
  });

  it('sends an audit with only the parts counted, then reloads the tub', async () => {
    await setUp(true);
    await (
      await loader.getHarness(
        MatInputHarness.with({ selector: '[aria-label="Gone missing: Connector peg (RB-PEG)"]' }),
      )
    ).setValue('2');
    await (
      await loader.getHarness(
        MatInputHarness.with({ selector: '[aria-label="Turned up: Wheel (RB-WHL)"]' }),
      )
    ).setValue('1');
    await (
      await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }))
    ).setValue('Lost-parts box checked.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record audit' }))).click();
    const request = backend.expectOne('/api/tubs/tub-5/audits');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({
      missing: [{ partCode: 'RB-PEG', count: 2 }],
      found: [{ partCode: 'RB-WHL', count: 1 }],
      note: 'Lost-parts box checked.',
    });
    request.flush({}, { status: 201, statusText: 'Created' });
    // The tub and its audits are read again (resource reloads, started on the next tick).
    await settleReads();
    backend.expectOne('/api/tubs/tub-5').flush({ tub: TUB });
    backend.expectOne('/api/tubs/tub-5/audits').flush({ audits: [] });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Close' }))).click();
    expect(close).toHaveBeenCalledOnceWith(true);
  });

  it('refuses a negative count and an empty audit', async () => {
    await setUp(true);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record audit' }))).click();
    expect(fixture.nativeElement.textContent).toContain('Enter what went missing or turned up');
    await (
      await loader.getHarness(
        MatInputHarness.with({ selector: '[aria-label="Gone missing: Wheel (RB-WHL)"]' }),
      )
    ).setValue('-1');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record audit' }))).click();
    expect(fixture.nativeElement.textContent).toContain('Use a whole number from 0 to 10000.');
    backend.expectNone('/api/tubs/tub-5/audits');
  });

  // WCAG 2.2 SC 4.1.3 Status Messages (the result is said) and SC 2.4.3 Focus Order (the button
  // disabled while sending had focus; it gets it back).
  it('announces and shows a recorded audit, with focus back on Record audit', async () => {
    await setUp(true);
    const announce = spyOn(TestBed.inject(LiveAnnouncer), 'announce').and.resolveTo();
    await (
      await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }))
    ).setValue('Lost-parts box checked.');
    const el = fixture.nativeElement as HTMLElement;
    const button = el.querySelector<HTMLButtonElement>('.record-audit')!;
    button.focus();
    button.click();
    fixture.detectChanges();
    expect(button.disabled).toBeTrue();
    backend.expectOne('/api/tubs/tub-5/audits').flush({}, { status: 201, statusText: 'Created' });
    await settleReads();
    backend.expectOne('/api/tubs/tub-5').flush({ tub: TUB });
    backend.expectOne('/api/tubs/tub-5/audits').flush({ audits: [] });
    await fixture.whenStable();
    const message = 'The audit is recorded: the stock and history below are updated.';
    expect(announce).toHaveBeenCalledWith(message);
    expect(el.querySelector('.recorded')?.textContent).toContain(message);
    expect(document.activeElement).toBe(el.querySelector('.record-audit'));
  });

  // SC 3.3.1 Error Identification: the invalid count may be scrolled off; focus goes to it.
  it('moves focus to the first invalid count', async () => {
    await setUp(true);
    await (
      await loader.getHarness(
        MatInputHarness.with({ selector: '[aria-label="Turned up: Wheel (RB-WHL)"]' }),
      )
    ).setValue('-3');
    const el = fixture.nativeElement as HTMLElement;
    const button = el.querySelector<HTMLButtonElement>('.record-audit')!;
    button.focus();
    button.click();
    await fixture.whenStable();
    expect(document.activeElement?.getAttribute('aria-label')).toBe('Turned up: Wheel (RB-WHL)');
    backend.expectNone('/api/tubs/tub-5/audits');
  });

  it('has no audit form for someone who may only read', async () => {
    await setUp(false);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Record audit' }))).toEqual(
      [],
    );
  });
});
