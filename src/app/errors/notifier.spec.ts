import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { testProviders } from '../testing/test-providers';
import { AppError, UNEXPECTED_RESPONSE_MESSAGE, UNKNOWN_MESSAGE } from './app-error';
import { Notifier } from './notifier';

@Component({ selector: 'app-host', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
class Host {}

describe('Notifier', () => {
  let notifier: Notifier;
  let root: HarnessLoader;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: testProviders() });
    notifier = TestBed.inject(Notifier);
    root = TestbedHarnessEnvironment.documentRootLoader(TestBed.createComponent(Host));
  });

  it('keeps an error on screen until dismissed and announces it assertively', async () => {
    notifier.error('The tub list could not be saved.');
    const bar = await root.getHarness(MatSnackBarHarness);
    expect(await bar.getMessage()).toBe('The tub list could not be saved.');
    expect(await bar.getAriaLive()).toBe('assertive');
    await bar.dismissWithAction();
    expect(await root.getAllHarnesses(MatSnackBarHarness)).toEqual([]);
  });

  it('shows a schema failure, which the interceptor never saw', async () => {
    notifier.errorNotShownYet(new AppError(0, 'unexpected-response', UNEXPECTED_RESPONSE_MESSAGE));
    expect(await (await root.getHarness(MatSnackBarHarness)).getMessage()).toBe(
      UNEXPECTED_RESPONSE_MESSAGE,
    );
  });

  it('does not show an HTTP failure a second time', async () => {
    notifier.errorNotShownYet(new AppError(400, 'last-admin', 'A school needs an admin.'));
    expect(await root.getAllHarnesses(MatSnackBarHarness)).toEqual([]);
  });

  it('shows a generic message for something that is not an AppError', async () => {
    notifier.errorNotShownYet(new TypeError('x is undefined'));
    expect(await (await root.getHarness(MatSnackBarHarness)).getMessage()).toBe(UNKNOWN_MESSAGE);
  });
});
