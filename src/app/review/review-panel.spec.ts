import { HttpTestingController } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { UnitComment } from '../../../shared/schemas/review';
import type { Unit } from '../../../shared/schemas/units';
import { errorBody, settleReads, testProviders } from '../testing/test-providers';
import { ReviewPanel } from './review-panel';

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
  version: 5,
  updatedAt: '2026-07-20T09:00:00+09:30',
  canEdit: true,
  overview: '',
  copiedFromId: null,
  basedOn: null,
  createdAt: '2026-07-01T09:00:00+09:30',
  coauthors: [],
  outcomes: [],
  lessons: [
    {
      id: 'l-1',
      title: 'Meet the rover',
      date: '2026-07-21',
      startsAt: '2026-07-21T11:10',
      endsAt: '2026-07-21T12:00',
      classId: 'c',
      className: '4K',
    },
  ],
  isOwner: true,
};

const COMMENTS: UnitComment[] = [
  {
    id: 'c-1',
    body: 'Check **pack-away**.<script>window.commentRan = true</script><img src="x" onerror="window.commentRan = true">',
    author: { id: 'user-lead', name: 'Sam Lead' },
    at: '2026-07-22T10:00:00+09:30',
    lessonId: null,
    step: 'request-changes',
  },
  {
    id: 'c-2',
    body: 'Lesson one needs spare motors.',
    author: { id: 'user-lead', name: 'Sam Lead' },
    at: '2026-07-22T10:05:00+09:30',
    lessonId: 'l-1',
    step: null,
  },
];

async function render(actions: string[]) {
  TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(ReviewPanel);
  fixture.componentRef.setInput('unit', UNIT);
  fixture.componentRef.setInput('actions', actions);
  const changed: Unit[] = [];
  fixture.componentInstance.changed.subscribe((u) => changed.push(u));
  fixture.detectChanges();
  backend.expectOne('/api/units/u-1/comments').flush({ comments: COMMENTS });
  await fixture.whenStable();
  // ngx-markdown renders asynchronously.
  await new Promise((resolve) => setTimeout(resolve, 50));
  fixture.detectChanges();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  return { fixture, backend, loader, changed, el: fixture.nativeElement as HTMLElement };
}

describe('ReviewPanel', () => {
  it('shows comments in order as sanitised Markdown that runs no script', async () => {
    const { el } = await render([]);
    const bodies = el.querySelectorAll('.comments .body');
    expect(bodies.length).toBe(2);
    expect(bodies[0]!.querySelector('strong')?.textContent).toBe('pack-away');
    expect(el.querySelector('.comments script')).toBeNull();
    expect(el.querySelector('.comments img[onerror]')).toBeNull();
    expect((window as unknown as { commentRan?: boolean }).commentRan).toBeUndefined();
    expect(el.textContent).toContain('requested changes');
    expect(el.textContent).toContain('on Meet the rover');
  });

  it('sends for review with the version read and an optional message', async () => {
    const { loader, backend, changed, fixture } = await render(['submit']);
    await (await loader.getHarness(MatInputHarness)).setValue('Ready for a look.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send for review' }))).click();
    const req = backend.expectOne('/api/units/u-1/review');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      action: 'submit',
      version: 5,
      comment: 'Ready for a look.',
    });
    req.flush({ ...UNIT, status: 'in-review', version: 6 });
    // The step's message is kept among the comments: they are read again and it shows.
    const step: UnitComment = {
      id: 'c-3',
      body: 'Ready for a look.',
      author: { id: 'user-teacher', name: 'Jordan Pell' },
      at: '2026-07-23T09:00:00+09:30',
      lessonId: null,
      step: 'submit',
    };
    await settleReads();
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [...COMMENTS, step] });
    await fixture.whenStable();
    expect(changed.map((u) => u.status)).toEqual(['in-review']);
    await new Promise((resolve) => setTimeout(resolve, 50));
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelectorAll('.comments .body').length).toBe(3);
    expect(el.textContent).toContain('Ready for a look.');
  });

  it('asks what should change before requesting changes, and sends nothing without it', async () => {
    const { loader, backend, el, fixture } = await render(['request-changes', 'endorse']);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Request changes' }))).click();
    fixture.detectChanges();
    backend.expectNone('/api/units/u-1/review');
    expect(el.textContent).toContain('Say what should change');
    // What the buttons do with the box's text is said beside them.
    expect(el.textContent).toContain('Request changes needs a comment saying what to change');
  });

  it('shows a 409 and takes the unit as it now is', async () => {
    const { loader, backend, changed, el, fixture } = await render(['endorse']);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Endorse' }))).click();
    backend.expectOne('/api/units/u-1/review').flush(
      {
        ...errorBody('invalid-transition', 'A unit that is “draft” cannot be endorsed.'),
        error: {
          code: 'invalid-transition',
          message: 'A unit that is “draft” cannot be endorsed.',
          current: { ...UNIT, version: 7 },
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    // Whoever moved the unit on may have commented: the comments are read again.
    await settleReads();
    backend.expectOne('/api/units/u-1/comments').flush({ comments: COMMENTS });
    await fixture.whenStable();
    fixture.detectChanges();
    expect(el.textContent).toContain('cannot be endorsed');
    expect(changed.map((u) => u.version)).toEqual([7]);
  });
});
