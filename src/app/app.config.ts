import {
  provideHttpClient,
  withFetch,
  withInterceptors,
  withXsrfConfiguration,
} from '@angular/common/http';
import {
  ErrorHandler,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
  type ApplicationConfig,
} from '@angular/core';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS } from '@angular/material/form-field';
import { TitleStrategy, provideRouter, withComponentInputBinding } from '@angular/router';
import { provideMarkdown } from 'ngx-markdown';
import { routes } from './app.routes';
import { Session } from './auth/session';
import { errorInterceptor } from './errors/error-interceptor';
import { LoggingErrorHandler } from './errors/logging-error-handler';
import { savedCopyInterceptor } from './offline/saved-copies';
import { provideOffline } from './offline/updates';
import { TrayplanTitleStrategy } from './title-strategy';

/** The client's providers. */
export const appConfig: ApplicationConfig = {
  providers: [
    provideZonelessChangeDetection(),
    provideBrowserGlobalErrorListeners(),
    { provide: ErrorHandler, useClass: LoggingErrorHandler },
    provideRouter(routes, withComponentInputBinding()),
    { provide: TitleStrategy, useClass: TrayplanTitleStrategy },
    provideHttpClient(
      withFetch(),
      // The saved-copy tag sits next to the network, so it sees each answer as it arrived.
      withInterceptors([errorInterceptor, savedCopyInterceptor]),
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
    ),
    // The CSRF cookie and the signed-in user, once, before the first route is decided.
    provideAppInitializer(() => inject(Session).start()),
    provideMarkdown(),
    // Offline copies through the service worker; updates take effect on the next visit only.
    provideOffline(),
    { provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { appearance: 'outline' } },
  ],
};
