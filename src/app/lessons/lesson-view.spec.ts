import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { LiveAnnouncer } from '@angular/cdk/a11y';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { Title } from '@angular/platform-browser';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { PrepPlan } from '../../../shared/prep/index';
import {
  errorBody,
  settleReads,
  testProviders,
  whenStableAnswering,
} from '../testing/test-providers';
import { LessonView } from './lesson-view';
import { workedExampleLesson, workedExamplePlan, workedExamplePrep } from './worked-example';

/** An invented board: group 1 has everything back, group 2 misses one part. */
const BOARD = {
  groups: [
    { number: 1, lines: 3, linesOut: 3, linesBack: 3, missing: [] },
    { number: 2, lines: 3, linesOut: 3, linesBack: 2, missing: [{ partCode: 'PIN', count: 1 }] },
  ],
};

describe('LessonView', () => {
  let fixture: ComponentFixture<LessonView>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;
  let plan: PrepPlan;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LessonView);
    fixture.componentRef.setInput('id', 'lesson-2');
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    plan = workedExamplePlan();
    fixture.detectChanges();
    backend.expectOne('/api/lessons/lesson-2').flush(workedExampleLesson());
    // The prep answer names each part with its colour and compartment: no kit type is fetched.
    backend.expectOne('/api/lessons/lesson-2/prep').flush(workedExamplePrep(plan));
    // The lesson's comments (read with its unit's, none on it yet).
    await settleReads();
    backend.expectOne('/api/units/unit-rovers/comments').flush({ comments: [] });
    // An author sees the lesson's share links (a resource read, started once the lesson shows).
    await settleReads();
    backend.expectOne('/api/lessons/lesson-2/share-links').flush({
      links: [
        {
          id: 'link-1',
          expiresAt: '2099-08-04T14:30:00.000Z',
          email: 'cover@relief.example',
          revokedAt: null,
        },
      ],
    });
    await fixture.whenStable();
    // The pack-away board of a lesson on another day reads the trays once (no live stream).
    backend.expectOne('/api/lessons/lesson-2/trays').flush(BOARD);
    await fixture.whenStable();
  });

  it('lists the lesson’s share links and withdraws one', async () => {
    expect(text()).toContain('cover@relief.example');
    const withdraw = await loader.getHarness(MatButtonHarness.with({ text: 'Withdraw' }));
    await withdraw.click();
    const req = backend.expectOne('/api/share-links/link-1');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await settleReads();
    backend.expectOne('/api/lessons/lesson-2/share-links').flush({ links: [] });
    await fixture.whenStable();
    expect(text()).not.toContain('cover@relief.example');
  });

  it('shows the pack-away board: each group’s lines out and back, missing parts, groups done', () => {
    expect(text()).toContain('1 of 2 groups packed away.');
    const done = (fixture.nativeElement as HTMLElement).querySelectorAll('app-tray-board .done h3');
    expect([...done].map((h) => h.textContent!.replace(/\s+/g, ' ').trim())).toEqual([
      'Group 1 check_circle Done',
    ]);
    expect(text()).toContain('2 of 3 lines back');
    expect(text()).toContain('Pack-away starts at');
  });

  it('gives a lesson on another day its pack-away time without a count (none "2888:42:38 ago")', () => {
    const board = (fixture.nativeElement as HTMLElement).querySelector('app-tray-board')!;
    const line = board.textContent!.replace(/\s+/g, ' ');
    expect(line).toMatch(/Pack-away starts at \d{1,2}:\d{2}\s?[ap]m\./i);
    expect(line).not.toContain(' ago');
    expect(line).not.toMatch(/in \d+:\d{2}/);
  });

  afterEach(() => backend.verify());

  function text(): string {
    return (fixture.nativeElement as HTMLElement).textContent!.replace(/\s+/g, ' ');
  }

  async function pullListOf(group: number) {
    return loader.getHarness(MatTableHarness.with({ ancestor: `#group-${group}` }));
  }

  it('recomputes when the page comes back into view and shows what changed elsewhere', async () => {
    // Someone recorded the missing motor of Tub 2 as found: group 2 is no longer short.
    const changed: PrepPlan = { ...plan, shortfalls: plan.shortfalls.filter((s) => s.group !== 2) };
    expect(text()).toMatch(/Group 2 is short/);
    window.dispatchEvent(new Event('focus'));
    await settleReads();
    backend.expectOne('/api/lessons/lesson-2/prep').flush(workedExamplePrep(changed));
    await fixture.whenStable();
    expect(text()).not.toMatch(/Group 2 is short/);
  });

  // WCAG 2.2 SC 2.4.2 Page Titled: the title names the lesson, not only the kind of page.
  it('names the lesson in the document title', () => {
    expect(TestBed.inject(Title).getTitle()).toBe('Drive train · Lesson · Trayplan');
  });

  it('shows the lesson header in the school’s wall-clock time', () => {
    expect(text()).toContain('Drive train');
    expect(text()).toContain('Rescue Rovers');
    expect(text()).toContain('4K (10 students)');
    // 2026-07-28 is a Tuesday (the demo's lessons are on Tuesdays, BRIEF.md / CLIENT-GUIDE.md).
    expect(text()).toContain('Tue 28 Jul 2026, 11:10 am–12:00 pm');
  });

  it('renders each group with its size and home tub, and never claims a controller a short group lacks (PREP-RULES.md worked example)', () => {
    const headings = Array.from(
      (fixture.nativeElement as HTMLElement).querySelectorAll('.group h3'),
    ).map((h) => h.textContent!.replace(/\s+/g, ' ').trim());
    // Worked example: 4 groups, sizes 3,3,2,2, homes Tub 1, Tub 2, Tub 3, Tub 1.
    expect(headings).toEqual([
      'Group 1 · 3 students · home tub Tub 1',
      'Group 2 · 3 students · home tub Tub 2',
      'Group 3 · 2 students · home tub Tub 3',
      // Group 4 is one controller short (worked example): no controller is claimed for it.
      'Group 4 · 2 students · home tub Tub 1 · controller none (short)',
    ]);
  });

  it('lists a group’s pull list rows with part names, colours, compartments and sources', async () => {
    const rows = await (await pullListOf(1)).getCellTextByColumnName();
    expect(rows['part'].text).toEqual(['Controller RB-001', 'Motor RB-010', 'Pin RB-020']);
    expect(rows['colour'].text).toEqual(['Grey', 'Black', 'Blue']);
    expect(rows['compartment'].text).toEqual(['A', 'B', 'C']);
    // Group 1: 3 students × 4 pins + 2 per group → max(12, 2) = 12 pins (R2, worked example).
    expect(rows['quantity'].text).toEqual(['1', '2', '12']);
    expect(rows['from'].text).toEqual(['Tub 1 × 1', 'Tub 1 × 2', 'Tub 1 × 12']);
  });

  it('flags a borrow with the tub it returns to and a short line', async () => {
    // Worked example: group 3 borrows 2 Pin from Tub 2; group 2 is 1 Motor short.
    const group3 = await (await pullListOf(3)).getCellTextByColumnName();
    expect(group3['from'].text[2]).toBe('Tub 3 × 6, Tub 2 × 2 Borrowed: return 2 to Tub 2');
    const group2 = await (await pullListOf(2)).getCellTextByColumnName();
    expect(group2['quantity'].text[1]).toBe('1 of 2');
  });

  it('lists the shortfalls and the prep tasks in time order with wall-clock times', () => {
    const shortfalls = (fixture.nativeElement as HTMLElement).querySelectorAll('.shortfalls li');
    // Worked example: group 2 Motor 1; group 4 Controller 1; group 4 Motor 2.
    expect(shortfalls.length).toBe(3);
    const tasks = Array.from(
      (fixture.nativeElement as HTMLElement).querySelectorAll('.tasks li'),
    ).map((li) => li.textContent!.replace(/\s+/g, ' ').trim());
    // Worked example: charge start by 07:55 (180 min), pull 10 min by 11:00, devices 4 min by 11:06.
    expect(tasks[0]).toContain('Charge 3 × Controller');
    expect(tasks[0]).toContain('180 min · start by 7:55 am · done by 10:55 am');
    expect(tasks[1]).toContain('10 min · start by 11:00 am · done by 11:10 am');
    expect(tasks[2]).toContain('4 min · start by 11:06 am · done by 11:10 am');
  });

  it('ticks a prep task on the server, for every teacher of the lesson', async () => {
    const [first] = await loader.getAllHarnesses(MatCheckboxHarness);
    expect(await first.isChecked()).toBeFalse();
    const checked = first.check();
    await settleReads();
    const put = backend.expectOne('/api/lessons/lesson-2/prep/ticks');
    expect(put.request.method).toBe('PUT');
    expect(put.request.body).toEqual({ taskKey: 'charge:RB-001', done: true });
    put.flush({
      ticks: [
        { taskKey: 'charge:RB-001', at: '2026-07-28T07:50:00+09:30', by: { id: 'u', name: 'Kim' } },
      ],
    });
    await checked;
    await fixture.whenStable();
    expect(await first.isChecked()).toBeTrue();
    expect(text()).toContain('Done by Kim');
  });

  it('applies the suggested group count as a group size and recomputes the plan', async () => {
    // Worked example: 2 groups (5, 5) has no shortfall; 10 students → the smallest g with
    // ceil(10 / g) = 2 is 5.
    const button = await loader.getHarness(MatButtonHarness.with({ text: 'Use 2 groups' }));
    await button.click();
    const patch = backend.expectOne('/api/lessons/lesson-2');
    expect(patch.request.method).toBe('PATCH');
    expect(patch.request.body).toEqual({ version: 3, groupSize: 5 });
    patch.flush(workedExampleLesson({ version: 4, groupSize: 5 }));
    await settleReads();
    const recomputed = workedExamplePlan({
      lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 5 },
    });
    backend.expectOne('/api/lessons/lesson-2/prep').flush(workedExamplePrep(recomputed));
    await fixture.whenStable();
    expect(recomputed.shortfalls).toEqual([]);
    expect(text()).toContain('Every group and the class tray get all their parts.');
    expect((fixture.nativeElement as HTMLElement).querySelectorAll('.group').length).toBe(2);
  });

  it('on a stale version says the lesson changed and offers Reload and Re-apply', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Use 2 groups' }))).click();
    backend.expectOne('/api/lessons/lesson-2').flush(
      {
        error: {
          code: 'stale-version',
          message: 'Changed.',
          current: workedExampleLesson({ version: 5, groupSize: 4 }),
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    expect(text()).toContain('Someone else changed this lesson');
    expect(text()).toContain('its group size is now 4');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-apply my change' }))).click();
    const again = backend.expectOne('/api/lessons/lesson-2');
    expect(again.request.body).toEqual({ version: 5, groupSize: 5 });
    again.flush(workedExampleLesson({ version: 6, groupSize: 5 }));
    await settleReads();
    backend.expectOne('/api/lessons/lesson-2/prep').flush(workedExamplePrep(plan));
    await fixture.whenStable();
    expect(text()).not.toContain('Someone else changed this lesson');
  });

  it('shows a print error from the interceptor and stops the progress bar', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Lesson pack/ }))).click();
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveSize(1);
    backend
      .expectOne('/api/lessons/lesson-2/pack.pdf')
      .flush(new Blob([JSON.stringify(errorBody('not-found', 'Not there.'))]), {
        status: 404,
        statusText: 'Not Found',
      });
    // The click may bring focus into the window, at a moment of the browser's choosing, which
    // reads the plan again (as in the tests below): answer that read whenever it comes.
    await whenStableAnswering(fixture, backend, '/api/lessons/lesson-2/prep', () =>
      workedExamplePrep(workedExamplePlan()),
    );
    expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveSize(0);
    // A blob request's error body is not read as JSON, so the status's own message is shown.
    const snack = await root.getHarness(MatSnackBarHarness);
    expect(await snack.getMessage()).toBe("That page or record doesn't exist (any more).");
  });

  // WCAG 2.2 SC 4.1.3 Status Messages (start and end said) and SC 2.4.3 Focus Order (the buttons
  // are disabled while a file is made; focus returns to the one pressed).
  for (const [file, label, name] of [
    ['pack.pdf', /Lesson pack/, 'the lesson pack'],
    ['labels.pdf', /Tray labels/, 'the tray labels'],
  ] as const) {
    it(`announces ${name} being made and ready, and gives focus back to its button`, async () => {
      const announce = spyOn(TestBed.inject(LiveAnnouncer), 'announce').and.resolveTo();
      spyOn(URL, 'createObjectURL').and.returnValue('blob:file');
      spyOn(HTMLAnchorElement.prototype, 'click');
      await loader.getHarness(MatButtonHarness.with({ text: label }));
      const el = fixture.nativeElement as HTMLElement;
      const button = el.querySelector<HTMLButtonElement>(`[data-printable="${file}"]`)!;
      button.focus();
      // Focus coming into a window without it fires its focus event, which reads the plan again.
      await settleReads();
      for (const read of backend.match('/api/lessons/lesson-2/prep'))
        read.flush(workedExamplePrep(plan));
      button.click();
      fixture.detectChanges();
      expect(button.disabled).toBeTrue();
      expect(announce).toHaveBeenCalledWith(`Making ${name}…`);
      backend
        .expectOne(`/api/lessons/lesson-2/${file}`)
        .flush(new Blob(['%PDF-1.7'], { type: 'application/pdf' }));
      await fixture.whenStable();
      expect(announce).toHaveBeenCalledWith(
        `${name.charAt(0).toUpperCase()}${name.slice(1)} is ready: it is downloading.`,
      );
      expect(document.activeElement).toBe(button);
    });
  }

  it('shows the safety cautions, deferring to the school', () => {
    expect(text()).toContain('choking hazard');
    expect(text()).toContain('swollen or hot battery');
    expect(text()).toContain('walkways');
    expect(text()).toContain("Your school's own policies and local regulations come first");
  });
});
