import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatNavListHarness } from '@angular/material/list/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { Router } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import type { Role } from '../../../shared/schemas/common';
import { Session } from '../auth/session';
import { Blank, demoUser, testProviders } from '../testing/test-providers';
import { Shell } from './shell';

describe('Shell', () => {
  let backend: HttpTestingController;

  async function render(
    role: Role,
  ): Promise<{ harness: RouterTestingHarness; loader: HarnessLoader }> {
    TestBed.configureTestingModule({
      providers: testProviders([
        { path: 'sign-in', component: Blank },
        { path: '', component: Shell, children: [{ path: '**', component: Blank }] },
      ]),
    });
    TestBed.inject(Session).update(demoUser(role, { name: 'Robin Ashdown' }));
    backend = TestBed.inject(HttpTestingController);
    const harness = await RouterTestingHarness.create('/');
    return { harness, loader: TestbedHarnessEnvironment.loader(harness.fixture) };
  }

  afterEach(() => backend.verify());

  async function navLabels(loader: HarnessLoader): Promise<string[]> {
    const list = await loader.getHarness(MatNavListHarness);
    return Promise.all((await list.getItems()).map((item) => item.getTitle()));
  }

  it('shows a header landmark with the product, the school and the user', async () => {
    const { harness } = await render('teacher');
    const header = (harness.fixture.nativeElement as HTMLElement).querySelector('header');
    expect(header?.textContent).toContain('Trayplan');
    expect(header?.textContent).toContain('Kestrel Ridge Primary School');
    expect(header?.textContent).toContain('Robin Ashdown');
  });

  it('has one navigation landmark, named Main (WCAG 2.2 SC 1.3.1, SC 2.4.1)', async () => {
    const { harness } = await render('teacher');
    const root = harness.fixture.nativeElement as HTMLElement;
    // A landmark is a <nav> element or anything with role="navigation" (WAI-ARIA 1.2).
    const landmarks = Array.from(root.querySelectorAll('nav, [role="navigation"]'));
    expect(landmarks.length).toBe(1);
    expect(landmarks[0].getAttribute('aria-label')).toBe('Main');
  });

  it("lists a teacher's areas in the navigation", async () => {
    const { loader } = await render('teacher');
    expect(await navLabels(loader)).toEqual(['Home', 'Units', 'Kits', 'Classes', 'Coverage']);
  });

  it('adds the mail outbox for an admin when the server has one', async () => {
    const { loader, harness } = await render('admin');
    backend.expectOne('/api/dev/mail').flush({ messages: [] });
    await harness.fixture.whenStable();
    expect(await navLabels(loader)).toEqual([
      'Home',
      'Review',
      'Kits',
      'Classes',
      'Outcomes',
      'Coverage',
      'School',
      'Members',
      'Mail outbox (development)',
    ]);
  });

  it('leaves the mail outbox out when it answers 404 (production)', async () => {
    const { loader, harness } = await render('admin');
    backend
      .expectOne('/api/dev/mail')
      .flush(
        { error: { code: 'not-found', message: 'Not found.' } },
        { status: 404, statusText: 'Not Found' },
      );
    await harness.fixture.whenStable();
    expect(await navLabels(loader)).not.toContain('Mail outbox (development)');
  });

  it('offers Account and Sign out in the user menu, and signs out', async () => {
    const { loader, harness } = await render('relief');
    const menu = await loader.getHarness(MatMenuHarness.with({ triggerText: /Robin Ashdown/ }));
    await menu.open();
    // The item text includes the icon's ligature name, so compare the ends.
    const texts = await Promise.all((await menu.getItems()).map((item) => item.getText()));
    expect(texts.length).toBe(2);
    expect(texts[0]).toMatch(/Account$/);
    expect(texts[1]).toMatch(/Sign out$/);
    await menu.clickItem({ text: /Sign out/ });
    backend.expectOne('/api/auth/sign-out').flush('', { status: 204, statusText: 'No Content' });
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    // Sign-out first forgets this browser's saved copies (caches and storage: a few tasks).
    const router = TestBed.inject(Router);
    for (let i = 0; i < 100 && router.url !== '/sign-in'; i++) {
      await new Promise((resolve) => setTimeout(resolve));
    }
    await harness.fixture.whenStable();
    expect(router.url).toBe('/sign-in');
    expect(TestBed.inject(Session).user()).toBeNull();
  });
});
