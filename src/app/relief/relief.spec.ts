import { HttpTestingController } from '@angular/common/http/testing';
import { LiveAnnouncer } from '@angular/cdk/a11y';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { provideMarkdown } from 'ngx-markdown';
import { testProviders } from '../testing/test-providers';
import { Relief } from './relief';

const LESSON = {
  id: 'lesson-4',
  title: 'Sense the wall',
  startsAt: '2026-08-04T11:10',
  endsAt: '2026-08-04T12:00',
  room: 'Room 12',
  unitId: 'unit-1',
  unitTitle: 'Rescue Rovers',
  className: '4K',
  reliefNotes: 'Groups sit by **tub number**.',
};

describe('Relief', () => {
  it('lists the assigned lessons with their time, notes and a print button', async () => {
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
    const fixture = TestBed.createComponent(Relief);
    // The list is a resource read: it goes out with the page's first check.
    fixture.detectChanges();
    const http = TestBed.inject(HttpTestingController);
    http.expectOne('/api/relief/lessons').flush({ lessons: [LESSON] });
    await fixture.whenStable();
    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    // 2026-08-04 is a Tuesday (ISO 8601 calendar).
    expect(text).toContain('Tue 4 Aug 2026, 11:10 am–12:00 pm');
    // The notes are Markdown, printed with their emphasis (CommonMark §6.2 strong emphasis).
    await new Promise((r) => setTimeout(r, 50));
    await fixture.whenStable();
    const strong = (fixture.nativeElement as HTMLElement).querySelector('.notes strong');
    expect(strong?.textContent).toBe('tub number');
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const print = await loader.getHarness(MatButtonHarness.with({ text: /Print lesson pack/ }));
    await print.click();
    const req = http.expectOne('/api/lessons/lesson-4/pack.pdf');
    expect(req.request.responseType).toBe('blob');
    http.verify();
  });

  // WCAG 2.2 SC 4.1.3 Status Messages (start and end said) and SC 2.4.3 Focus Order (Print was
  // disabled while the pack was made; focus returns to it).
  it('announces the pack being made and ready, and gives focus back to Print', async () => {
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
    const announce = spyOn(TestBed.inject(LiveAnnouncer), 'announce').and.resolveTo();
    spyOn(URL, 'createObjectURL').and.returnValue('blob:pack');
    spyOn(HTMLAnchorElement.prototype, 'click');
    const fixture = TestBed.createComponent(Relief);
    fixture.detectChanges();
    const http = TestBed.inject(HttpTestingController);
    http.expectOne('/api/relief/lessons').flush({ lessons: [LESSON] });
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const print = el.querySelector<HTMLButtonElement>('[data-print="lesson-4"]')!;
    print.focus();
    print.click();
    fixture.detectChanges();
    expect(print.disabled).toBeTrue();
    expect(announce).toHaveBeenCalledWith('Making the lesson pack for Sense the wall…');
    http
      .expectOne('/api/lessons/lesson-4/pack.pdf')
      .flush(new Blob(['%PDF-1.7'], { type: 'application/pdf' }));
    await fixture.whenStable();
    expect(announce).toHaveBeenCalledWith(
      'The lesson pack for Sense the wall is ready: it is downloading.',
    );
    expect(document.activeElement).toBe(el.querySelector('[data-print="lesson-4"]'));
    http.verify();
  });

  it('says so when nothing is assigned', async () => {
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
    const fixture = TestBed.createComponent(Relief);
    fixture.detectChanges();
    TestBed.inject(HttpTestingController).expectOne('/api/relief/lessons').flush({ lessons: [] });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No lessons are assigned');
  });
});
