import { HttpTestingController } from '@angular/common/http/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { Unit } from '../../../shared/schemas/units';
import { Session } from '../auth/session';
import { demoUser, errorBody, settleReads, testProviders } from '../testing/test-providers';
import { UnitDetail } from './unit-detail';

/** An invented unit of the invented demo school. */
const UNIT: Unit = {
  id: 'u-1',
  title: 'Rescue Rovers',
  yearLevel: 4,
  learningArea: 'Digital Technologies',
  term: 3,
  status: 'draft',
  visibility: 'school',
  owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
  version: 2,
  updatedAt: '2026-07-20T09:00:00+09:30',
  canEdit: true,
  overview: '## Why rovers\n\nStudents **build** a rover.<script>window.hacked = true</script>',
  copiedFromId: null,
  createdAt: '2026-07-01T09:00:00+09:30',
  coauthors: [],
  outcomes: [
    {
      id: 'o1',
      code: 'DT4-02',
      description: 'Follow and describe steps.',
      frameworkId: 'f',
      strand: 'Processes',
      yearBand: '3–4',
    },
  ],
  lessons: [
    {
      id: 'l-1',
      title: 'Meet the rover',
      date: '2026-07-21',
      startsAt: '2026-07-21T11:10',
      endsAt: '2026-07-21T12:00',
      classId: 'c',
      className: '4K',
      termNote: null,
    },
    {
      id: 'l-2',
      title: 'Drive train',
      date: '2026-07-28',
      startsAt: '2026-07-28T11:10',
      endsAt: '2026-07-28T12:00',
      classId: 'c',
      className: '4K',
      termNote: "Dated outside the unit's term: Term 3 runs 20 July 2026 to 25 Sept 2026.",
    },
  ],
  isOwner: true,
  basedOn: null,
};

/** Its history, newest first (invented). */
const HISTORY = {
  events: [
    {
      at: '2026-07-20T01:30:00.000Z',
      actor: { id: 'user-teacher', name: 'Jordan Pell' },
      action: 'lesson-edited',
      summary: 'Drive train: group size 3 → 4',
    },
    {
      at: '2026-07-13T00:00:00.000Z',
      actor: { id: 'user-teacher', name: 'Jordan Pell' },
      action: 'created',
      summary: 'created the unit',
    },
  ],
};

describe('UnitDetail', () => {
  it('renders the overview as sanitised Markdown, the outcomes and the lessons in order', async () => {
    TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(UnitDetail);
    fixture.componentRef.setInput('id', 'u-1');
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(UNIT);
    await settleReads();
    backend.expectOne('/api/units/u-1/history').flush(HISTORY);
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    await new Promise((resolve) => setTimeout(resolve, 50));
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('.overview h2')?.textContent).toBe('Why rovers');
    expect(el.querySelector('.overview strong')?.textContent).toBe('build');
    expect(el.querySelector('.overview script')).toBeNull();
    expect((window as unknown as { hacked?: boolean }).hacked).toBeUndefined();
    expect(el.textContent).toContain('DT4-02');
    const links = Array.from(el.querySelectorAll('.lessons a')).map((a) => [
      a.textContent,
      a.getAttribute('href'),
    ]);
    expect(links).toEqual([
      ['Meet the rover', '/lessons/l-1'],
      ['Drive train', '/lessons/l-2'],
    ]);
    expect(el.textContent).toContain('Tue 28 Jul 2026, 11:10 am–12:00 pm');
    const notes = Array.from(el.querySelectorAll('.lessons .term-note')).map((n) =>
      n.textContent?.trim(),
    );
    expect(notes).toEqual([
      "event_busy Dated outside the unit's term: Term 3 runs 20 July 2026 to 25 Sept 2026.",
    ]);
    const history = Array.from(el.querySelectorAll('.history li')).map((li) =>
      li.textContent?.replace(/\s+/g, ' ').trim(),
    );
    expect(history.length).toBe(2);
    expect(history[0]).toContain('Jordan Pell');
    expect(history[0]).toContain('Drive train: group size 3 → 4');
    expect(el.querySelector('app-unit-provenance')).toBeNull();
    backend.verify();
  });

  it('on a copy, says where it came from, links the original and lists what changed there', async () => {
    TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(UnitDetail);
    fixture.componentRef.setInput('id', 'u-1');
    fixture.detectChanges();
    const basedOn = {
      unitId: 'u-original',
      title: 'Rescue Rovers',
      version: 3,
      ownerName: 'Sam Kowhai',
      copiedAt: '2026-07-15T06:15:00.000Z',
      readable: true,
    };
    backend.expectOne('/api/units/u-1').flush({ ...UNIT, basedOn });
    await settleReads();
    backend.expectOne('/api/units/u-1/history').flush({ events: [] });
    backend.expectOne('/api/units/u-1/upstream').flush({
      basedOn,
      sourceVersion: 5,
      changed: true,
      changes: [{ summary: 'added lesson Winch (2026-09-08 11:10–12:00)' }],
    });
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    const line = el.querySelector('app-unit-provenance')?.textContent?.replace(/\s+/g, ' ');
    expect(line).toContain('Based on version 3 of Rescue Rovers by Sam Kowhai, copied 15 Jul 2026');
    expect(el.querySelector('app-unit-provenance a')?.getAttribute('href')).toBe(
      '/units/u-original',
    );
    expect(el.textContent).toContain('The original changed since you copied it');
    expect(el.textContent).toContain('added lesson Winch (2026-09-08 11:10–12:00)');
    backend.verify();
  });

  it('offers its author "Send for review" beside the status and the comments', async () => {
    TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
    TestBed.inject(Session).update(demoUser('teacher', { id: 'user-teacher' }));
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(UnitDetail);
    fixture.componentRef.setInput('id', 'u-1');
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(UNIT);
    await settleReads();
    backend.expectOne('/api/units/u-1/history').flush({ events: [] });
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const send = await loader.getHarness(MatButtonHarness.with({ text: 'Send for review' }));
    await send.click();
    const req = backend.expectOne('/api/units/u-1/review');
    expect(req.request.body).toEqual({ action: 'submit', version: 2 });
    req.flush({ ...UNIT, status: 'in-review', version: 3 });
    await settleReads();
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('.status')?.textContent).toBe(
      'In review',
    );
    // In review, the author has no step left to take.
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Send for review' })),
    ).toEqual([]);
    backend.verify();
  });

  describe('printables', () => {
    let fixture: ComponentFixture<UnitDetail>;
    let loader: HarnessLoader;
    let backend: HttpTestingController;
    let saved: { name: string; blob: Blob | null }[];

    beforeEach(async () => {
      TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
      backend = TestBed.inject(HttpTestingController);
      fixture = TestBed.createComponent(UnitDetail);
      loader = TestbedHarnessEnvironment.loader(fixture);
      fixture.componentRef.setInput('id', 'u-1');
      fixture.detectChanges();
      backend.expectOne('/api/units/u-1').flush(UNIT);
      await settleReads();
      backend.expectOne('/api/units/u-1/history').flush(HISTORY);
      await settleReads();
      backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
      await fixture.whenStable();
      // saveBlob hands the file to the browser through a link's `download` name: watch that link.
      saved = [];
      let lastBlob: Blob | null = null;
      spyOn(URL, 'createObjectURL').and.callFake((blob: Blob | MediaSource) => {
        lastBlob = blob as Blob;
        return 'blob:unit-file';
      });
      spyOn(URL, 'revokeObjectURL');
      spyOn(HTMLAnchorElement.prototype, 'click').and.callFake(function (this: HTMLAnchorElement) {
        saved.push({ name: this.download, blob: lastBlob });
      });
    });

    afterEach(() => backend.verify());

    it('saves the unit pack under the name the server gave, with a progress bar meanwhile', async () => {
      await (await loader.getHarness(MatButtonHarness.with({ text: /Print unit pack/ }))).click();
      expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveSize(1);
      const pdf = new Blob(['%PDF-1.7'], { type: 'application/pdf' });
      backend.expectOne('/api/units/u-1/pack.pdf').flush(pdf, {
        headers: { 'Content-Disposition': 'attachment; filename="4K-rescue-rovers-unit-pack.pdf"' },
      });
      await fixture.whenStable();
      expect(saved.map((s) => s.name)).toEqual(['4K-rescue-rovers-unit-pack.pdf']);
      expect(await saved[0]!.blob!.text()).toBe('%PDF-1.7');
      expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveSize(0);
    });

    it('saves the prep calendar under the server’s UTF-8 name (RFC 8187 filename*)', async () => {
      await (
        await loader.getHarness(MatButtonHarness.with({ text: /Add prep to calendar/ }))
      ).click();
      backend.expectOne('/api/units/u-1/prep.ics').flush(new Blob(['BEGIN:VCALENDAR']), {
        headers: {
          'Content-Disposition':
            'attachment; filename="prep.ics"; filename*=UTF-8\'\'4K-rescue-rovers-prep%E2%80%931.ics',
        },
      });
      await fixture.whenStable();
      expect(saved.map((s) => s.name)).toEqual(['4K-rescue-rovers-prep–1.ics']);
    });

    it('shows a failed print in the snack-bar and stops the progress bar', async () => {
      await (await loader.getHarness(MatButtonHarness.with({ text: /Print unit pack/ }))).click();
      backend
        .expectOne('/api/units/u-1/pack.pdf')
        .flush(new Blob([JSON.stringify(errorBody('not-found', 'Not there.'))]), {
          status: 404,
          statusText: 'Not Found',
        });
      await fixture.whenStable();
      expect(await loader.getAllHarnesses(MatProgressBarHarness)).toHaveSize(0);
      const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
      expect(await (await root.getHarness(MatSnackBarHarness)).getMessage()).toBe(
        "That page or record doesn't exist (any more).",
      );
      expect(saved).toEqual([]);
    });

    it('offers authors Edit and Add lesson for this unit', () => {
      const el = fixture.nativeElement as HTMLElement;
      const hrefs = Array.from(el.querySelectorAll('.actions a')).map((a) =>
        a.getAttribute('href'),
      );
      expect(hrefs).toEqual(['/units/u-1/edit', '/lessons/new?unit=u-1']);
    });
  });
});
