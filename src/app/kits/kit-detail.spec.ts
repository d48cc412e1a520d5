import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { KitType, TubSummary } from '../../../shared/schemas/kits';
import { DEFAULT_PREP } from '../../../shared/schemas/school';
import { Session } from '../auth/session';
import { Router } from '@angular/router';
import { Blank, demoUser, errorBody, testProviders } from '../testing/test-providers';
import { KitDetail } from './kit-detail';

const KIT_ID = '6b1f3c1e-2a4d-4c59-9a51-0c7f4e2b8d10';

/** The invented demo kit type, cut down to two part lines. */
function kit(version: number, wheelQty: number): KitType {
  return {
    id: KIT_ID,
    name: 'Rover Builder Tub',
    description: 'Invented demo kit.',
    version,
    partCount: 2,
    pieceCount: 40 + wheelQty,
    tubCount: 2,
    lessonCount: 8,
    parts: [
      {
        id: 'p1',
        code: 'RB-PEG',
        name: 'Connector peg',
        colour: 'Grey',
        category: 'connector',
        qty: 40,
        compartment: 'C',
        small: true,
        chargeMinutes: null,
        hasPhoto: false,
      },
      {
        id: 'p2',
        code: 'RB-WHL',
        name: 'Wheel',
        colour: 'Black',
        category: 'wheel',
        qty: wheelQty,
        compartment: 'D',
        small: false,
        chargeMinutes: null,
        hasPhoto: false,
      },
    ],
  };
}

function tub(
  label: string,
  status: TubSummary['status'],
  missing: TubSummary['missing'],
): TubSummary {
  return {
    id: `tub-${label}`,
    kitTypeId: KIT_ID,
    kitTypeName: 'Rover Builder Tub',
    label,
    controllerLabel: `C${label.slice(-1)}`,
    status,
    needsSorting: status === 'needs-sorting',
    version: 1,
    missing,
    missingLines: missing.length,
    missingPieces: missing.reduce((n, m) => n + m.count, 0),
    lessonCount: 8,
  };
}

const SCHOOL = {
  id: 'school-kestrel-ridge',
  name: 'Kestrel Ridge Primary School',
  timezone: 'Australia/Adelaide',
  paperSize: 'A4',
  prep: { ...DEFAULT_PREP },
  terms: [{ id: 't3', name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' }],
  periods: [],
  nonTeachingDays: [],
  version: 1,
};

/**
 * Lets flushed answers land and the reads waiting on them go out. settleReads waits on a timer,
 * which jasmine's mock clock (installed here for "today") holds; an animation frame it does not.
 */
async function settle(): Promise<void> {
  await new Promise((resolve) => requestAnimationFrame(resolve));
  TestBed.tick();
}

describe('KitDetail', () => {
  let fixture: ComponentFixture<KitDetail>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  async function setUp(role: 'teacher' | 'lead'): Promise<void> {
    TestBed.configureTestingModule({
      providers: testProviders([{ path: 'kits', component: Blank }]),
    });
    TestBed.inject(Session).update(demoUser(role));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(KitDetail);
    fixture.componentRef.setInput('id', KIT_ID);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne(`/api/kit-types/${KIT_ID}`).flush({ kitType: kit(3, 4) });
    backend.expectOne(`/api/tubs?kitTypeId=${KIT_ID}`).flush({
      tubs: [
        tub('Tub 5', 'ready', [{ partCode: 'RB-WHL', partName: 'Wheel', count: 1 }]),
        tub('Tub 7', 'needs-sorting', []),
      ],
    });
    backend.expectOne(`/api/kit-types/${KIT_ID}/replacements`).flush({
      lines: [
        { partCode: 'RB-WHL', name: 'Wheel', missing: 1, tubs: [{ label: 'Tub 5', count: 1 }] },
      ],
    });
    backend.expectOne('/api/school').flush({ school: SCHOOL });
    // The conflicts are read for the term around today, once the terms have landed.
    await settle();
    backend
      .expectOne((r) => r.url === '/api/conflicts')
      .flush({
        conflicts: [
          {
            lessons: [],
            tubs: ['Tub 3'],
            message: '"Lesson 2" and "Lesson 9" overlap and both book Tub 3.',
          },
        ],
        rechargeGaps: [],
      });
    fixture.detectChanges();
    await fixture.whenStable();
  }

  beforeEach(() => jasmine.clock().install());
  afterEach(() => {
    jasmine.clock().uninstall();
    backend.verify();
  });

  it('shows tub statuses in words, a tub that needs sorting, replacements and conflicts', async () => {
    jasmine.clock().mockDate(new Date('2026-08-10T12:00:00Z'));
    await setUp('teacher');
    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    expect(text).toContain('Needs sorting — sort and count before use');
    expect(text).toContain('1 × Wheel (RB-WHL)');
    expect(text).toContain('Tub 5 (1)');
    expect(text).toContain('overlap and both book Tub 3');
    const row = (fixture.nativeElement as HTMLElement).querySelector('.row-needs-sorting');
    expect(row?.textContent).toContain('Tub 7');
    const links = [...(fixture.nativeElement as HTMLElement).querySelectorAll('a[download]')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual([
      `/api/kit-types/${KIT_ID}/parts.csv`,
      `/api/kit-types/${KIT_ID}/replacements.csv`,
    ]);
  });

  it('asks for the conflicts of the current term', async () => {
    jasmine.clock().mockDate(new Date('2026-08-10T12:00:00Z'));
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('teacher'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(KitDetail);
    fixture.componentRef.setInput('id', KIT_ID);
    fixture.detectChanges();
    backend.expectOne(`/api/kit-types/${KIT_ID}`).flush({ kitType: kit(3, 4) });
    backend.expectOne(`/api/tubs?kitTypeId=${KIT_ID}`).flush({ tubs: [] });
    backend.expectOne(`/api/kit-types/${KIT_ID}/replacements`).flush({ lines: [] });
    backend.expectOne('/api/school').flush({ school: SCHOOL });
    await settle();
    const request = backend.expectOne((r) => r.url === '/api/conflicts');
    expect(request.request.params.get('from')).toBe('2026-07-20');
    expect(request.request.params.get('to')).toBe('2026-09-26'); // the To day included: the API's to is exclusive
    request.flush({ conflicts: [], rechargeGaps: [] });
  });

  it('hides the edit controls from a lead', async () => {
    await setUp('lead');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Import CSV/ }))).toEqual([]);
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Edit"]' })),
    ).toEqual([]);
  });

  it('sends the version with an edit and, on 409, shows the list saved now and re-applies on request', async () => {
    await setUp('teacher');
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Edit RB-WHL"]' }))
    ).click();
    await (
      await loader.getHarness(MatInputHarness.with({ selector: '[aria-label="Name"]' }))
    ).setValue('Big wheel');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save' }))).click();
    const first = backend.expectOne(`/api/kit-types/${KIT_ID}/parts/p2`);
    expect(first.request.method).toBe('PATCH');
    expect(first.request.body).toEqual({ version: 3, name: 'Big wheel' });
    // A colleague changed the wheel quantity to 6 meanwhile (version 4).
    first.flush(
      {
        error: {
          code: 'stale-version',
          message: 'Someone changed this kit type.',
          current: kit(4, 6),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    fixture.detectChanges();
    await fixture.whenStable();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('was not saved');
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getCellTextByColumnName())['qty']?.text).toEqual(['40', '6']);

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-apply my change' }))).click();
    const second = backend.expectOne(`/api/kit-types/${KIT_ID}/parts/p2`);
    expect(second.request.body).toEqual({ version: 4, name: 'Big wheel' });
    second.flush({
      kitType: {
        ...kit(5, 6),
        parts: kit(5, 6).parts.map((p) => (p.id === 'p2' ? { ...p, name: 'Big wheel' } : p)),
      },
    });
    await settle();
    backend.expectOne(`/api/tubs?kitTypeId=${KIT_ID}`).flush({ tubs: [] });
    fixture.detectChanges();
    await fixture.whenStable();
    expect((await table.getCellTextByColumnName())['name']?.text).toEqual([
      'Connector peg',
      'Big wheel',
    ]);
    expect((fixture.nativeElement as HTMLElement).querySelector('.form-error')).toBeNull();
  });

  it('adds a part with the version; a code already used brings the typed row back', async () => {
    await setUp('teacher');
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a part/ }))).click();
    const field = (label: string) =>
      loader.getHarness(MatInputHarness.with({ selector: `[aria-label="${label}"]` }));
    await (await field('Code')).setValue('RB-PEG');
    await (await field('Name')).setValue('Spacer ring');
    await (await field('Qty per tub')).setValue('12');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add' }))).click();
    const first = backend.expectOne(`/api/kit-types/${KIT_ID}/parts`);
    expect(first.request.method).toBe('POST');
    expect(first.request.body).toEqual({
      version: 3,
      part: {
        code: 'RB-PEG',
        name: 'Spacer ring',
        colour: null,
        category: 'other',
        qty: 12,
        compartment: null,
        small: false,
        chargeMinutes: null,
      },
    });
    first.flush(errorBody('code-taken', 'Another part already has the code RB-PEG.'), {
      status: 409,
      statusText: 'Conflict',
    });
    fixture.detectChanges();
    await fixture.whenStable();
    // The row is back with what was typed, to correct the code.
    expect(await (await field('Name')).getValue()).toBe('Spacer ring');
    await (await field('Code')).setValue('RB-RNG');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add' }))).click();
    const second = backend.expectOne(`/api/kit-types/${KIT_ID}/parts`);
    expect((second.request.body as { part: { code: string } }).part.code).toBe('RB-RNG');
    const withRing = kit(4, 4);
    withRing.parts.push({ ...withRing.parts[0]!, id: 'p3', code: 'RB-RNG', name: 'Spacer ring' });
    second.flush({ kitType: withRing }, { status: 201, statusText: 'Created' });
    await settle();
    backend.expectOne(`/api/tubs?kitTypeId=${KIT_ID}`).flush({ tubs: [] });
    fixture.detectChanges();
    await fixture.whenStable();
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getCellTextByColumnName())['code']?.text).toEqual([
      'RB-PEG',
      'RB-WHL',
      'RB-RNG',
    ]);
  });

  it('removes a part after asking, with the version; a part lessons use stays (409 in the dialog)', async () => {
    await setUp('teacher');
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Remove RB-WHL"]' }))
    ).click();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Remove RB-WHL' }))).click();
    const request = backend.expectOne((r) => r.url === `/api/kit-types/${KIT_ID}/parts/p2`);
    expect(request.request.method).toBe('DELETE');
    expect(request.request.params.get('version')).toBe('3');
    const message = 'RB-WHL Wheel is in the materials of “Lesson 2” (Rescue rovers).';
    request.flush(errorBody('part-in-use', message), { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();
    await fixture.whenStable();
    expect(document.querySelector('mat-dialog-container [role="alert"]')?.textContent).toContain(
      message,
    );
    // Clicked directly: a harness click would wait for the read that closing starts.
    const close = [...document.querySelectorAll('mat-dialog-container button')].find(
      (b) => b.textContent?.trim() === 'Close',
    ) as HTMLButtonElement;
    close.click();
    jasmine.clock().tick(1000);
    await settle();
    // The list is read again, in case the refusal came from a newer one.
    backend.expectOne(`/api/kit-types/${KIT_ID}`).flush({ kitType: kit(3, 4) });
  });

  it('refuses to delete a kit type that lessons use (409) with the server message', async () => {
    await setUp('teacher');
    const navigate = spyOn(TestBed.inject(Router), 'navigate');
    await (await loader.getHarness(MatButtonHarness.with({ text: /Delete kit type/ }))).click();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete kit type' }))).click();
    const request = backend.expectOne(`/api/kit-types/${KIT_ID}`);
    expect(request.request.method).toBe('DELETE');
    const message =
      'Rover Builder Tub is used by 8 lessons. Give them another kit type or delete them first.';
    request.flush(errorBody('in-use', message), { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();
    await fixture.whenStable();
    const alert = document.querySelector('mat-dialog-container [role="alert"]');
    expect(alert?.textContent).toContain(message);
    // Trying again would be refused the same way: only Close is left.
    expect(
      await dialog.getAllHarnesses(MatButtonHarness.with({ text: 'Delete kit type' })),
    ).toEqual([]);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Close' }))).click();
    expect(navigate).not.toHaveBeenCalled();
  });

  it('deletes an unused kit type after asking and goes back to the kit types', async () => {
    await setUp('teacher');
    const navigate = spyOn(TestBed.inject(Router), 'navigate').and.resolveTo(true);
    await (await loader.getHarness(MatButtonHarness.with({ text: /Delete kit type/ }))).click();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete kit type' }))).click();
    backend
      .expectOne(`/api/kit-types/${KIT_ID}`)
      .flush(null, { status: 204, statusText: 'No Content' });
    fixture.detectChanges();
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledOnceWith(['/kits']);
  });

  it('refuses to delete a tub that lessons book (409) with the server message', async () => {
    await setUp('teacher');
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Delete Tub 5"]' }))
    ).click();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete Tub 5' }))).click();
    const request = backend.expectOne('/api/tubs/tub-Tub%205');
    expect(request.request.method).toBe('DELETE');
    const message =
      'Tub 5 is booked by 8 lessons. Take it off those lessons first, or mark it retired.';
    request.flush(errorBody('in-use', message), { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();
    await fixture.whenStable();
    expect(document.querySelector('mat-dialog-container [role="alert"]')?.textContent).toContain(
      message,
    );
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Close' }))).click();
  });

  it('hides the tub and kit type controls from a lead', async () => {
    await setUp('lead');
    for (const text of [/Add tub/, /Delete kit type/, /Edit name and description/]) {
      expect(await loader.getAllHarnesses(MatButtonHarness.with({ text }))).toEqual([]);
    }
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Delete"]' })),
    ).toEqual([]);
  });
});
