import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatNavListHarness } from '@angular/material/list/testing';
import type { DevMail as DevMailMessage } from '../../../shared/schemas/members';
import { answerWhenAsked, testProviders } from '../testing/test-providers';
import { DevMail } from './dev-mail';

const MESSAGES: DevMailMessage[] = [
  {
    id: 'mail-1',
    to: ['new.relief@kestrel-ridge.example'],
    from: 'trayplan@kestrel-ridge.example',
    subject: 'You are invited to Trayplan',
    text: 'Accept here: http://127.0.0.1:4200/invitation/abc123.\nThe link works for 7 days.',
    receivedAt: '2026-07-28T10:00:00+09:30',
    links: ['http://127.0.0.1:4200/invitation/abc123'],
  },
  {
    id: 'mail-2',
    to: ['teacher@kestrel-ridge.example'],
    from: 'trayplan@kestrel-ridge.example',
    subject: 'Reset your Trayplan password',
    text: 'Set a new password: http://127.0.0.1:4200/reset/xyz789',
    receivedAt: '2026-07-28T11:00:00+09:30',
    links: ['http://127.0.0.1:4200/reset/xyz789'],
  },
];

describe('DevMail', () => {
  let fixture: ComponentFixture<DevMail>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DevMail);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/dev/mail').flush({ messages: MESSAGES });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  function links(): string[] {
    const body = (fixture.nativeElement as HTMLElement).querySelector('.body');
    return [...(body?.querySelectorAll('a') ?? [])].map((a) => a.getAttribute('href') ?? '');
  }

  it('lists the newest message first and shows it with clickable links', async () => {
    const list = await loader.getHarness(MatNavListHarness);
    const titles = await Promise.all((await list.getItems()).map((item) => item.getTitle()));
    expect(titles).toEqual(['Reset your Trayplan password', 'You are invited to Trayplan']);
    expect(links()).toEqual(['http://127.0.0.1:4200/reset/xyz789']);
  });

  it('shows the text of the message picked', async () => {
    const list = await loader.getHarness(MatNavListHarness);
    const [, invitation] = await list.getItems();
    await (await invitation.host()).click();
    await fixture.whenStable();
    expect(links()).toEqual(['http://127.0.0.1:4200/invitation/abc123']);
    const body = (fixture.nativeElement as HTMLElement).querySelector('.body');
    expect(body?.textContent).toContain('The link works for 7 days.');
  });

  it('Refresh reads the outbox again and lists what came in since', async () => {
    const later: DevMailMessage = {
      id: 'mail-3',
      to: ['lead@kestrel-ridge.example'],
      from: 'trayplan@kestrel-ridge.example',
      subject: 'Rescue Rovers is waiting for review',
      text: 'Open it: http://127.0.0.1:4200/review/units/u-1',
      receivedAt: '2026-07-28T12:00:00+09:30',
      links: ['http://127.0.0.1:4200/review/units/u-1'],
    };
    const refresh = await loader.getHarness(MatButtonHarness.with({ text: /Refresh/ }));
    // The harness waits for the read the click starts: answer it meanwhile.
    await Promise.all([
      refresh.click(),
      answerWhenAsked(backend, '/api/dev/mail', { messages: [...MESSAGES, later] }),
    ]);
    const list = await loader.getHarness(MatNavListHarness);
    const titles = await Promise.all((await list.getItems()).map((item) => item.getTitle()));
    expect(titles).toEqual([
      'Rescue Rovers is waiting for review',
      'Reset your Trayplan password',
      'You are invited to Trayplan',
    ]);
  });
});
