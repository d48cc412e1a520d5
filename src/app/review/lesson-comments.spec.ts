import { HttpTestingController } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { Role } from '../../../shared/schemas/common';
import type { UnitComment } from '../../../shared/schemas/review';
import { Session } from '../auth/session';
import { demoUser, errorBody, settleReads, testProviders } from '../testing/test-providers';
import { LessonComments } from './lesson-comments';

/** Invented comments of the invented demo school, oldest first as the API answers. */
const COMMENTS: UnitComment[] = [
  {
    id: 'c-1',
    body: 'Whole unit: **good** pacing.',
    author: { id: 'user-lead', name: 'Sam Lead' },
    at: '2026-07-22T10:00:00+09:30',
    lessonId: null,
    step: null,
  },
  {
    id: 'c-2',
    body: 'Spare motors?<script>window.lessonCommentRan = true</script><img src="x" onerror="window.lessonCommentRan = true">',
    author: { id: 'user-lead', name: 'Sam Lead' },
    at: '2026-07-22T10:05:00+09:30',
    lessonId: 'l-1',
    step: 'request-changes',
  },
  {
    id: 'c-3',
    body: 'Added two to the spares tray.',
    author: { id: 'user-teacher', name: 'Jordan Pell' },
    at: '2026-07-23T08:00:00+09:30',
    lessonId: 'l-1',
    step: null,
  },
  {
    id: 'c-4',
    body: 'Another lesson entirely.',
    author: { id: 'user-lead', name: 'Sam Lead' },
    at: '2026-07-23T09:00:00+09:30',
    lessonId: 'l-2',
    step: null,
  },
];

async function render(role: Role) {
  TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
  TestBed.inject(Session).update(demoUser(role));
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(LessonComments);
  fixture.componentRef.setInput('unitId', 'u-1');
  fixture.componentRef.setInput('lessonId', 'l-1');
  fixture.detectChanges();
  await settleReads();
  return {
    backend,
    fixture,
    loader: TestbedHarnessEnvironment.loader(fixture),
    el: fixture.nativeElement as HTMLElement,
  };
}

/** Lets ngx-markdown (which renders asynchronously) finish, then updates the view. */
async function rendered(fixture: { whenStable(): Promise<unknown>; detectChanges(): void }) {
  await settleReads();
  await fixture.whenStable();
  await new Promise((resolve) => setTimeout(resolve, 50));
  fixture.detectChanges();
}

describe('LessonComments', () => {
  it('shows this lesson’s comments only, oldest first, as Markdown that runs no script', async () => {
    const { backend, fixture, el } = await render('teacher');
    backend.expectOne('/api/units/u-1/comments').flush({ comments: COMMENTS });
    await rendered(fixture);
    const items = Array.from(el.querySelectorAll('.comments li'));
    expect(items.length).toBe(2);
    expect(items[0]!.textContent).toContain('Sam Lead requested changes');
    expect(items[0]!.textContent).toContain('Spare motors?');
    expect(items[1]!.textContent).toContain('Added two to the spares tray.');
    expect(el.querySelector('.comments script')).toBeNull();
    expect(el.querySelector('.comments img[onerror]')).toBeNull();
    expect((window as unknown as { lessonCommentRan?: boolean }).lessonCommentRan).toBeUndefined();
    expect(el.textContent).not.toContain('Whole unit');
    expect(el.textContent).not.toContain('Another lesson entirely');
    backend.verify();
  });

  it('adds a comment on this lesson and shows it last', async () => {
    const { backend, fixture, el, loader } = await render('lead');
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await rendered(fixture);
    expect(el.textContent).toContain('No comments on this lesson yet.');
    await (await loader.getHarness(MatInputHarness)).setValue('Check the **pack-away** time.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add comment' }))).click();
    const req = backend.expectOne('/api/units/u-1/comments');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ body: 'Check the **pack-away** time.', lessonId: 'l-1' });
    req.flush(
      {
        id: 'c-9',
        body: 'Check the **pack-away** time.',
        author: { id: 'user-lead', name: 'Sam Lead' },
        at: '2026-07-24T09:00:00+09:30',
        lessonId: 'l-1',
        step: null,
      },
      { status: 201, statusText: 'Created' },
    );
    await rendered(fixture);
    expect(el.querySelector('.comments li strong:last-child')).toBeTruthy();
    expect(el.querySelector('.comments .body strong')?.textContent).toBe('pack-away');
    expect(await (await loader.getHarness(MatInputHarness)).getValue()).toBe('');
    backend.verify();
  });

  it('sends nothing for an empty comment and says why; shows a refusal from the server', async () => {
    const { backend, fixture, el, loader } = await render('teacher');
    backend.expectOne('/api/units/u-1/comments').flush({ comments: [] });
    await rendered(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add comment' }))).click();
    backend.expectNone('/api/units/u-1/comments');
    // commentBodySchema's message (shared/schemas/review.ts).
    expect(el.textContent).toContain('Write a comment.');
    await (await loader.getHarness(MatInputHarness)).setValue('Fine.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add comment' }))).click();
    backend
      .expectOne('/api/units/u-1/comments')
      .flush(errorBody('not-found', 'That unit was not found.'), {
        status: 404,
        statusText: 'Not Found',
      });
    await rendered(fixture);
    expect(el.querySelector('[role="alert"]')?.textContent).toContain('That unit was not found.');
    backend.verify();
  });

  it('shows a relief teacher nothing and reads nothing (relief does not read units)', async () => {
    const { backend, el } = await render('relief');
    backend.expectNone('/api/units/u-1/comments');
    expect(el.textContent!.trim()).toBe('');
    backend.verify();
  });
});
