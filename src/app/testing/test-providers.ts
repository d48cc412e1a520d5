import {
  provideHttpClient,
  withInterceptors,
  withXsrfConfiguration,
  type HttpRequest,
} from '@angular/common/http';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import {
  provideHttpClientTesting,
  type HttpTestingController,
  type TestRequest,
} from '@angular/common/http/testing';
import {
  ChangeDetectionStrategy,
  Component,
  type EnvironmentProviders,
  type Provider,
} from '@angular/core';
import { forgetStoredCopies } from '../offline/forget';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter, withComponentInputBinding, type Routes } from '@angular/router';
import type { SessionUser } from '../../../shared/schemas/auth';
import type { Role } from '../../../shared/schemas/common';
import { errorInterceptor } from '../errors/error-interceptor';
import { savedCopyInterceptor } from '../offline/saved-copies';

/** A page that renders nothing, for routes a spec only navigates to. */
@Component({ selector: 'app-blank', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
export class Blank {}

/**
 * The app's HTTP set-up (the real error and saved-copy interceptors) against HttpTestingController, a router
 * with `routes`, and Material animations off so specs do not wait for them.
 */
export function testProviders(routes: Routes = []): (Provider | EnvironmentProviders)[] {
  // Each spec starts in a browser that has saved nothing for anyone: specs share one page's
  // localStorage, and a copy (or its owner) left by one would change the next one's sign-in.
  forgetStoredCopies();
  return [
    provideRouter(routes, withComponentInputBinding()),
    provideHttpClient(
      withInterceptors([errorInterceptor, savedCopyInterceptor]),
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
    ),
    provideHttpClientTesting(),
    { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
  ];
}

/** An invented user of the invented demo school. */
export function demoUser(role: Role, overrides: Partial<SessionUser> = {}): SessionUser {
  return {
    id: `user-${role}`,
    email: `${role}@kestrel-ridge.example`,
    name: 'Robin Ashdown',
    role,
    schoolId: 'school-kestrel-ridge',
    schoolName: 'Kestrel Ridge Primary School',
    ...overrides,
  };
}

/** The API's error body. */
export function errorBody(
  code: string,
  message: string,
  details?: { path: string; message: string }[],
) {
  return { error: { code, message, ...(details ? { details } : {}) } };
}

/**
 * Lets resource reads (src/app/http/resource.ts) take the answers just flushed, which arrive a
 * task later, and runs their effects, so reads that wait on them start. `whenStable()` cannot do
 * this while a read is still waiting for its (not yet flushed) answer.
 */
export async function settleReads(): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve));
  TestBed.tick();
}

/**
 * Waits, letting reads settle, until a request matching `match` is asked, then answers it with
 * `body`: for a read a harness action starts (the action waits for the page to be stable, so for
 * the answer, and the read is asked only after a few of its steps). Fails unless exactly one
 * request matches.
 */
export async function answerWhenAsked(
  backend: HttpTestingController,
  match: string | ((req: HttpRequest<unknown>) => boolean),
  body: unknown,
): Promise<TestRequest> {
  for (let attempt = 0; attempt < 50; attempt++) {
    const asked = backend.match(match);
    if (asked.length > 1) throw new Error(`${asked.length} requests match, not one.`);
    if (asked.length === 1) {
      asked[0]!.flush(body as Parameters<TestRequest['flush']>[0]);
      return asked[0]!;
    }
    await settleReads();
  }
  throw new Error('The request was never asked.');
}

/**
 * Waits for the page to be stable while answering, each time it is asked, a read that may or may
 * not come (e.g. the plan read again when a click brings focus into the test's window, which the
 * browser does at a moment of its own).
 */
export async function whenStableAnswering(
  fixture: ComponentFixture<unknown>,
  backend: HttpTestingController,
  match: string,
  body: () => unknown,
): Promise<void> {
  let stable = false;
  void fixture.whenStable().then(() => (stable = true));
  for (let attempt = 0; !stable && attempt < 200; attempt++) {
    for (const read of backend.match(match))
      read.flush(body() as Parameters<TestRequest['flush']>[0]);
    await settleReads();
  }
  await fixture.whenStable();
}
