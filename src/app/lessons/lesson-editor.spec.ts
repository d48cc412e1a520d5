import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { Router } from '@angular/router';
import { provideMarkdown } from 'ngx-markdown';
import type { TubSummary } from '../../../shared/schemas/kits';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import type { Activity, Lesson } from '../../../shared/schemas/lessons';
import type { Unit } from '../../../shared/schemas/units';
import {
  answerWhenAsked,
  Blank,
  errorBody,
  settleReads,
  testProviders,
} from '../testing/test-providers';
import { LessonEditor } from './lesson-editor';

// Invented demo records; ids are valid UUIDs because the form checks them as the schema does.
const CLASS_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e01';
const KIT_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e02';
const GATE_KIT_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e04';
const PERIOD_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e03';
const RELIEF_ID = '00000000-0000-4000-8000-0000000000e1';
const TUB_IDS = ['0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e11', '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e12'];
const RETIRED_TUB = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e13';

function tub(id: string, label: string, status: TubSummary['status']): TubSummary {
  return {
    id,
    kitTypeId: KIT_ID,
    kitTypeName: 'Rover Builder Tub',
    label,
    controllerLabel: null,
    status,
    needsSorting: false,
    version: 1,
    missing: [],
    missingLines: 0,
    missingPieces: 0,
    lessonCount: 0,
  };
}

function lesson(overrides: Partial<Lesson> = {}): Lesson {
  return {
    id: 'lesson-1',
    version: 3,
    position: 1,
    title: 'Build the rover',
    unit: { id: 'unit-1', title: 'Rescue Rovers', status: 'draft' },
    class: { id: CLASS_ID, name: '4K', yearLevel: 4, studentCount: 26, devices: 8 },
    kitType: { id: KIT_ID, name: 'Rover Builder Tub' },
    tubIds: [...TUB_IDS],
    tubs: [],
    startsAt: '2026-07-28T11:10',
    endsAt: '2026-07-28T12:00',
    periodId: PERIOD_ID,
    room: '',
    groupSize: 3,
    learningIntention: '',
    successCriteria: '',
    reliefNotes: '',
    reliefTeacherId: null,
    canEdit: true,
    activities: [],
    updatedAt: '2026-07-01T09:00:00+09:30',
    bookingConflicts: [],
    ...overrides,
  };
}

/** The unit a new lesson goes in, as `GET /api/units/:id` answers (invented). */
function unitOf(status: Unit['status']): Unit {
  return {
    id: 'unit-1',
    title: 'Rescue Rovers',
    yearLevel: 4,
    learningArea: 'Digital Technologies',
    term: 3,
    status,
    visibility: 'school',
    owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
    version: 2,
    updatedAt: '2026-07-20T09:00:00+09:30',
    canEdit: true,
    overview: '',
    copiedFromId: null,
    basedOn: null,
    createdAt: '2026-07-01T09:00:00+09:30',
    coauthors: [],
    outcomes: [],
    lessons: [],
    isOwner: true,
  };
}

describe('LessonEditor', () => {
  let fixture: ComponentFixture<LessonEditor>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  async function start(
    inputs: Record<string, string>,
    unitStatus: Unit['status'] = 'draft',
  ): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        testProviders([{ path: 'lessons/:id/edit', component: Blank }]),
        provideMarkdown(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LessonEditor);
    for (const [k, v] of Object.entries(inputs)) fixture.componentRef.setInput(k, v);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/classes').flush({
      classes: [
        {
          id: CLASS_ID,
          name: '4K',
          yearLevel: 4,
          studentCount: 26,
          devices: 8,
          teachers: [],
          lessonCount: 0,
        },
      ],
    });
    backend.expectOne('/api/kit-types').flush({
      kitTypes: [
        {
          id: KIT_ID,
          name: 'Rover Builder Tub',
          description: '',
          version: 1,
          partCount: 0,
          pieceCount: 0,
          tubCount: 3,
          lessonCount: 0,
        },
        {
          id: GATE_KIT_ID,
          name: 'Gate Builder Tub',
          description: '',
          version: 1,
          partCount: 1,
          pieceCount: 4,
          tubCount: 1,
          lessonCount: 0,
        },
      ],
    });
    backend.expectOne('/api/school').flush({
      school: {
        id: 'school-1',
        name: 'Kestrel Ridge Primary School',
        timezone: 'Australia/Adelaide',
        paperSize: 'A4',
        prep: {},
        terms: [],
        periods: [{ id: PERIOD_ID, name: 'Period 3', startsAt: '11:10', endsAt: '12:00' }],
        nonTeachingDays: [],
        version: 1,
      },
    });
    backend.expectOne('/api/relief/teachers').flush({
      teachers: [{ id: RELIEF_ID, name: 'Robin Tally', email: 'relief@kestrel-ridge.example' }],
    });
    // A new lesson's unit is read for its review status.
    if (inputs['unit']) {
      await settleReads();
      backend.expectOne(`/api/units/${inputs['unit']}`).flush(unitOf(unitStatus));
      await settleReads();
    }
  }

  /**
   * Answers the kit type's parts list and tubs (one of them retired), read once the lesson or
   * the kit type chosen is shown.
   */
  async function flushKit(): Promise<void> {
    await answerWhenAsked(backend, `/api/kit-types/${KIT_ID}`, {
      kitType: {
        id: KIT_ID,
        name: 'Rover Builder Tub',
        description: '',
        version: 1,
        partCount: 0,
        pieceCount: 0,
        tubCount: 3,
        lessonCount: 0,
        parts: [],
      },
    });
    backend
      .expectOne((r) => r.url === '/api/tubs' && r.params.get('kitTypeId') === KIT_ID)
      .flush({
        tubs: [
          tub(TUB_IDS[0]!, 'Tub 1', 'ready'),
          tub(TUB_IDS[1]!, 'Tub 2', 'needs-sorting'),
          tub(RETIRED_TUB, 'Tub 9', 'retired'),
        ],
      });
  }

  async function input(label: string): Promise<MatInputHarness> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  async function select(label: string, option: string | RegExp): Promise<void> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    const control = (await field.getControl(MatSelectHarness))!;
    await control.open();
    await control.clickOptions({ text: option });
  }

  afterEach(() => backend.verify());

  it('creates a lesson with POST, booking the tubs that are not retired, and opens its editor', async () => {
    await start({ unit: 'unit-1' });
    await (await input('Lesson title')).setValue('Build the rover');
    await select('Class', /4K/);
    // The harness waits for the kit's reads the choice starts: answer them meanwhile.
    await Promise.all([select('Kit type', 'Rover Builder Tub'), flushKit()]);
    fixture.detectChanges();
    const boxes = await loader.getAllHarnesses(MatCheckboxHarness);
    expect(await Promise.all(boxes.map((b) => b.isChecked()))).toEqual([true, true, false]);
    await (await input('Date')).setValue('2026-07-28');
    await select('Period', /Period 3/);
    // Choosing a bell period fills the start and end from the bell times.
    expect(await (await input('Starts')).getValue()).toBe('11:10');
    expect(await (await input('Ends')).getValue()).toBe('12:00');

    await select('Relief teacher', /Robin Tally/);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create lesson' }))).click();
    const req = backend.expectOne('/api/units/unit-1/lessons');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual(
      jasmine.objectContaining({
        title: 'Build the rover',
        classId: CLASS_ID,
        kitTypeId: KIT_ID,
        tubIds: TUB_IDS,
        startsAt: '2026-07-28T11:10',
        endsAt: '2026-07-28T12:00',
        periodId: PERIOD_ID,
        groupSize: 3,
        reliefTeacherId: RELIEF_ID,
      }),
    );
    req.flush(lesson(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(TestBed.inject(Router).url).toBe('/lessons/lesson-1/edit');
  });

  it('checks the window as the schema does and sends nothing when it ends before it starts', async () => {
    await start({ unit: 'unit-1' });
    await (await input('Date')).setValue('2026-07-28');
    await (await input('Starts')).setValue('12:00');
    await (await input('Ends')).setValue('11:00');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create lesson' }))).click();
    backend.expectNone('/api/units/unit-1/lessons');
    const ends = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Ends' }));
    // The message of `lessonWindowProblem` in shared/schemas/lessons.ts.
    expect(await ends.getTextErrors()).toEqual(['The lesson must end after it starts.']);
    const title = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Lesson title' }),
    );
    expect(await title.getTextErrors()).toEqual(['Enter a title.']);
  });

  // WCAG 2.2 SC 1.3.1 Info and Relationships: headings go down one level at a time, so the open
  // activity editor's "Materials" (h4) sits under its activity (h3) under "Activities" (h2).
  it('keeps the heading levels in order with an activity open for editing', async () => {
    await start({ id: 'lesson-1' });
    const build: Activity = {
      id: 'a-1',
      lessonId: 'lesson-1',
      version: 1,
      position: 0,
      title: 'Build',
      kind: 'build',
      minutes: 20,
      materials: [],
      attachments: [],
    };
    backend.expectOne('/api/lessons/lesson-1').flush(lesson({ activities: [build] }));
    await flushKit();
    fixture.detectChanges();
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Edit Build"]' }))
    ).click();
    fixture.detectChanges();
    const levels = Array.from(
      (fixture.nativeElement as HTMLElement).querySelectorAll('h1, h2, h3, h4, h5, h6'),
    ).map((h) => Number(h.tagName[1]));
    expect(levels).toContain(4);
    levels.forEach((level, i) => {
      if (i > 0) expect(level - levels[i - 1]!).toBeLessThanOrEqual(1);
    });
  });

  it('sends only the changed fields with the version, and on a 409 offers Reload or Re-apply', async () => {
    await start({ id: 'lesson-1' });
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    fixture.detectChanges();
    await (await input('Lesson title')).setValue('Build and test the rover');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeTrue();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
    const first = backend.expectOne('/api/lessons/lesson-1');
    expect(first.request.method).toBe('PATCH');
    expect(first.request.body).toEqual({ version: 3, title: 'Build and test the rover' });
    const current = lesson({ version: 4, groupSize: 4 });
    first.flush(
      { error: { ...errorBody('stale-version', 'Someone else changed it.').error, current } },
      { status: 409, statusText: 'Conflict' },
    );
    fixture.detectChanges();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('group size');
    expect(alert?.textContent).toContain('not saved');
    // Nothing was overwritten: the form still holds my title until I choose.
    expect(await (await input('Lesson title')).getValue()).toBe('Build and test the rover');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-apply my change' }))).click();
    const second = backend.expectOne('/api/lessons/lesson-1');
    expect(second.request.body).toEqual({ version: 4, title: 'Build and test the rover' });
    second.flush(lesson({ version: 5, groupSize: 4, title: 'Build and test the rover' }));
    await flushKit();
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();
  });

  it('switches kit type in one save after listing the parts the new kit lacks (map one, leave one out)', async () => {
    await start({ id: 'lesson-1' });
    const material = (
      partCode: string,
      partName: string,
      qty: number,
      per: 'group' | 'student',
    ) => ({
      id: `m-${partCode}`,
      partCode,
      partName,
      consumable: null,
      qty,
      per,
      returnable: true,
    });
    const build: Activity = {
      id: 'a-1',
      lessonId: 'lesson-1',
      version: 1,
      position: 0,
      title: 'Build',
      kind: 'build',
      minutes: 20,
      materials: [material('RB-010', 'Motor', 2, 'group'), material('RB-020', 'Pin', 4, 'student')],
      attachments: [],
    };
    backend.expectOne('/api/lessons/lesson-1').flush(lesson({ activities: [build] }));
    await flushKit();
    fixture.detectChanges();
    const gateKit = {
      id: GATE_KIT_ID,
      name: 'Gate Builder Tub',
      description: '',
      version: 1,
      partCount: 1,
      pieceCount: 4,
      tubCount: 1,
      lessonCount: 0,
      parts: [
        {
          id: 'g1',
          code: 'GT-001',
          name: 'Gate motor',
          colour: null,
          category: 'motor',
          qty: 4,
          compartment: null,
          small: false,
          chargeMinutes: null,
          hasPhoto: false,
        },
      ],
    };
    const flushGateKit = async () => {
      await answerWhenAsked(backend, `/api/kit-types/${GATE_KIT_ID}`, { kitType: gateKit });
      backend
        .expectOne((r) => r.url === '/api/tubs' && r.params.get('kitTypeId') === GATE_KIT_ID)
        .flush({ tubs: [] });
    };
    await Promise.all([select('Kit type', 'Gate Builder Tub'), flushGateKit()]);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
    backend.expectOne(`/api/kit-types/${GATE_KIT_ID}`).flush({ kitType: gateKit });
    fixture.detectChanges();
    await fixture.whenStable();
    const dialog = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const text = document.querySelector('mat-dialog-container')?.textContent ?? '';
    expect(text).toContain('RB-010 Motor');
    expect(text).toContain('Used in Build (2 per group)');
    expect(text).toContain('RB-020 Pin');
    const field = await dialog.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Instead of RB-010' }),
    );
    const choice = (await field.getControl(MatSelectHarness))!;
    await choice.open();
    await choice.clickOptions({ text: 'GT-001 Gate motor' });
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Switch kit type' }))).click();
    const save = backend.expectOne('/api/lessons/lesson-1');
    expect(save.request.method).toBe('PATCH');
    expect(save.request.body).toEqual(
      jasmine.objectContaining({
        version: 3,
        kitTypeId: GATE_KIT_ID,
        partMap: { 'RB-010': 'GT-001' },
        dropMissingParts: true,
      }),
    );
    save.flush(lesson({ version: 4, kitType: { id: GATE_KIT_ID, name: 'Gate Builder Tub' } }));
    await flushGateKit();
  });

  it('shows the booking conflicts the save answered beside the lesson, with a link to the other', async () => {
    await start({ id: 'lesson-1' });
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    fixture.detectChanges();
    await (await input('Lesson title')).setValue('Build it twice');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
    const message =
      'Double-booked: Tub 2 is also booked for “Gears” (4B, Tue 28 Jul, 11:10 am–12:00 pm). ' +
      'Move one lesson or book other tubs.';
    backend.expectOne('/api/lessons/lesson-1').flush(
      lesson({
        version: 4,
        title: 'Build it twice',
        bookingConflicts: [
          {
            lessonId: 'other-1',
            title: 'Gears',
            className: '4B',
            startsAt: '2026-07-28T11:10',
            endsAt: '2026-07-28T12:00',
            tubs: ['Tub 2'],
            message,
          },
        ],
      }),
    );
    await flushKit();
    fixture.detectChanges();
    const box = (fixture.nativeElement as HTMLElement).querySelector('.booking-conflicts');
    expect(box?.getAttribute('role')).toBe('alert');
    expect(box?.textContent).toContain(message);
    expect(box?.querySelector('a')?.getAttribute('href')).toBe('/lessons/other-1');
  });

  it('Reload after a 409 shows the lesson as it is now', async () => {
    await start({ id: 'lesson-1' });
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    await (await input('Lesson title')).setValue('My title');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
    backend.expectOne('/api/lessons/lesson-1').flush(
      {
        error: {
          code: 'stale-version',
          message: 'Changed.',
          current: lesson({ version: 4, title: 'Their title' }),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    const reload = await loader.getHarness(MatButtonHarness.with({ text: 'Reload' }));
    await Promise.all([reload.click(), flushKit()]);
    expect(await (await input('Lesson title')).getValue()).toBe('Their title');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();
  });

  it('shows server details under their fields (startsAt under Starts)', async () => {
    await start({ id: 'lesson-1' });
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    await (await input('Starts')).setValue('11:20');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
    const req = backend.expectOne('/api/lessons/lesson-1');
    // Moving the start leaves the bell period, so the period is sent as cleared.
    expect(req.request.body).toEqual({ version: 3, startsAt: '2026-07-28T11:20', periodId: null });
    req.flush(
      errorBody('invalid-request', 'Check the details.', [
        { path: 'startsAt', message: 'That time falls outside the school day.' },
      ]),
      { status: 400, statusText: 'Bad Request' },
    );
    const starts = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Starts' }),
    );
    expect(await starts.getTextErrors()).toEqual(['That time falls outside the school day.']);
  });

  describe('in an endorsed unit', () => {
    const ENDORSED = { id: 'unit-1', title: 'Rescue Rovers', status: 'endorsed' as const };
    const root = () => TestbedHarnessEnvironment.documentRootLoader(fixture);
    const text = () => (fixture.nativeElement as HTMLElement).textContent ?? '';

    async function answer(button: string): Promise<void> {
      const dialog = await root().getHarness(MatDialogHarness);
      expect(await dialog.getTitleText()).toBe('Return the unit to draft?');
      expect(await dialog.getContentText()).toContain('“Rescue Rovers” is endorsed.');
      await (await dialog.getHarness(MatButtonHarness.with({ text: button }))).click();
      await fixture.whenStable();
    }

    it('warns, asks before saving the lesson, and sends nothing when not confirmed', async () => {
      await start({ id: 'lesson-1' });
      backend.expectOne('/api/lessons/lesson-1').flush(lesson({ unit: ENDORSED }));
      await flushKit();
      fixture.detectChanges();
      expect(text()).toContain('This unit is endorsed.');
      await (await input('Lesson title')).setValue('Build and test the rover');
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
      await answer('Don’t save');
      backend.expectNone('/api/lessons/lesson-1');
      expect(fixture.componentInstance.hasUnsavedChanges()).toBeTrue();

      await (await loader.getHarness(MatButtonHarness.with({ text: 'Save lesson' }))).click();
      await answer('Save and return to draft');
      const req = backend.expectOne('/api/lessons/lesson-1');
      expect(req.request.body).toEqual({ version: 3, title: 'Build and test the rover' });
      req.flush(
        lesson({
          version: 4,
          title: 'Build and test the rover',
          unit: { ...ENDORSED, status: 'draft' },
        }),
      );
      await flushKit();
      fixture.detectChanges();
      expect(text()).not.toContain('This unit is endorsed.');
    });

    it('asks before an activity is added; once saved the unit is a draft and nothing more is asked', async () => {
      await start({ id: 'lesson-1' });
      backend.expectOne('/api/lessons/lesson-1').flush(lesson({ unit: ENDORSED }));
      await flushKit();
      fixture.detectChanges();
      await (await loader.getHarness(MatButtonHarness.with({ text: /Add an activity/ }))).click();
      await (await input('Activity title')).setValue('Test drive');
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Add activity' }))).click();
      await answer('Save and return to draft');
      const req = backend.expectOne('/api/lessons/lesson-1/activities');
      expect(req.request.body).toEqual(
        jasmine.objectContaining({ title: 'Test drive', kind: 'build' }),
      );
      req.flush(
        {
          id: 'activity-1',
          lessonId: 'lesson-1',
          version: 1,
          position: 1,
          title: 'Test drive',
          kind: 'build',
          minutes: 10,
          materials: [],
          attachments: [],
        },
        { status: 201, statusText: 'Created' },
      );
      await fixture.whenStable();
      expect(text()).not.toContain('This unit is endorsed.');
      expect(await root().getAllHarnesses(MatDialogHarness)).toEqual([]);
    });

    it('asks before a new lesson is created in it', async () => {
      await start({ unit: 'unit-1' }, 'endorsed');
      fixture.detectChanges();
      expect(text()).toContain('This unit is endorsed.');
      await (await input('Lesson title')).setValue('Build the rover');
      await select('Class', /4K/);
      await Promise.all([select('Kit type', 'Rover Builder Tub'), flushKit()]);
      await (await input('Date')).setValue('2026-07-28');
      await select('Period', /Period 3/);
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Create lesson' }))).click();
      await answer('Don’t save');
      backend.expectNone('/api/units/unit-1/lessons');
    });
  });
});
