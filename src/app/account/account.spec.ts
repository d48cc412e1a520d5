import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { Session } from '../auth/session';
import { demoUser, errorBody, settleReads, testProviders } from '../testing/test-providers';
import { Account, WRONG_PASSWORD_MESSAGE } from './account';

describe('Account', () => {
  let fixture: ComponentFixture<Account>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('teacher'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Account);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/account').flush({ user: demoUser('teacher') });
    await settleReads();
    // The reminder e-mails card reads the person's choices (reminder-settings.spec.ts).
    backend.expectOne('/api/account/reminders').flush({
      reminders: {
        chargeReminders: false,
        leadMinutes: 30,
        morningSummary: false,
        summaryTime: '07:00',
        version: 0,
      },
    });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function input(label: string): Promise<MatInputHarness> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  it('saves the name and updates the signed-in user', async () => {
    expect(await (await input('Name')).getValue()).toBe('Robin Ashdown');
    await (await input('Name')).setValue('Robin Ashdown-Hale');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save name' }))).click();
    const request = backend.expectOne('/api/account');
    expect(request.request.method).toBe('PATCH');
    expect(request.request.body).toEqual({ name: 'Robin Ashdown-Hale' });
    request.flush({ user: demoUser('teacher', { name: 'Robin Ashdown-Hale' }) });
    await fixture.whenStable();
    expect(TestBed.inject(Session).user()?.name).toBe('Robin Ashdown-Hale');
  });

  it('shows a wrong current password under that field', async () => {
    await (await input('Current password')).setValue('not my password');
    await (await input('New password')).setValue('a longer better one');
    await (await input('New password again')).setValue('a longer better one');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change password' }))).click();
    const request = backend.expectOne('/api/account/password');
    expect(request.request.body).toEqual({
      currentPassword: 'not my password',
      newPassword: 'a longer better one',
    });
    request.flush(errorBody('wrong-password', 'Wrong password.'), {
      status: 400,
      statusText: 'Bad Request',
    });
    await fixture.whenStable();
    const field = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Current password' }),
    );
    expect(await field.getTextErrors()).toEqual([WRONG_PASSWORD_MESSAGE]);
  });

  it('changes the password, clears the form and confirms', async () => {
    await (await input('Current password')).setValue('trayplan-demo');
    await (await input('New password')).setValue('a longer better one');
    await (await input('New password again')).setValue('a longer better one');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change password' }))).click();
    backend.expectOne('/api/account/password').flush('', { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    expect(await (await root.getHarness(MatSnackBarHarness)).getMessage()).toBe(
      'Your password is changed.',
    );
    expect(await (await input('Current password')).getValue()).toBe('');
    const field = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Current password' }),
    );
    expect(await field.hasErrors()).toBeFalse();
  });
});
