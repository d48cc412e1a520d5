import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { Router } from '@angular/router';
import type { SchoolClass } from '../../../shared/schemas/classes';
import { Blank, errorBody, settleReads, testProviders } from '../testing/test-providers';
import { CopyDialog, type CopyDialogData } from './copy-dialog';
import type { CopiedUnit } from './reuse-api';

const SOURCE = '0c6f2f4e-51f4-4d1e-9a4b-3f1c2f7d9e01';
const CLASS_4M = '7d1e2a3b-4c5d-4e6f-8a9b-0c1d2e3f4a5b';

/** Invented classes of the invented demo school. */
function classes(): SchoolClass[] {
  return [
    {
      id: '1a2b3c4d-1111-4222-8333-444455556666',
      name: '4K',
      yearLevel: 4,
      studentCount: 27,
      devices: 8,
      teachers: [],
      lessonCount: 8,
    },
    {
      id: CLASS_4M,
      name: '4M',
      yearLevel: 4,
      studentCount: 21,
      devices: 7,
      teachers: [],
      lessonCount: 0,
    },
  ];
}

/** The server's answer to the copy (an invented unit). */
function copiedUnit(): CopiedUnit {
  return {
    id: 'u-copy',
    title: 'Rescue Rovers (4M)',
    yearLevel: 4,
    learningArea: 'Digital Technologies',
    term: 3,
    status: 'draft',
    visibility: 'private',
    owner: { id: 'user-partner', name: 'Jordan Pell', email: 'partner@kestrel-ridge.example' },
    version: 1,
    updatedAt: '2026-07-15T15:45:00+09:30',
    canEdit: true,
    overview: '',
    copiedFromId: SOURCE,
    createdAt: '2026-07-15T15:45:00+09:30',
    coauthors: [],
    outcomes: [],
    lessons: [
      {
        id: 'l-1',
        title: 'Build the chassis',
        date: '2026-10-13',
        startsAt: '2026-10-13T11:10',
        endsAt: '2026-10-13T12:00',
        classId: CLASS_4M,
        className: '4M',
        termNote: null,
      },
      {
        id: 'l-2',
        title: 'Drive straight',
        date: '2026-10-20',
        startsAt: '2026-10-20T11:10',
        endsAt: '2026-10-20T12:00',
        classId: CLASS_4M,
        className: '4M',
        termNote: null,
      },
    ],
    isOwner: true,
    basedOn: {
      unitId: SOURCE,
      title: 'Rescue Rovers',
      version: 3,
      ownerName: 'Sam Kowhai',
      copiedAt: '2026-07-15T06:15:00.000Z',
      readable: true,
    },
    copySummary: {
      text: '7 groups instead of 9; 2 shortfalls fewer; 1 lesson on a day without teaching',
      lessons: [
        {
          lessonId: 'l-1',
          sourceLessonId: 's-1',
          title: 'Build the chassis',
          startsAt: '2026-10-13T11:10',
          notTeaching: null,
          before: { groups: 9, shortfalls: 3 },
          after: { groups: 7, shortfalls: 1 },
        },
        {
          lessonId: 'l-2',
          sourceLessonId: 's-2',
          title: 'Drive straight',
          startsAt: '2026-10-20T11:10',
          notTeaching: 'a non-teaching day (Staff development day)',
          before: null,
          after: null,
        },
      ],
    },
  };
}

describe('CopyDialog', () => {
  let fixture: ComponentFixture<CopyDialog>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let close: jasmine.Spy;

  beforeEach(async () => {
    close = jasmine.createSpy('close');
    const data: CopyDialogData = {
      unitId: SOURCE,
      title: 'Rescue Rovers',
      firstLessonDate: '2026-07-21',
    };
    TestBed.configureTestingModule({
      providers: [
        ...testProviders([{ path: 'units/:id', component: Blank }]),
        { provide: MatDialogRef, useValue: { close } },
        { provide: MAT_DIALOG_DATA, useValue: data },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CopyDialog);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await settleReads();
    backend.expectOne('/api/classes').flush({ classes: classes() });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function inputs() {
    return {
      title: await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=title]' })),
      date: await loader.getHarness(
        MatInputHarness.with({ selector: '[formControlName=startDate]' }),
      ),
    };
  }

  it('starts from the original’s title and first date, and copies with the class and new date', async () => {
    const { title, date } = await inputs();
    expect(await title.getValue()).toBe('Rescue Rovers');
    expect(await date.getValue()).toBe('2026-07-21');
    await title.setValue('Rescue Rovers (4M)');
    const cls = await loader.getHarness(MatSelectHarness);
    await cls.open();
    await cls.clickOptions({ text: '4M (21 students)' });
    await date.setValue('2026-10-13');
    await (await loader.getHarness(MatButtonHarness.with({ text: /Copy$/ }))).click();

    const req = backend.expectOne(`/api/units/${SOURCE}/copy`);
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      title: 'Rescue Rovers (4M)',
      classId: CLASS_4M,
      startDate: '2026-10-13',
    });
    req.flush(copiedUnit(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();

    // The recompute summary, and the lesson that landed on a day without teaching.
    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    expect(text).toContain(
      'Plans for your class: 7 groups instead of 9; 2 shortfalls fewer; 1 lesson on a day without teaching.',
    );
    expect(text).toContain('Drive straight');
    expect(text).toContain('a non-teaching day (Staff development day)');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Open the copy' }))).click();
    await fixture.whenStable();
    expect(close).toHaveBeenCalledWith(jasmine.objectContaining({ id: 'u-copy' }));
    expect(TestBed.inject(Router).url).toBe('/units/u-copy');
  });

  it('leaves out the class and an unchanged date, so lessons keep them', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Copy$/ }))).click();
    const req = backend.expectOne(`/api/units/${SOURCE}/copy`);
    expect(req.request.body).toEqual({ title: 'Rescue Rovers' });
    req.flush(copiedUnit(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
  });

  it('shows the schema’s messages and sends nothing while a field is wrong', async () => {
    const { title } = await inputs();
    await title.setValue('   ');
    await (await loader.getHarness(MatButtonHarness.with({ text: /Copy$/ }))).click();
    const [titleField] = await loader.getAllHarnesses(MatFormFieldHarness);
    // requiredText('a title') of shared/schemas/units.ts.
    expect(await titleField!.getTextErrors()).toEqual(['Enter a title.']);
    backend.expectNone(`/api/units/${SOURCE}/copy`);
  });

  it('puts the server’s field errors under their fields and stays open', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Copy$/ }))).click();
    backend
      .expectOne(`/api/units/${SOURCE}/copy`)
      .flush(
        errorBody('invalid-input', 'Some fields need attention.', [
          { path: 'classId', message: 'Choose a class of your school.' },
        ]),
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    const fields = await loader.getAllHarnesses(MatFormFieldHarness);
    expect(await fields[1]!.getTextErrors()).toEqual(['Choose a class of your school.']);
    expect(close).not.toHaveBeenCalled();
  });
});
