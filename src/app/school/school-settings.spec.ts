import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatAutocompleteHarness } from '@angular/material/autocomplete/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioButtonHarness } from '@angular/material/radio/testing';
import type { ActivatedRouteSnapshot, RouterStateSnapshot } from '@angular/router';
import { firstValueFrom, isObservable, type Observable } from 'rxjs';
import { DEFAULT_PREP, type SchoolSettings } from '../../../shared/schemas/school';
import { testProviders } from '../testing/test-providers';
import { SchoolSettingsPage } from './school-settings';
import { unsavedChangesGuard } from '../forms/unsaved-changes';

const TERM_ID = '0b6f8c8e-64b5-4e44-9d5e-7f6b1c2a3d41';
const PERIOD_ID = '5d0a4c3e-1f2b-4a6c-8e9d-0a1b2c3d4e5f';
const DAY_ID = '9e8d7c6b-5a49-4838-a271-6b5c4d3e2f10';

/** The invented demo school (its term 3 of 2026), as GET /api/school answers it. */
function demoSettings(overrides: Partial<SchoolSettings> = {}): SchoolSettings {
  return {
    id: 'a4d7e6f1-0000-4000-8000-000000000001',
    name: 'Kestrel Ridge Primary School',
    // An IANA tz database zone name (tzdata "australasia" file).
    timezone: 'Australia/Adelaide',
    paperSize: 'A4',
    prep: { ...DEFAULT_PREP },
    terms: [{ id: TERM_ID, name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' }],
    periods: [{ id: PERIOD_ID, name: 'Period 3', startsAt: '11:10', endsAt: '12:00' }],
    nonTeachingDays: [{ id: DAY_ID, date: '2026-08-14', reason: 'Staff planning day' }],
    version: 4,
    ...overrides,
  };
}

describe('SchoolSettingsPage', () => {
  let fixture: ComponentFixture<SchoolSettingsPage>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SchoolSettingsPage);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/school/timezones').flush({
      timezones: ['Australia/Adelaide', 'Australia/Darwin', 'Europe/London', 'UTC'],
    });
    backend.expectOne('/api/school').flush({ school: demoSettings() });
    fixture.detectChanges();
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function field(label: string, index = 0): Promise<MatFormFieldHarness> {
    const all = await loader.getAllHarnesses(
      MatFormFieldHarness.with({ floatingLabelText: label }),
    );
    if (!all[index]) throw new Error(`No field "${label}" #${index}`);
    return all[index];
  }
  async function type(label: string, value: string, index = 0): Promise<void> {
    const input = (await (await field(label, index)).getControl(MatInputHarness))!;
    await input.setValue(value);
    await input.blur();
  }
  async function errors(label: string, index = 0): Promise<string[]> {
    return (await field(label, index)).getTextErrors();
  }
  async function click(text: string | RegExp): Promise<void> {
    await (await loader.getHarness(MatButtonHarness.with({ text }))).click();
  }
  function text(): string {
    return (fixture.nativeElement as HTMLElement).textContent ?? '';
  }

  it('shows the saved settings with each allowance, its default and a hint', async () => {
    const name = (await (await field('School name')).getControl(MatInputHarness))!;
    expect(await name.getValue()).toBe('Kestrel Ridge Primary School');
    const spares = await field('Spares (percent)');
    expect(await (await spares.getControl(MatInputHarness))!.getValue()).toBe('10');
    // PREP-RULES.md "settings": spares percent defaults to 10, the charging buffer to 15 minutes.
    expect(await spares.getTextHints()).toEqual([jasmine.stringContaining('Default: 10 percent.')]);
    expect(await (await field('Charging buffer (minutes)')).getTextHints()).toEqual([
      jasmine.stringContaining('Default: 15 minutes.'),
    ]);
    expect(await loader.getAllHarnesses(MatFormFieldHarness.with({ floatingLabelText: /\(/ })))
      .withContext('ten prep allowances')
      .toHaveSize(10);
    expect(text()).toContain("your school's policies");
  });

  it('offers time zones matching what is typed', async () => {
    const zone = await loader.getHarness(MatAutocompleteHarness);
    await zone.clear();
    await zone.enterText('adel');
    const options = await zone.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual(['Australia/Adelaide']);
    await zone.clear();
    await zone.enterText('EST');
    await zone.blur();
    // EST is an abbreviation, not an IANA Area/Location name: the shared schema refuses it.
    expect(await errors('Time zone')).toEqual([
      'Pick a time zone from the list, like Australia/Adelaide.',
    ]);
  });

  it('validates like the shared schema, under each field, and sends nothing while invalid', async () => {
    await type('School name', '   ');
    expect(await errors('School name')).toEqual(['Enter the school name.']);
    // PREP-RULES.md: sparesPercent is an integer 0–50.
    await type('Spares (percent)', '60');
    expect(await errors('Spares (percent)')).toEqual(['Use a whole number from 0 to 50.']);
    await type('Spares (percent)', '2.5');
    expect(await errors('Spares (percent)')).toEqual(['Use a whole number from 0 to 50.']);
    await type('Ends on', '2026-07-01');
    expect(await errors('Ends on')).toEqual(['The term must end on or after the day it starts.']);

    await click(/Add a term$/);
    await type('Name', 'Term 4', 1);
    await type('Starts on', '2026-09-25', 1);
    await type('Ends on', '2026-12-11', 1);
    await type('Ends on', '2026-09-25', 0);
    // The two terms share 2026-09-25: the overlap check of the shared schema names the first.
    expect(text()).toContain('Overlaps Term 3 (2026-07-20 to 2026-09-25).');
    await click('Save settings');
    expect(text()).toContain('Some fields need attention');
    backend.expectNone('/api/school');

    await type('Starts on', '2026-10-12', 1);
    expect(text()).not.toContain('Overlaps');
    await click(/Add a period$/);
    await type('Period name', 'Period 4', 1);
    // The new row starts where the last period ends.
    expect(
      await (await (await field('Starts at', 1)).getControl(MatInputHarness))!.getValue(),
    ).toBe('12:00');
    await type('Ends at', '11:30', 1);
    expect(await errors('Ends at', 1)).toEqual(['The period must end after it starts.']);
  });

  it('saves everything with the version it read', async () => {
    await type('Spares (percent)', '12');
    await (await loader.getHarness(MatRadioButtonHarness.with({ label: 'Letter' }))).check();
    await click(/Add a non-teaching day$/);
    await type('Date', '2026-09-04', 1);
    await type('Reason', 'Sports day', 1);
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeTrue();
    await click('Save settings');
    const put = backend.expectOne({ method: 'PUT', url: '/api/school' });
    const body = put.request.body as Record<string, unknown>;
    expect(body['version']).toBe(4);
    expect(body['paperSize']).toBe('Letter');
    expect(body['prep']).toEqual({ ...DEFAULT_PREP, sparesPercent: 12 });
    expect(body['terms']).toEqual(demoSettings().terms);
    expect(body['nonTeachingDays']).toEqual([
      demoSettings().nonTeachingDays[0],
      { date: '2026-09-04', reason: 'Sports day' },
    ]);
    const saved = demoSettings({
      version: 5,
      paperSize: 'Letter',
      prep: { ...DEFAULT_PREP, sparesPercent: 12 },
    });
    saved.nonTeachingDays.push({
      id: DAY_ID.replace('9e', '8e'),
      date: '2026-09-04',
      reason: 'Sports day',
    });
    put.flush({ school: saved });
    await fixture.whenStable();
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();

    // The next save sends the version the server answered with.
    await type('Spares (percent)', '15');
    await click('Save settings');
    const next = backend.expectOne({ method: 'PUT', url: '/api/school' });
    expect((next.request.body as { version: number }).version).toBe(5);
    next.flush({ school: { ...saved, version: 6, prep: { ...saved.prep, sparesPercent: 15 } } });
  });

  it('puts server details under the field their path names', async () => {
    await type('Ends on', '2026-09-26');
    await click('Save settings');
    backend.expectOne({ method: 'PUT', url: '/api/school' }).flush(
      {
        error: {
          code: 'invalid',
          message: 'Check the settings.',
          details: [{ path: 'terms.0.endsOn', message: 'That day is after the school year ends.' }],
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    fixture.detectChanges();
    await fixture.whenStable();
    expect(await errors('Ends on')).toEqual(['That day is after the school year ends.']);
    // Editing the field clears the server's message.
    await type('Ends on', '2026-09-24');
    expect(await errors('Ends on')).toEqual([]);
  });

  function refuse(current: SchoolSettings): void {
    backend.expectOne({ method: 'PUT', url: '/api/school' }).flush(
      {
        error: {
          code: 'stale-version',
          message: 'Someone saved the school settings after you opened them.',
          current,
        },
      },
      { status: 409, statusText: 'Conflict' },
    );
    fixture.detectChanges();
  }
  const theirs = () => demoSettings({ name: 'Kestrel Ridge School', version: 5 });

  it('on a stale version says what changed and reloads their version on Reload', async () => {
    await type('Spares (percent)', '20');
    await click('Save settings');
    refuse(theirs());
    await fixture.whenStable();
    expect(text()).toContain('They changed the school name.');
    await click('Reload');
    const name = (await (await field('School name')).getControl(MatInputHarness))!;
    expect(await name.getValue()).toBe('Kestrel Ridge School');
    expect(
      await (await (await field('Spares (percent)')).getControl(MatInputHarness))!.getValue(),
    ).toBe('10');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBeFalse();
    backend.expectNone('/api/school');
  });

  it('re-applies my change over theirs on their version, never overwriting what they changed', async () => {
    await type('Spares (percent)', '20');
    await click('Save settings');
    refuse(theirs());
    await fixture.whenStable();
    await click('Re-apply my change');
    const put = backend.expectOne({ method: 'PUT', url: '/api/school' });
    const body = put.request.body as {
      version: number;
      name: string;
      prep: { sparesPercent: number };
    };
    expect(body.version).toBe(5);
    expect(body.name).toBe('Kestrel Ridge School');
    expect(body.prep.sparesPercent).toBe(20);
    put.flush({
      school: { ...theirs(), version: 6, prep: { ...DEFAULT_PREP, sparesPercent: 20 } },
    });
    await fixture.whenStable();
    expect(text()).not.toContain('Someone saved');
  });

  it('asks before leaving with unsaved changes', async () => {
    const guard = () =>
      TestBed.runInInjectionContext(() =>
        unsavedChangesGuard(
          fixture.componentInstance,
          {} as ActivatedRouteSnapshot,
          {} as RouterStateSnapshot,
          {} as RouterStateSnapshot,
        ),
      ) as Observable<boolean>;
    expect(await firstValueFrom(guard())).toBeTrue();
    await type('School name', 'Kestrel Ridge');
    const answer = guard();
    expect(isObservable(answer)).toBeTrue();
    const stay = firstValueFrom(answer);
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Leave without saving?');
    await (
      await dialog.getHarness(MatButtonHarness.with({ text: 'Stay and keep editing' }))
    ).click();
    expect(await stay).toBeFalse();
    // Karma itself listens for a real beforeunload, so the handler is called directly.
    const event = jasmine.createSpyObj<BeforeUnloadEvent>('event', ['preventDefault']);
    fixture.componentInstance.onBeforeUnload(event);
    expect(event.preventDefault).toHaveBeenCalled();
  });
});
