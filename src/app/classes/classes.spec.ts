import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { SchoolClass } from '../../../shared/schemas/classes';
import { Session } from '../auth/session';
import { demoUser, testProviders } from '../testing/test-providers';
import { ClassForm } from './class-form';
import { Classes } from './classes';

/** Invented classes of the invented demo school. */
const CLASS_4K: SchoolClass = {
  id: 'c-4k',
  name: '4K',
  yearLevel: 4,
  studentCount: 26,
  devices: 14,
  teachers: [{ id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' }],
  lessonCount: 8,
};

describe('ClassForm', () => {
  let fixture: ComponentFixture<ClassForm>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  async function setUp(data: SchoolClass | null): Promise<void> {
    close = jasmine.createSpy('close');
    TestBed.configureTestingModule({
      providers: [
        ...testProviders(),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ClassForm);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/school/teachers').flush({
      teachers: [
        { id: 't-jordan', name: 'Jordan Pereira', email: 'partner@kestrel-ridge.example' },
        { id: 't-sam', name: 'Sam Kowhai', email: 'teacher@kestrel-ridge.example' },
      ],
    });
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  async function errorOf(label: string): Promise<string[]> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return field.getTextErrors();
  }

  async function input(label: string): Promise<MatInputHarness> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  it('shows a message under every empty field and sends nothing', async () => {
    await setUp(null);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add class' }))).click();
    // The messages of shared/schemas/classes.ts, as the server would give them.
    expect(await errorOf('Class name')).toEqual(['Enter a class name, like 4K.']);
    expect(await errorOf('Year level')).toEqual(['Pick a year level.']);
    expect(await errorOf('Number of students')).toEqual(['Enter the number of students.']);
    expect(await errorOf('Number of devices')).toEqual([
      'Enter the number of devices (0 if none).',
    ]);
    backend.expectNone('/api/classes');
  });

  it('applies the ranges of the schema (students 1–60, devices 0–200, whole numbers)', async () => {
    await setUp(null);
    await (await input('Number of students')).setValue('0');
    await (await input('Number of devices')).setValue('201');
    await (await input('Class name')).setValue('x'.repeat(41));
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add class' }))).click();
    expect(await errorOf('Number of students')).toEqual(['Use a whole number from 1 to 60.']);
    expect(await errorOf('Number of devices')).toEqual(['Use a whole number from 0 to 200.']);
    expect(await errorOf('Class name')).toEqual(['A class name is at most 40 characters.']);
    await (await input('Number of students')).setValue('12.5');
    expect(await errorOf('Number of students')).toEqual(['Use a whole number from 1 to 60.']);
    // Zero devices is allowed: a class may have none.
    await (await input('Number of devices')).setValue('0');
    expect(await errorOf('Number of devices')).toEqual([]);
    backend.expectNone('/api/classes');
  });

  it('adds a valid class and closes with it', async () => {
    await setUp(null);
    await (await input('Class name')).setValue(' 4M ');
    const year = await loader.getHarness(MatSelectHarness);
    await year.open();
    await year.clickOptions({ text: 'Year 4' });
    await (await input('Number of students')).setValue('24');
    await (await input('Number of devices')).setValue('12');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add class' }))).click();
    const request = backend.expectOne('/api/classes');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({
      name: '4M',
      yearLevel: 4,
      studentCount: 24,
      devices: 12,
    });
    const saved = { ...CLASS_4K, id: 'c-4m', name: '4M', studentCount: 24, devices: 12 };
    request.flush({ class: saved }, { status: 201, statusText: 'Created' });
    expect(close).toHaveBeenCalledOnceWith(saved);
  });

  it('sends the teachers picked for the class', async () => {
    await setUp(null);
    await (await input('Class name')).setValue('4M');
    const [year, teachers] = await loader.getAllHarnesses(MatSelectHarness);
    await year!.open();
    await year!.clickOptions({ text: 'Year 4' });
    await (await input('Number of students')).setValue('25');
    await (await input('Number of devices')).setValue('7');
    await teachers!.open();
    await teachers!.clickOptions({ text: 'Jordan Pereira' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add class' }))).click();
    const request = backend.expectOne('/api/classes');
    expect(request.request.body.teacherIds).toEqual(['t-jordan']);
    request.flush(
      { class: { ...CLASS_4K, id: 'c-4m', name: '4M' } },
      { status: 201, statusText: 'Created' },
    );
  });

  it('puts a server error under its field', async () => {
    await setUp(CLASS_4K);
    expect(await (await input('Class name')).getValue()).toBe('4K');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save' }))).click();
    const request = backend.expectOne('/api/classes/c-4k');
    expect(request.request.method).toBe('PATCH');
    request.flush(
      {
        error: {
          code: 'name-taken',
          message: 'Another class has this name.',
          details: [
            { path: 'name', message: 'Another class of the school already has this name.' },
          ],
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    fixture.detectChanges();
    expect(await errorOf('Class name')).toEqual([
      'Another class of the school already has this name.',
    ]);
    expect(close).not.toHaveBeenCalled();
  });
});

describe('Classes', () => {
  let fixture: ComponentFixture<Classes>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  async function setUp(role: 'teacher' | 'lead'): Promise<void> {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser(role));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Classes);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/classes').flush({ classes: [CLASS_4K] });
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  it('lists the classes with the year level in words', async () => {
    await setUp('teacher');
    const table = await loader.getHarness(MatTableHarness);
    const [row] = await table.getRows();
    const cells = await row!.getCellTextByColumnName();
    expect(cells['name']).toBe('4K');
    expect(cells['yearLevel']).toBe('Year 4');
    expect(cells['teachers']).toBe('Jordan Pell');
  });

  it('asks before deleting and shows the refusal of a class that lessons use', async () => {
    await setUp('teacher');
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Delete 4K"]' }))
    ).click();
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Delete 4K?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete' }))).click();
    const request = backend.expectOne('/api/classes/c-4k');
    expect(request.request.method).toBe('DELETE');
    const message = '4K is used by 8 lessons. Move them to another class or delete them first.';
    request.flush({ error: { code: 'in-use', message } }, { status: 409, statusText: 'Conflict' });
    fixture.detectChanges();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent?.trim()).toBe(message);
    expect((await (await loader.getHarness(MatTableHarness)).getRows()).length).toBe(1);
  });

  it('hides add, edit and delete from a lead', async () => {
    await setUp('lead');
    expect(await loader.getAllHarnesses(MatButtonHarness)).toEqual([]);
  });
});
