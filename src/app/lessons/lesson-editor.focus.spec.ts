import { LiveAnnouncer } from '@angular/cdk/a11y';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { Activity, Lesson } from '../../../shared/schemas/lessons';
import { Blank, settleReads, testProviders } from '../testing/test-providers';
import { LessonEditor } from './lesson-editor';

/*
 * Where focus lands after each action of the lesson editor. WCAG 2.2 SC 2.4.3 Focus Order: a
 * button that is disabled while busy or removed by `@if` must not drop focus to the page; it goes
 * into what was added or opened, back to what opened a closed thing, or to the result.
 * SC 4.1.3 Status Messages: a keyboard move says the new position.
 */

const CLASS_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e01';
const KIT_ID = '0b0e8a52-4d4f-4c43-9d0a-1a2b3c4d5e02';

function activity(id: string, title: string, position: number): Activity {
  return {
    id,
    lessonId: 'lesson-1',
    version: 1,
    position,
    title,
    kind: 'build',
    minutes: 10,
    materials: [],
    attachments: [],
  };
}

const ACTIVITIES = [
  activity('activity-1', 'Sort the tray', 1),
  activity('activity-2', 'Build the chassis', 2),
  activity('activity-3', 'Test drive', 3),
];

function lesson(overrides: Partial<Lesson> = {}): Lesson {
  return {
    id: 'lesson-1',
    version: 3,
    position: 1,
    title: 'Build the rover',
    unit: { id: 'unit-1', title: 'Rescue Rovers', status: 'draft' },
    class: { id: CLASS_ID, name: '4K', yearLevel: 4, studentCount: 26, devices: 8 },
    kitType: { id: KIT_ID, name: 'Rover Builder Tub' },
    tubIds: [],
    tubs: [],
    startsAt: '2026-07-28T11:10',
    endsAt: '2026-07-28T12:00',
    periodId: null,
    room: '',
    groupSize: 3,
    learningIntention: '',
    successCriteria: '',
    reliefNotes: '',
    reliefTeacherId: null,
    canEdit: true,
    activities: ACTIVITIES,
    updatedAt: '2026-07-01T09:00:00+09:30',
    bookingConflicts: [],
    ...overrides,
  };
}

describe('LessonEditor focus and announcements', () => {
  let fixture: ComponentFixture<LessonEditor>;
  let backend: HttpTestingController;
  let announced: string[];
  const el = () => fixture.nativeElement as HTMLElement;
  const active = () => document.activeElement as HTMLElement | null;

  async function settle(): Promise<void> {
    fixture.detectChanges();
    await fixture.whenStable();
  }

  /** Focuses a button as the keyboard would, then presses it. */
  async function press(selector: string): Promise<void> {
    const button = el().querySelector<HTMLButtonElement>(selector);
    if (!button) throw new Error(`No ${selector}`);
    button.focus();
    expect(active()).toBe(button);
    button.click();
    await settle();
  }

  /**
   * The kit's parts and tubs are read for the lesson's kit type once the lesson is shown (its
   * answer taken first); their content plays no part.
   */
  async function flushKit(): Promise<void> {
    await settleReads();
    backend
      .match((r) => r.url.startsWith('/api/kit-types/') || r.url === '/api/tubs')
      .forEach((r) =>
        r.flush(
          r.request.url === '/api/tubs'
            ? { tubs: [] }
            : {
                kitType: {
                  id: KIT_ID,
                  name: 'Rover Builder Tub',
                  description: '',
                  version: 1,
                  partCount: 0,
                  pieceCount: 0,
                  tubCount: 0,
                  lessonCount: 0,
                  parts: [],
                },
              },
        ),
      );
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        testProviders([{ path: 'lessons/:id/edit', component: Blank }]),
        provideMarkdown(),
      ],
    });
    announced = [];
    spyOn(TestBed.inject(LiveAnnouncer), 'announce').and.callFake(async (message: string) => {
      announced.push(message);
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LessonEditor);
    fixture.componentRef.setInput('id', 'lesson-1');
    fixture.detectChanges();
    backend.expectOne('/api/classes').flush({ classes: [] });
    backend.expectOne('/api/kit-types').flush({ kitTypes: [] });
    backend.expectOne('/api/school').flush({
      school: {
        id: 'school-1',
        name: 'Kestrel Ridge Primary School',
        timezone: 'Australia/Adelaide',
        paperSize: 'A4',
        prep: {},
        terms: [],
        periods: [],
        nonTeachingDays: [],
        version: 1,
      },
    });
    backend.expectOne('/api/relief/teachers').flush({ teachers: [] });
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    await settle();
  });

  afterEach(async () => {
    await flushKit();
    backend.verify();
  });

  it('"Add an activity" focuses the new activity\'s title; adding it follows it into the list', async () => {
    await press('.add-activity');
    expect(active()?.matches('.new-activity input[formcontrolname="title"]')).toBeTrue();
    (active() as HTMLInputElement).value = 'Pack away';
    active()!.dispatchEvent(new Event('input'));
    await press('.save-activity');
    backend
      .expectOne('/api/lessons/lesson-1/activities')
      .flush(activity('activity-4', 'Pack away', 4), { status: 201, statusText: 'Created' });
    await settle();
    await settle();
    expect(active()?.matches('[data-activity="activity-4"] input[formcontrolname="title"]'))
      .withContext(active()?.outerHTML ?? 'nothing')
      .toBeTrue();
  });

  it('closing an added-but-empty editor returns focus to "Add an activity"', async () => {
    await press('.add-activity');
    const close = [...el().querySelectorAll<HTMLButtonElement>('.new-activity button')].find(
      (b) => b.textContent?.trim() === 'Close',
    )!;
    close.focus();
    close.click();
    await settle();
    expect(active()?.matches('.add-activity')).toBeTrue();
  });

  it('Save lesson keeps focus on Save lesson once the save ends', async () => {
    const title = el().querySelector<HTMLInputElement>('input[formcontrolname="title"]')!;
    title.value = 'Build and test the rover';
    title.dispatchEvent(new Event('input'));
    await press('.save-lesson');
    backend
      .expectOne('/api/lessons/lesson-1')
      .flush(lesson({ version: 4, title: 'Build and test the rover' }));
    await flushKit();
    await settle();
    expect(active()?.matches('.save-lesson')).toBeTrue();
  });

  it('a refused save focuses the first invalid field', async () => {
    const title = el().querySelector<HTMLInputElement>('input[formcontrolname="title"]')!;
    title.value = '';
    title.dispatchEvent(new Event('input'));
    await press('.save-lesson');
    expect(active()).toBe(title);
  });

  it("an activity's Edit focuses its title; Close returns focus to its Edit button", async () => {
    await press('[data-activity="activity-2"] .edit-activity');
    expect(
      active()?.matches('[data-activity="activity-2"] input[formcontrolname="title"]'),
    ).toBeTrue();
    const close = [
      ...el().querySelectorAll<HTMLButtonElement>('[data-activity="activity-2"] button'),
    ].find((b) => b.textContent?.trim() === 'Close')!;
    close.focus();
    close.click();
    // Not whenStable: the page waits for the lesson read that closing starts.
    fixture.detectChanges();
    await settleReads();
    expect(active()?.matches('[data-activity="activity-2"] .edit-activity')).toBeTrue();
    // Closing reads the lesson again; focus stays put when it arrives.
    backend.expectOne('/api/lessons/lesson-1').flush(lesson());
    await flushKit();
    await settle();
    expect(active()?.matches('[data-activity="activity-2"] .edit-activity')).toBeTrue();
  });

  it('deleting an activity in the confirmation dialog returns focus to "Add an activity"', async () => {
    await press('[data-activity="activity-2"] .edit-activity');
    await press('[data-activity="activity-2"] button.danger');
    const dialog =
      await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete activity' }))).click();
    await settle();
    const req = backend.expectOne((r) => r.url === '/api/activities/activity-2');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    fixture.detectChanges();
    await settleReads();
    backend
      .expectOne('/api/lessons/lesson-1')
      .flush(lesson({ activities: [ACTIVITIES[0]!, ACTIVITIES[2]!] }));
    await flushKit();
    await settle();
    // The dialog's own focus restoration (to the removed Delete button) must not win.
    await new Promise((resolve) => setTimeout(resolve, 300));
    await settle();
    expect(active()?.matches('.add-activity'))
      .withContext(active()?.outerHTML ?? '')
      .toBeTrue();
  });

  it('"Move up" onto the first place moves focus to the item\'s "Move down" and says the position', async () => {
    await press('[data-activity="activity-2"] .move-up');
    const req = backend.expectOne('/api/lessons/lesson-1/activity-order');
    expect(req.request.body.activityIds).toEqual(['activity-2', 'activity-1', 'activity-3']);
    expect(active()?.matches('[data-activity="activity-2"] .move-down')).toBeTrue();
    expect(announced).toContain('Moved to position 1 of 3.');
    req.flush(lesson({ version: 4, activities: [ACTIVITIES[1]!, ACTIVITIES[0]!, ACTIVITIES[2]!] }));
    await settle();
    expect(active()?.matches('[data-activity="activity-2"] .move-down')).toBeTrue();
  });

  it('"Move down" in the middle keeps focus on the same arrow and says the position', async () => {
    await press('[data-activity="activity-1"] .move-down');
    backend
      .expectOne('/api/lessons/lesson-1/activity-order')
      .flush(lesson({ version: 4, activities: [ACTIVITIES[1]!, ACTIVITIES[0]!, ACTIVITIES[2]!] }));
    await settle();
    expect(active()?.matches('[data-activity="activity-1"] .move-down')).toBeTrue();
    expect(announced).toContain('Moved to position 2 of 3.');
  });
});
