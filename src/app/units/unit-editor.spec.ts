import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { CdkDropList, type CdkDragDrop } from '@angular/cdk/drag-drop';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { By } from '@angular/platform-browser';
import { Router } from '@angular/router';
import { provideMarkdown } from 'ngx-markdown';
import { firstValueFrom, isObservable, of } from 'rxjs';
import type { Unit, UnitLesson } from '../../../shared/schemas/units';
import { Blank, errorBody, settleReads, testProviders } from '../testing/test-providers';
import { UnitEditor } from './unit-editor';
import { unsavedChangesGuard } from '../forms/unsaved-changes';

/** An invented unit of the invented demo school. */
function unit(overrides: Partial<Unit> = {}): Unit {
  return {
    id: 'u-1',
    title: 'Rescue Rovers',
    yearLevel: 4,
    learningArea: 'Digital Technologies',
    term: 3,
    status: 'draft',
    visibility: 'private',
    owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
    version: 2,
    updatedAt: '2026-07-20T09:00:00+09:30',
    canEdit: true,
    overview: 'Students build a rover.',
    copiedFromId: null,
    createdAt: '2026-07-01T09:00:00+09:30',
    coauthors: [],
    outcomes: [],
    lessons: [
      lesson('l-1', 'Meet the rover', '2026-07-21'),
      lesson('l-2', 'Drive train', '2026-07-28'),
    ],
    isOwner: true,
    basedOn: null,
    ...overrides,
  };
}

function lesson(id: string, title: string, date: string): UnitLesson {
  return {
    id,
    title,
    date,
    startsAt: `${date}T11:10`,
    endsAt: `${date}T12:00`,
    classId: 'c',
    className: '4K',
    termNote: null,
  };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe('UnitEditor', () => {
  let fixture: ComponentFixture<UnitEditor>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [...testProviders([{ path: 'units', component: Blank }]), provideMarkdown()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UnitEditor);
    fixture.componentRef.setInput('id', 'u-1');
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(unit());
    backend.expectOne('/api/school/teachers').flush({ teachers: [] });
    // The outcome picker's frameworks are a resource read, started once the form shows.
    await settleReads();
    backend.expectOne('/api/outcomes/frameworks').flush({ frameworks: [] });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';
  const title = () =>
    loader.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' }));
  const button = (label: string | RegExp) =>
    loader.getHarness(MatButtonHarness.with({ text: label }));

  it('sends only the changed fields with the version it loaded', async () => {
    await (await title()).setValue('Rescue Rovers on Mars');
    await (await button('Save changes')).click();
    const req = backend.expectOne('/api/units/u-1');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ version: 2, title: 'Rescue Rovers on Mars' });
    req.flush(unit({ version: 3, title: 'Rescue Rovers on Mars' }));
    await fixture.whenStable();
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();
  });

  it('shows the schema’s message under a field and sends nothing', async () => {
    await (await title()).setValue('   ');
    await (await button('Save changes')).click();
    const [field] = await loader.getAllHarnesses(MatFormFieldHarness);
    // requiredText('a title') in shared/schemas/units.ts.
    expect(await field!.getTextErrors()).toEqual(['Enter a title.']);
    backend.expectNone('/api/units/u-1');
  });

  it('on a 409 says what changed and re-applies only my change on the new version', async () => {
    await (await title()).setValue('Rescue Rovers on Mars');
    await (await button('Save changes')).click();
    const current = unit({ version: 5, learningArea: 'Science' });
    backend
      .expectOne('/api/units/u-1')
      .flush(
        { error: { code: 'stale-version', message: 'Changed.', current } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(text()).toContain('Someone else changed this unit');
    expect(text()).toContain('The learning area is now “Science”.');
    expect(await button('Reload')).toBeTruthy();
    await (await button('Re-apply my change')).click();
    const again = backend.expectOne('/api/units/u-1');
    expect(again.request.body).toEqual({ version: 5, title: 'Rescue Rovers on Mars' });
    // Their learning area stays in the form; my title stays mine.
    const area = await loader.getHarness(
      MatInputHarness.with({ selector: '[formControlName=learningArea]' }),
    );
    expect(await area.getValue()).toBe('Science');
    expect(await (await title()).getValue()).toBe('Rescue Rovers on Mars');
    again.flush(unit({ version: 6, title: 'Rescue Rovers on Mars', learningArea: 'Science' }));
    await fixture.whenStable();
    expect(text()).not.toContain('Someone else changed this unit');
  });

  it('on a 409 Reload shows the unit as it is now and drops my edit', async () => {
    await (await title()).setValue('Mine');
    await (await button('Save changes')).click();
    backend.expectOne('/api/units/u-1').flush(
      {
        error: {
          code: 'stale-version',
          message: 'Changed.',
          current: unit({ version: 4, title: 'Theirs' }),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(text()).toContain('The title is now “Theirs”.');
    await (await button('Reload')).click();
    expect(await (await title()).getValue()).toBe('Theirs');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();
  });

  it('renders the overview preview as Markdown and strips a script', async () => {
    const overview = await loader.getHarness(
      MatInputHarness.with({ selector: '[formControlName=overview]' }),
    );
    await overview.setValue(
      '# Pack-away\n\nCount **every** part.<script>window.previewHacked = true</script>',
    );
    await fixture.whenStable();
    await sleep(50);
    fixture.detectChanges();
    const preview = (fixture.nativeElement as HTMLElement).querySelector('.preview')!;
    expect(preview.querySelector('h1')?.textContent).toBe('Pack-away');
    expect(preview.querySelector('strong')?.textContent).toBe('every');
    expect(preview.querySelector('script')).toBeNull();
    expect((window as unknown as { previewHacked?: boolean }).previewHacked).toBeUndefined();
  });

  it('sends the new lesson order with the version after a move button', async () => {
    const down = MatButtonHarness.with({ selector: '[aria-label="Move Meet the rover down"]' });
    await (await loader.getHarness(down)).click();
    const req = backend.expectOne('/api/units/u-1/lesson-order');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ version: 2, lessonIds: ['l-2', 'l-1'] });
    req.flush(unit({ version: 3, lessons: [...unit().lessons].reverse() }));
    await fixture.whenStable();
    const links = Array.from((fixture.nativeElement as HTMLElement).querySelectorAll('.lessons a'));
    expect(links.map((a) => a.textContent)).toEqual(['Drive train', 'Meet the rover']);
  });

  it('sends the new lesson order after a drag and drop, and puts it back on a 409', async () => {
    const list = fixture.debugElement.query(By.directive(CdkDropList)).injector.get(CdkDropList);
    list.dropped.emit({ previousIndex: 1, currentIndex: 0 } as CdkDragDrop<UnitLesson[]>);
    await fixture.whenStable();
    const req = backend.expectOne('/api/units/u-1/lesson-order');
    expect(req.request.body).toEqual({ version: 2, lessonIds: ['l-2', 'l-1'] });
    req.flush(
      { error: { code: 'stale-version', message: 'Changed.', current: unit({ version: 3 }) } },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    const links = Array.from((fixture.nativeElement as HTMLElement).querySelectorAll('.lessons a'));
    expect(links.map((a) => a.textContent)).toEqual(['Meet the rover', 'Drive train']);
    await (await button('Re-apply my change')).click();
    const again = backend.expectOne('/api/units/u-1/lesson-order');
    expect(again.request.body).toEqual({ version: 3, lessonIds: ['l-2', 'l-1'] });
    again.flush(unit({ version: 4, lessons: [...unit().lessons].reverse() }));
  });

  it('asks before leaving with unsaved changes', async () => {
    const page = fixture.componentInstance;
    const leave = () =>
      TestBed.runInInjectionContext(() => unsavedChangesGuard(page, null!, null!, null!));
    expect(await firstValueFrom(toObservable(leave()))).toBeTrue();
    await (await title()).setValue('Rescue Rovers on Mars');
    const answer = firstValueFrom(toObservable(leave()));
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Leave without saving?');
    await (
      await dialog.getHarness(MatButtonHarness.with({ text: 'Stay and keep editing' }))
    ).click();
    expect(await answer).toBeFalse();
  });

  it('deletes the unit after the owner confirms, then opens the list', async () => {
    await (await button(/Delete unit/)).click();
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Delete “Rescue Rovers”?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete unit' }))).click();
    const req = backend.expectOne('/api/units/u-1?version=2');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(TestBed.inject(Router).url).toBe('/units');
  });

  it('puts the server’s field errors under their fields', async () => {
    await (await title()).setValue('Rescue Rovers on Mars');
    await (await button('Save changes')).click();
    backend
      .expectOne('/api/units/u-1')
      .flush(errorBody('validation', 'Check the fields.', [{ path: 'title', message: 'Taken.' }]), {
        status: 400,
        statusText: 'Bad Request',
      });
    await fixture.whenStable();
    const [field] = await loader.getAllHarnesses(MatFormFieldHarness);
    expect(await field!.getTextErrors()).toEqual(['Taken.']);
  });
});

/** A guard's answer as an observable (it answers a value or an observable). */
function toObservable<T>(value: T | import('rxjs').Observable<T>) {
  return isObservable(value) ? value : of(value);
}

describe('UnitEditor on an endorsed unit', () => {
  let fixture: ComponentFixture<UnitEditor>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [...testProviders([{ path: 'units', component: Blank }]), provideMarkdown()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(UnitEditor);
    fixture.componentRef.setInput('id', 'u-1');
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(unit({ status: 'endorsed' }));
    backend.expectOne('/api/school/teachers').flush({ teachers: [] });
    // The outcome picker's frameworks are a resource read, started once the form shows.
    await settleReads();
    backend.expectOne('/api/outcomes/frameworks').flush({ frameworks: [] });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';
  const title = () =>
    loader.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' }));

  async function saveAndAnswer(answer: string) {
    await (await title()).setValue('Rescue Rovers on Mars');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save changes' }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Return the unit to draft?');
    expect(await dialog.getContentText()).toContain('“Rescue Rovers” is endorsed.');
    await (await dialog.getHarness(MatButtonHarness.with({ text: answer }))).click();
    await fixture.whenStable();
  }

  it('says that saving returns it to draft', () => {
    expect(text()).toContain('This unit is endorsed.');
    expect(text()).toContain('returns it to draft');
  });

  it('sends nothing when the teacher does not confirm, and keeps the change in the form', async () => {
    await saveAndAnswer('Don’t save');
    backend.expectNone('/api/units/u-1');
    expect(await (await title()).getValue()).toBe('Rescue Rovers on Mars');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeTrue();
  });

  it('saves after the teacher confirms; the draft it comes back as asks no more', async () => {
    await saveAndAnswer('Save and return to draft');
    const req = backend.expectOne('/api/units/u-1');
    expect(req.request.body).toEqual({ version: 2, title: 'Rescue Rovers on Mars' });
    req.flush(unit({ version: 3, title: 'Rescue Rovers on Mars', status: 'draft' }));
    await fixture.whenStable();
    expect(text()).not.toContain('This unit is endorsed.');
    await (await title()).setValue('Rescue Rovers on the Moon');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save changes' }))).click();
    expect(await root.getAllHarnesses(MatDialogHarness)).toEqual([]);
    backend
      .expectOne('/api/units/u-1')
      .flush(unit({ version: 4, title: 'Rescue Rovers on the Moon' }));
    await fixture.whenStable();
  });

  it('asks before a new lesson order too, and puts the order back when not confirmed', async () => {
    const list = fixture.debugElement.query(By.directive(CdkDropList)).injector.get(CdkDropList);
    list.dropped.emit({ previousIndex: 1, currentIndex: 0 } as CdkDragDrop<UnitLesson[]>);
    const dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Don’t save' }))).click();
    await fixture.whenStable();
    backend.expectNone('/api/units/u-1/lesson-order');
    const shown = Array.from(
      (fixture.nativeElement as HTMLElement).querySelectorAll('.lessons li'),
      (li) => li.textContent ?? '',
    );
    expect(shown[0]).toContain('Meet the rover');
  });
});
