import {
  inject,
  isDevMode,
  makeEnvironmentProviders,
  provideEnvironmentInitializer,
  type EnvironmentProviders,
} from '@angular/core';
import { provideServiceWorker, SwUpdate } from '@angular/service-worker';
import { Notifier } from '../errors/notifier';

/** Said once a new version has been installed in the background. */
export const UPDATE_READY_MESSAGE =
  'A new version of Trayplan is ready. It will be used next time you open Trayplan.';

/** Said when the saved version cannot run any more (its files were removed from the server). */
export const UPDATE_BROKEN_MESSAGE =
  'This copy of Trayplan is out of date and some pages may not open. Reload the page to update.';

/**
 * The service worker (src/ngsw-config.json) keeps the shell and the pages a person opened working
 * offline. Built for production only: the dev server and Karma run without it.
 *
 * Updates never land in the middle of a lesson: the worker installs a new version in the
 * background and a page keeps the version it started with; the next visit (a new page load)
 * gets the new one. Nothing here calls activateUpdate or reloads; the person is only told,
 * without a dialog in the way.
 */
export function provideOffline(): EnvironmentProviders {
  return makeEnvironmentProviders([
    provideServiceWorker('ngsw-worker.js', {
      enabled: !isDevMode(),
      // Registering once the app is stable keeps the first load quick; at most 10 s later.
      registrationStrategy: 'registerWhenStable:10000',
    }),
    provideEnvironmentInitializer(() => {
      const updates = inject(SwUpdate);
      const notifier = inject(Notifier);
      if (!updates.isEnabled) return;
      updates.versionUpdates.subscribe((event) => {
        if (event.type === 'VERSION_READY') notifier.info(UPDATE_READY_MESSAGE);
      });
      updates.unrecoverable.subscribe(() => notifier.error(UPDATE_BROKEN_MESSAGE));
    }),
  ]);
}
