import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideMarkdown } from 'ngx-markdown';
import { errorBody, testProviders } from '../testing/test-providers';
import { SharedPack } from './shared-pack';

const TOKEN = 'abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG';

/** An invented shared lesson (no plan: the engine's refusal is shown in words). */
const SHARED = {
  lesson: {
    title: 'Sense the wall',
    unitTitle: 'Rescue Rovers',
    number: 4,
    lessonCount: 8,
    schoolName: 'Kestrel Ridge Primary School',
    className: '4K',
    studentCount: 24,
    startsAt: '2026-08-04T11:10',
    endsAt: '2026-08-04T12:00',
    periodName: null,
    room: 'Room 12',
    kitTypeName: 'Rover kit',
    learningIntention: '',
    successCriteria: '',
    reliefNotes: 'Groups sit by tub number.',
    activities: [
      {
        id: 'act-1',
        title: 'Build the bumper',
        kind: 'build',
        minutes: 20,
        attachments: [
          { id: 'file-1', filename: 'bumper.pdf', size: 2048, contentType: 'application/pdf' },
        ],
      },
    ],
  },
  parts: [],
  plan: null,
  problems: ['A material names a part the kit no longer has.'],
  cautions: [{ title: 'Small parts', text: 'Count them back in.' }],
  expiresAt: '2026-08-05T00:00:00.000Z',
};

describe('SharedPack', () => {
  beforeEach(() => {
    localStorage.removeItem(`trayplan.saved.share.${TOKEN}`);
    TestBed.configureTestingModule({ providers: [...testProviders(), provideMarkdown()] });
  });

  function open() {
    const fixture = TestBed.createComponent(SharedPack);
    fixture.componentRef.setInput('token', TOKEN);
    fixture.detectChanges();
    return { fixture, http: TestBed.inject(HttpTestingController) };
  }

  it('shows the lesson, its pack link and its build instructions', async () => {
    const { fixture, http } = open();
    http.expectOne(`/api/share/${TOKEN}`).flush(SHARED);
    await fixture.whenStable();
    const page = fixture.nativeElement as HTMLElement;
    expect(page.querySelector('h1')?.textContent).toContain('Sense the wall');
    expect(page.textContent).toContain('Room 12');
    const links = [...page.querySelectorAll('a')].map((a) => a.getAttribute('href'));
    expect(links).toContain(`/api/share/${TOKEN}/pack.pdf`);
    expect(links).toContain(`/api/share/${TOKEN}/attachments/file-1`);
    expect(page.textContent).not.toContain('saved in this browser');
  });

  it('says in plain words that a withdrawn link no longer works (410)', async () => {
    const { fixture, http } = open();
    http
      .expectOne(`/api/share/${TOKEN}`)
      .flush(
        errorBody('link-revoked', 'This link has been withdrawn by the teacher who shared it.'),
        {
          status: 410,
          statusText: 'Gone',
        },
      );
    await fixture.whenStable();
    const page = fixture.nativeElement as HTMLElement;
    expect(page.querySelector('h1')?.textContent).toContain('no longer works');
    expect(page.textContent).toContain('withdrawn by the teacher');
  });

  it('shows the saved copy and its time when the server cannot be reached', async () => {
    const first = open();
    first.http.expectOne(`/api/share/${TOKEN}`).flush(SHARED);
    await first.fixture.whenStable();
    const { fixture, http } = open();
    http.expectOne(`/api/share/${TOKEN}`).error(new ProgressEvent('error'), { status: 0 });
    await fixture.whenStable();
    const page = fixture.nativeElement as HTMLElement;
    expect(page.querySelector('h1')?.textContent).toContain('Sense the wall');
    expect(page.querySelector('.saved')?.textContent).toContain('saved in this browser');
  });
});
