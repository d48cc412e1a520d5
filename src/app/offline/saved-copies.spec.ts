import { HttpClient } from '@angular/common/http';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { testProviders } from '../testing/test-providers';
import { READ_TAG_HEADER, SavedCopies } from './saved-copies';
import { SavedCopyNotice } from './saved-copy-notice';

describe('SavedCopies and the read tag', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let copies: SavedCopies;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [testProviders()] });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    copies = TestBed.inject(SavedCopies);
  });
  afterEach(() => backend.verify());

  const shown = (url: string) => copies.savedAt(() => [url])();

  it('tags each API read with a fresh random tag, and an echo of it means a live answer', () => {
    http.get('/api/lessons/l1').subscribe();
    http.get('/api/lessons/l1').subscribe();
    const [first, second] = backend.match('/api/lessons/l1');
    const tag = first!.request.headers.get(READ_TAG_HEADER)!;
    // 128 bits as hex: a tag nobody can guess or replay from an old answer.
    expect(tag).toMatch(/^[0-9a-f]{32}$/);
    expect(second!.request.headers.get(READ_TAG_HEADER)).not.toBe(tag);
    first!.flush(
      {},
      { headers: { [READ_TAG_HEADER]: tag, Date: 'Tue, 04 Aug 2026 07:30:00 GMT' } },
    );
    expect(shown('/api/lessons/l1')).toBeNull();
    second!.flush({});
  });

  it("marks an answer carrying another read's tag as a copy saved at its Date", () => {
    http.get('/api/lessons/l2').subscribe();
    // RFC 9110 §5.6.7: the IMF-fixdate form of the Date header.
    backend
      .expectOne('/api/lessons/l2')
      .flush(
        {},
        { headers: { [READ_TAG_HEADER]: 'ab'.repeat(16), Date: 'Tue, 04 Aug 2026 07:30:00 GMT' } },
      );
    expect(shown('/api/lessons/l2')).toBe('2026-08-04T07:30:00.000Z');
    // The next live answer clears the mark.
    http.get('/api/lessons/l2').subscribe();
    const live = backend.expectOne('/api/lessons/l2');
    live.flush({}, { headers: { [READ_TAG_HEADER]: live.request.headers.get(READ_TAG_HEADER)! } });
    expect(shown('/api/lessons/l2')).toBeNull();
  });

  it('gives the oldest saved time of several reads, and leaves writes and other hosts alone', () => {
    copies.note('/api/lessons/a', '2026-08-04T09:00:00.000Z');
    copies.note('/api/lessons/a/prep', '2026-08-03T09:00:00.000Z');
    copies.note('/api/lessons/b', null);
    const both = copies.savedAt(() => ['/api/lessons/a', '/api/lessons/a/prep', '/api/lessons/b']);
    expect(both()).toBe('2026-08-03T09:00:00.000Z');
    http.post('/api/lessons/a/comments', {}).subscribe();
    expect(
      backend.expectOne('/api/lessons/a/comments').request.headers.has(READ_TAG_HEADER),
    ).toBeFalse();
    http.get('/assets/favicon.svg').subscribe();
    expect(
      backend.expectOne('/assets/favicon.svg').request.headers.has(READ_TAG_HEADER),
    ).toBeFalse();
  });
});

describe('SavedCopyNotice', () => {
  it('keeps a polite status region and says from when a saved copy is', async () => {
    const fixture = TestBed.createComponent(SavedCopyNotice);
    const host = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
    const region = host.querySelector('[role="status"]')!;
    expect(region).not.toBeNull();
    expect(region.textContent!.trim()).toBe('');
    fixture.componentRef.setInput('savedAt', '2026-08-04T07:30:00.000Z');
    await fixture.whenStable();
    expect(region.textContent).toContain(
      'You are offline. This is the copy saved in this browser on',
    );
    // The same region announces the words (WAI-ARIA 1.2: role status is a polite live region).
    expect(host.querySelector('[role="status"]')).toBe(region);
    fixture.componentRef.setInput('savedAt', '');
    await fixture.whenStable();
    expect(region.textContent).toContain('This is a copy saved in this browser.');
  });
});
