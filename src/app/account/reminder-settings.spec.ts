import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSlideToggleHarness } from '@angular/material/slide-toggle/testing';
import type { ReminderPreferences } from '../../../shared/schemas/reminders';
import { errorBody, settleReads, testProviders } from '../testing/test-providers';
import { REMINDERS_CHANGED, ReminderSettings } from './reminder-settings';

const URL = '/api/account/reminders';
const NEVER_SAVED: ReminderPreferences = {
  chargeReminders: false,
  leadMinutes: 30,
  morningSummary: false,
  summaryTime: '07:00',
  version: 0,
};

describe('ReminderSettings', () => {
  let fixture: ComponentFixture<ReminderSettings>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReminderSettings);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await settleReads();
    backend.expectOne(URL).flush({ reminders: NEVER_SAVED });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const toggle = (label: string | RegExp) =>
    loader.getHarness(MatSlideToggleHarness.with({ label }));
  const save = async () =>
    (await loader.getHarness(MatButtonHarness.with({ text: 'Save reminders' }))).click();
  const text = () => (fixture.nativeElement as HTMLElement).textContent!.replace(/\s+/g, ' ');

  it('starts with both off and says charging defers to the school’s policies', async () => {
    expect(await (await toggle(/start charging/)).isChecked()).toBeFalse();
    expect(await (await toggle(/morning summary/)).isChecked()).toBeFalse();
    expect(text()).toContain('own policies and local regulations come first');
  });

  it('saves the choices with the version read', async () => {
    await (await toggle(/start charging/)).check();
    const lead = await loader.getHarness(MatSelectHarness);
    await lead.open();
    await lead.clickOptions({ text: '1 h' });
    await save();
    const req = backend.expectOne(URL);
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({
      version: 0,
      chargeReminders: true,
      leadMinutes: 60,
      morningSummary: false,
      summaryTime: '07:00',
    });
    req.flush({
      reminders: { ...NEVER_SAVED, chargeReminders: true, leadMinutes: 60, version: 1 },
    });
    await fixture.whenStable();
    expect(await lead.getValueText()).toBe('1 h');
    // The next save names the new version.
    await (await toggle(/morning summary/)).check();
    await save();
    const next = backend.expectOne(URL);
    expect(next.request.body.version).toBe(1);
    next.flush({
      reminders: {
        ...NEVER_SAVED,
        chargeReminders: true,
        leadMinutes: 60,
        morningSummary: true,
        version: 2,
      },
    });
  });

  it('on a stale version (409) shows what was saved elsewhere and asks to choose again', async () => {
    await (await toggle(/morning summary/)).check();
    await save();
    const current = { ...NEVER_SAVED, chargeReminders: true, leadMinutes: 120, version: 3 };
    backend
      .expectOne(URL)
      .flush(
        { error: { ...errorBody('stale-version', 'Someone changed this.').error, current } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(text()).toContain(REMINDERS_CHANGED);
    expect(await (await toggle(/start charging/)).isChecked()).toBeTrue();
    expect(await (await toggle(/morning summary/)).isChecked()).toBeFalse();
    expect(await (await loader.getHarness(MatSelectHarness)).getValueText()).toBe('2 h');
  });
});
